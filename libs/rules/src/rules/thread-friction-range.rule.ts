/**
 * A thread friction given as one value (or a very narrow range): self-locking is judged at the
 * minimum and drive torque at the maximum, so both ends of the real scatter are needed.
 */
import type { Finding } from '@leadline/contracts';
import { sig } from '../format';
import { fallsShort, type Rule, type RuleContext } from '../rule';

export const THREAD_FRICTION_RANGE_ID = 'thread-friction-range';
const BASIS =
  'common practice: carry the whole friction range, minimum for self-locking and maximum for torque; the narrowest ' +
  'thread range in Shigley 9th ed. Table 8-5 is steel/brass dry 0.15-0.19 (max/min 1.27)';

export function threadFrictionRange({ design, thresholds }: RuleContext): Finding | null {
  const { min, max } = design.friction.thread;
  const minSpread = thresholds.friction.minThreadSpreadRatio;
  const single = min === max;
  // A zero minimum with a positive maximum is an (absurdly) wide range, not a narrow one.
  const spread = single ? 1 : min > 0 ? max / min : Number.POSITIVE_INFINITY;
  if (!single && !fallsShort(spread, minSpread)) return null;
  const what = single ? `a single value, f = ${sig(min)}` : `a narrow range, f = ${sig(min)} to ${sig(max)} (max/min ${sig(spread)})`;
  return {
    ruleId: THREAD_FRICTION_RANGE_ID,
    severity: 'warning',
    measured: spread,
    limit: minSpread,
    unit: '-',
    subject: 'design.friction.thread',
    message:
      `Thread friction is given as ${what}, below the expected spread max/min ${sig(minSpread)}. Self-locking is judged ` +
      `at the lowest friction the screw will see and drive torque at the highest, and lubrication, finish and wear move ` +
      `friction by more than this. Give the full range from a handbook, or from tests on the actual pair.`,
    basis: BASIS,
  };
}

export const threadFrictionRangeRule: Rule = {
  id: THREAD_FRICTION_RANGE_ID,
  title: 'Thread friction given as a single value',
  basis: BASIS,
  description: 'Warns when the thread friction min equals max, or max/min is below friction.minThreadSpreadRatio.',
  check: threadFrictionRange,
  nutIndependent: true,
};

/** Operating speed against the first critical (whirl) speed of the screw shaft. */
import type { Finding } from '@leadline/contracts';
import { percent, revPerMin, sigPair } from '../format';
import { exceeds, type Rule, type RuleContext } from '../rule';

export const SHAFT_WHIRL_SPEED_ID = 'shaft-whirl-speed';
const BASIS =
  'common practice: run below 80 % of the first critical speed, some designers use 75 % (shared/reference/columns-and-speed.md 3.4); ' +
  'first bending mode of a uniform Euler-Bernoulli shaft at the root diameter';

export function shaftWhirlSpeed({ evaluation, thresholds }: RuleContext): Finding | null {
  const cs = evaluation.criticalSpeed;
  const { maxRatio, warnRatio } = thresholds.criticalSpeed;
  const base = { ruleId: SHAFT_WHIRL_SPEED_ID, unit: '-', subject: 'criticalSpeed.ratio', basis: BASIS } as const;
  if (cs.ratio === null || cs.operatingRpm === null) {
    return {
      ...base,
      severity: 'info',
      measured: null,
      limit: maxRatio,
      message:
        `No operating speed was given, so whirl was not checked. The first critical speed is ${revPerMin(cs.rpm)}; keep ` +
        `the screw below ${percent(maxRatio)} of it (${revPerMin(maxRatio * cs.rpm)}). Give duty.speed or duty.linearSpeed to check it.`,
    };
  }
  const blocking = exceeds(cs.ratio, maxRatio);
  if (!blocking && !exceeds(cs.ratio, warnRatio)) return null;
  const limit = blocking ? maxRatio : warnRatio;
  const [m, l] = sigPair(cs.ratio * 100, limit * 100);
  return {
    ...base,
    severity: blocking ? 'blocking' : 'warning',
    measured: cs.ratio,
    limit,
    message:
      `Operating speed ${revPerMin(cs.operatingRpm)} is ${m} % of the first critical speed ${revPerMin(cs.rpm)}, ` +
      `above the ${blocking ? 'limit' : 'warning level'} of ${l} %. Near the critical speed the screw whirls, vibrates ` +
      `and can be damaged; end supports that fix the screw less than assumed lower the critical speed further. ` +
      `Reduce the speed, shorten the span between supports, fix the ends, or use a larger root diameter.`,
  };
}

export const shaftWhirlSpeedRule: Rule = {
  id: SHAFT_WHIRL_SPEED_ID,
  title: 'Critical (whirl) speed',
  basis: BASIS,
  description:
    'Blocks above criticalSpeed.maxRatio of the first critical speed, warns above criticalSpeed.warnRatio; ' +
    'information when no operating speed is given.',
  check: shaftWhirlSpeed,
};

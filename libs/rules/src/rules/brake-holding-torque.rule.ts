/**
 * Whether a fitted brake can hold the load with thread friction lost (f -> 0, e.g. under vibration): its rated
 * torque against the engine's brake.requiredTorque (F l / (2 pi) at the brake's shaft) times a factor from the
 * rule set. Added with rule set 2026.12-2; a rule set without the brake group does not run it.
 */
import type { Finding } from '@leadline/contracts';
import { newtonMetres, sig, sigPair } from '../format';
import { assessCheck, type CheckDeclaration } from '../check';
import { finding, type Rule, type RuleContext } from '../rule';
import { brakeMinHoldingFactor } from '../rule-set';

export const BRAKE_HOLDING_TORQUE_ID = 'brake-holding-torque';
const BASIS =
  'common practice: the brake holds the load without help from thread friction, which vibration, lubrication and wear can ' +
  'remove (T_0 = F l / (2 pi), the limit f -> 0 of the lowering torque, Juvinall & Marshek 5th ed. Eq. (10.5)), with a factor ' +
  'for lining fade, wear and the dynamic torque of stopping a moving load (default 2)';

/**
 * Rated over zero-friction holding torque, with a brake fitted and under rule sets with the brake group: below the
 * factor it blocks on lifting duty and warns otherwise; a brake without a stated torque warns on lifting duty.
 */
export const BRAKE_HOLDING_TORQUE_CHECK: CheckDeclaration = {
  id: BRAKE_HOLDING_TORQUE_ID,
  ruleId: BRAKE_HOLDING_TORQUE_ID,
  label: 'Brake holding torque, T_brake / T_0 (thread friction lost)',
  shortLabel: 'Brake holding',
  group: 'holding',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'brake.ratio',
  applies: ({ design, thresholds }) => brakeMinHoldingFactor(thresholds) !== null && design.duty.brake,
  value: ({ design, evaluation }) => {
    const b = evaluation.brake as RuleContext['evaluation']['brake'] | undefined;
    const rated = design.duty.brakeTorque ?? null;
    return rated === null || b === undefined ? null : b.ratio ?? rated / b.requiredTorque;
  },
  limit: ({ thresholds }) => brakeMinHoldingFactor(thresholds) as number,
  pastLimit: ({ design }) => (design.duty.kind === 'lifting' ? 'blocking' : 'warning'),
  missing: ({ design }) => (design.duty.kind === 'lifting' ? 'warning' : 'info'),
};

export function brakeHoldingTorque(ctx: RuleContext): Finding | null {
  const { design, evaluation, thresholds } = ctx;
  const factor = brakeMinHoldingFactor(thresholds);
  const check = assessCheck(BRAKE_HOLDING_TORQUE_CHECK, ctx);
  if (factor === null || check === null) return null;
  const lifting = design.duty.kind === 'lifting';
  const b = evaluation.brake;
  const rated = design.duty.brakeTorque ?? null;
  const base = { ruleId: BRAKE_HOLDING_TORQUE_ID, unit: '-', subject: 'brake.ratio', basis: BASIS } as const;
  // An evaluation stored by an engine before 2026.12-2 does not carry the brake figures: say so, never pass it silently
  const required = b?.requiredTorque ?? null;
  const where = (b?.location ?? design.duty.brakeLocation ?? 'screw') === 'motor' ? 'at the motor shaft' : 'at the screw';
  const needed = required === null ? '' : ` It must hold at least ${newtonMetres(factor * required)} ${where} (${sig(factor)} × T_0 = ${newtonMetres(required)}, thread friction lost).`;
  if (rated === null || b === undefined) {
    return finding(base, {
      severity: lifting ? 'warning' : 'info',
      measured: null,
      limit: factor,
      subject: 'design.duty.brakeTorque',
      message:
        `A brake is fitted but its rated torque is not stated, so it was not checked against the load.${needed} ` +
        `State duty.brakeTorque (and duty.brakeLocation if it sits on the motor) so the check can be made.`,
    });
  }
  const ratio = check.value ?? Number.NaN;
  if (check.status === 'pass') return null;
  const [m, l] = sigPair(ratio, factor);
  return finding(base, {
    severity: lifting ? 'blocking' : 'warning',
    measured: ratio,
    limit: factor,
    message:
      `Brake rated ${newtonMetres(rated)} ${where} is ${m} × the torque the load exerts with thread friction lost ` +
      `(T_0 = ${newtonMetres(b.requiredTorque)}), below the required ${l} ×. If vibration or lubrication removes the thread ` +
      `friction the brake may slip${lifting ? ' and the load can fall' : ''}. Fit a stronger brake, put it ahead of a higher gear ratio, ` +
      `or reduce the lead.`,
  });
}

export const brakeHoldingTorqueRule: Rule = {
  id: BRAKE_HOLDING_TORQUE_ID,
  title: 'Brake holding torque',
  basis: BASIS,
  description:
    'With a brake fitted: rated brake torque below brake.minHoldingFactor x the zero-friction holding torque F l / (2 pi) at ' +
    "the brake's shaft blocks on lifting duty and warns otherwise; a brake without a stated torque warns on lifting duty " +
    '(information otherwise). Only in rule sets with the brake group (2026.12-2 on).',
  check: brakeHoldingTorque,
  checks: [BRAKE_HOLDING_TORQUE_CHECK],
};

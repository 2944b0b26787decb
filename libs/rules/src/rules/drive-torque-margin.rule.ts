/** Drive torque available at start against the raise torque at maximum friction, collar included. */
import type { Finding } from '@leadline/contracts';
import { newtonMetres, sig, sigPair } from '../format';
import { assessCheck, type CheckDeclaration } from '../check';
import { finding, type Rule, type RuleContext } from '../rule';

export const DRIVE_TORQUE_MARGIN_ID = 'drive-torque-margin';
const BASIS =
  'common practice: torque reserve over the raise torque at maximum friction for starting friction, cold lubricant, ' +
  'supply-voltage drop and drive wear (defaults: block below 1.25, warn below 1.5)';

/** Available over required torque at the motor; no drive given is information. */
export const DRIVE_TORQUE_MARGIN_CHECK: CheckDeclaration = {
  id: DRIVE_TORQUE_MARGIN_ID,
  ruleId: DRIVE_TORQUE_MARGIN_ID,
  label: 'Drive torque, T_av / T_R,max',
  shortLabel: 'Drive torque',
  group: 'drive',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'drive.margin',
  applies: () => true,
  value: ({ evaluation }) => evaluation.drive?.margin ?? null,
  limit: ({ thresholds }) => thresholds.drive.minMargin,
  warnLimit: ({ thresholds }) => thresholds.drive.warnMargin,
};

export function driveTorqueMargin(ctx: RuleContext): Finding | null {
  const { evaluation, thresholds } = ctx;
  const { minMargin, warnMargin } = thresholds.drive;
  const check = assessCheck(DRIVE_TORQUE_MARGIN_CHECK, ctx)!;
  const base = { ruleId: DRIVE_TORQUE_MARGIN_ID, unit: '-', subject: 'drive.margin', basis: BASIS } as const;
  const required = evaluation.torque.raise.atMaxFriction;
  const d = evaluation.drive;
  if (d === null) {
    return finding(base, {
      severity: 'info',
      measured: null,
      limit: minMargin,
      message:
        `No drive was given, so the drive was not checked. The raise torque at maximum friction is ` +
        `${newtonMetres(required)}; a drive needs at least ${newtonMetres(minMargin * required)} (margin ${sig(minMargin)}). ` +
        `Give drive.availableTorque to check it.`,
    });
  }
  if (check.status === 'pass') return null;
  const blocking = check.status === 'fail';
  const limit = blocking ? minMargin : warnMargin;
  const [m, l] = sigPair(d.margin, limit);
  // Engine 1.1 on: the required torque is the peak at the motor (steady + acceleration, through the gearbox)
  const parts: string[] = [];
  if (d.accelerationTorque !== undefined && d.accelerationTorque > 0) parts.push(`acceleration torque ${newtonMetres(d.accelerationTorque)} at the screw`);
  if (d.gearbox) parts.push(`through the gearbox, ratio ${sig(d.gearbox.ratio)}, efficiency ${sig(d.gearbox.efficiency)}`);
  const requiredText =
    parts.length > 0
      ? `the peak torque ${newtonMetres(d.requiredTorque)} at the motor (raise torque ${newtonMetres(d.steadyTorque ?? required)} ` +
        `at maximum friction, collar included; ${parts.join('; ')})`
      : `the raise torque ${newtonMetres(d.requiredTorque)} (maximum friction, collar included)`;
  return finding(base, {
    severity: blocking ? 'blocking' : 'warning',
    measured: d.margin,
    limit,
    message:
      `Drive torque ${newtonMetres(d.availableTorque)} over ${requiredText} ` +
      `gives a margin of ${m}, below the ${blocking ? 'required' : 'recommended'} ${l}. ` +
      `${blocking ? 'The drive may stall at start or under cold or worn conditions.' : 'Little reserve is left for starting friction and wear.'} ` +
      `Use a stronger drive or gearing, or reduce the friction torque (lubrication, rolling thrust bearing).`,
  });
}

export const driveTorqueMarginRule: Rule = {
  id: DRIVE_TORQUE_MARGIN_ID,
  title: 'Drive torque margin',
  basis: BASIS,
  description:
    'Blocks when available over required torque (the peak torque at the motor: raise torque at maximum friction plus ' +
    'acceleration torque, through the gearbox) is below drive.minMargin, warns below drive.warnMargin; ' +
    'information when no drive is given.',
  check: driveTorqueMargin,
  nutIndependent: true,
  checks: [DRIVE_TORQUE_MARGIN_CHECK],
};

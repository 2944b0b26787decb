/**
 * Whether a lifting screw can hold its load, judged at the minimum thread friction (the engine's
 * selfLocking.margin = f_min / (cos alpha_n tan lambda), collar ignored: the safe side).
 */
import type { Finding } from '@leadline/contracts';
import { newtonMetres, sig, sigPair } from '../format';
import { findFrictionEntry } from '@leadline/mechanics';
import { assessCheck, type CheckDeclaration } from '../check';
import { finding, fallsShort, type Rule, type RuleContext } from '../rule';

export const LIFTING_SELF_LOCKING_ID = 'lifting-self-locking';

const NO_SUBSTITUTE = 'Self-locking is no substitute for a brake where a fall can hurt someone.';
const BASIS_CONDITION =
  'Self-locking condition f > cos(alpha_n) tan(lambda): Juvinall & Marshek 5th ed. Eq. (10.6); Shigley 10th ed. Eq. (8-3)';
const BASIS_BRAKE = 'common practice: a load that can fall is held by a brake, not by thread friction';
const BASIS_MARGIN =
  "common practice: margin covers the fall of thread friction from dry to oiled (Shigley 9th ed. Table 8-5: steel/bronze 0.15 to 0.10, ratio 1.5)";
const BASIS_MARGIN_LUBRICATED =
  'common practice: the thread friction range is already for a lubricated thread, so the margin covers friction ' +
  'below the stated range (a better lubricant or additive, a polished run-in flank, vibration), not the dry-to-oiled fall';

/**
 * The basis of the self-locking margin for this design: the dry-to-oiled fall only applies when the range is not
 * already lubricated. A library entry states its lubrication; a typed range says so in its reference.
 */
export function marginBasis(design: RuleContext['design']): string {
  const f = design.friction.thread;
  const entry = f.entry ? findFrictionEntry(f.entry) : undefined;
  const lubricated = entry
    ? /oil|lubricat|grease/i.test(entry.lubrication)
    : /oil|lubricat|grease/i.test(f.source.reference) && !/\bdry\b/i.test(f.source.reference);
  return lubricated ? BASIS_MARGIN_LUBRICATED : BASIS_MARGIN;
}

const BASIS_VIBRATION = 'common practice: vibration lowers effective thread friction, so self-locking cannot be relied on';

/**
 * The numeric check of a lifting screw without a brake: the thread alone must hold the load (margin above 1; below
 * the rule set's minimum margin it warns); under vibration it fails whatever the margin. With a brake fitted, or on
 * other duty, self-locking is not a limit the design must meet (the rule then informs or warns only).
 */
export const LIFTING_SELF_LOCKING_CHECK: CheckDeclaration = {
  id: LIFTING_SELF_LOCKING_ID,
  ruleId: LIFTING_SELF_LOCKING_ID,
  label: 'Self-locking margin, f_min / (cos α_n tan λ)',
  shortLabel: 'Self-locking',
  group: 'holding',
  quantity: 'factor',
  limitKind: 'minimum',
  strict: true,
  loadIndependent: true,
  subject: () => 'selfLocking.margin',
  applies: ({ design }) => design.duty.kind === 'lifting' && !design.duty.brake,
  value: ({ evaluation }) => evaluation.selfLocking.margin,
  limit: () => 1,
  warnLimit: ({ thresholds }) => thresholds.selfLocking.minMargin,
  forcedFailure: ({ design }) => (design.duty.vibration ? 'vibration without a brake: self-locking cannot be relied on' : null),
};

export function liftingSelfLocking(ctx: RuleContext): Finding | null {
  const { design, evaluation, thresholds } = ctx;
  const { locks, margin, backDrivingTorque } = evaluation.selfLocking;
  const { kind, brake, vibration } = design.duty;
  const minMargin = thresholds.selfLocking.minMargin;
  const base = { ruleId: LIFTING_SELF_LOCKING_ID, unit: '-', subject: 'selfLocking.margin' } as const;
  const marginText = sig(margin);
  const backDriving = backDrivingTorque === null ? '' : ` The load back-drives the screw with ${newtonMetres(backDrivingTorque)} at minimum friction.`;

  if (kind !== 'lifting') {
    if (locks) return null;
    return finding(base, {
      severity: 'info',
      measured: margin,
      limit: 1,
      message:
        `The screw is not self-locking: margin ${marginText} at minimum thread friction, below 1.${backDriving} ` +
        `On ${kind} duty this is allowed, but ${kind === 'clamping' ? 'the clamp can loosen' : 'the axis will not hold its position'} ` +
        `when the drive torque is removed; add a brake or a self-locking stage if it must hold. ` +
        `If this axis carries a load that can fall, treat it as lifting duty: ` +
        `self-locking is no substitute for a brake where a fall can hurt someone.`,
      basis: BASIS_CONDITION,
    });
  }

  if (!brake) {
    const check = assessCheck(LIFTING_SELF_LOCKING_CHECK, ctx)!;
    if (check.status === 'fail' && !locks) {
      return finding(base, {
        severity: 'blocking',
        measured: margin,
        limit: 1,
        message:
          `Lifting screw without a brake is not self-locking: margin ${marginText} at minimum thread friction, below 1, ` +
          `so the load can run down on its own.${backDriving} Fit a fail-safe (spring-applied) brake, or choose a smaller ` +
          `lead or a higher-friction pair and re-check. ${NO_SUBSTITUTE}`,
        basis: `${BASIS_CONDITION}; ${BASIS_BRAKE}`,
      });
    }
    if (check.status === 'fail') {
      return finding(base, {
        severity: 'blocking',
        measured: true,
        limit: false,
        unit: null,
        subject: 'design.duty.vibration',
        message:
          `Lifting screw without a brake under vibration: vibration lowers effective thread friction and can let a ` +
          `self-locking screw (margin ${marginText}) creep or run down. Fit a fail-safe brake. ${NO_SUBSTITUTE}`,
        basis: `${BASIS_VIBRATION}; ${BASIS_BRAKE}`,
      });
    }
    if (check.status === 'warning') {
      const [m, l] = sigPair(margin, minMargin);
      return finding(base, {
        severity: 'warning',
        measured: margin,
        limit: minMargin,
        message:
          `Lifting screw without a brake self-locks only narrowly: margin ${m} at minimum thread friction, below the ` +
          `required ${l}. A change of lubrication, wear or vibration can remove it, so self-locking cannot be relied on. ` +
          `Fit a brake, or reduce the lead angle. ${NO_SUBSTITUTE}`,
        basis: `${marginBasis(design)}; ${BASIS_CONDITION}`,
      });
    }
    const [m, l] = sigPair(margin, minMargin);
    return finding(base, {
      severity: 'info',
      measured: margin,
      limit: minMargin,
      message:
        `Lifting screw without a brake self-locks with margin ${m} at minimum thread friction (required ${l}). ` +
        `${NO_SUBSTITUTE} Confirm that a runaway load cannot injure anyone, or fit a brake.`,
      basis: `${marginBasis(design)}; ${BASIS_CONDITION}`,
    });
  }

  // A brake is fitted: it, not the thread, holds the load.
  if (!locks) {
    return finding(base, {
      severity: 'warning',
      measured: margin,
      limit: 1,
      message:
        `Lifting screw is not self-locking (margin ${marginText} at minimum thread friction, below 1); the brake alone ` +
        `holds the load.${backDriving} Confirm the brake is fail-safe (spring-applied) and rated for that torque with a margin ` +
        `(the brake-holding-torque check holds a stated duty.brakeTorque against F l / (2π), the torque with thread friction lost).`,
      basis: `${BASIS_CONDITION}; ${BASIS_BRAKE}`,
    });
  }
  if (vibration) {
    return finding(base, {
      severity: 'warning',
      measured: true,
      limit: false,
      unit: null,
      subject: 'design.duty.vibration',
      message:
        `Lifting screw under vibration: self-locking (margin ${marginText}) cannot be relied on, because vibration ` +
        `lowers effective thread friction. Confirm the brake alone holds the full load. ${NO_SUBSTITUTE}`,
      basis: `${BASIS_VIBRATION}; ${BASIS_BRAKE}`,
    });
  }
  if (fallsShort(margin, minMargin)) {
    const [m, l] = sigPair(margin, minMargin);
    return finding(base, {
      severity: 'info',
      measured: margin,
      limit: minMargin,
      message:
        `Self-locking margin ${m} is below ${l}; the brake holds the load, so confirm it is fail-safe and rated to hold ` +
        `the load without help from thread friction.`,
      basis: `${marginBasis(design)}; ${BASIS_CONDITION}`,
    });
  }
  return null;
}

export const liftingSelfLockingRule: Rule = {
  id: LIFTING_SELF_LOCKING_ID,
  title: 'Self-locking on lifting duty',
  basis: `${BASIS_CONDITION}; ${BASIS_BRAKE}`,
  description:
    'Lifting duty: not self-locking at minimum thread friction without a brake blocks; vibration without a brake blocks; ' +
    'self-locking margin below selfLocking.minMargin without a brake warns; not self-locking with a brake, or vibration ' +
    'with a brake, warns. Positioning and clamping duty: not self-locking is information only.',
  check: liftingSelfLocking,
  nutIndependent: true,
  checks: [LIFTING_SELF_LOCKING_CHECK],
};

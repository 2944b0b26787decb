/**
 * What the search reads from one judged candidate: which rule blocks it first, which check is closest to its
 * limit, and the figures an engineer compares candidates by. Pure.
 */
import type { Finding } from '@leadline/contracts';
import type { Design, Evaluation } from '@leadline/mechanics';
import {
  BRAKE_HOLDING_TORQUE_ID,
  brakeMinHoldingFactor,
  COLUMN_BUCKLING_ID,
  COLUMN_END_FIXITY_ID,
  DRIVE_TORQUE_MARGIN_ID,
  FRICTION_SOURCE_ASSUMED_ID,
  LIFTING_SELF_LOCKING_ID,
  NUT_BEARING_PRESSURE_ID,
  NUT_PV_ID,
  NUT_THREAD_ROOT_YIELD_ID,
  NUT_THREAD_STRIPPING_ID,
  nutThreadMinSafetyFactor,
  SCREW_BODY_YIELD_ID,
  SCREW_THREAD_STRIPPING_ID,
  SHAFT_WHIRL_SPEED_ID,
  THREAD_FRICTION_RANGE_ID,
  THREAD_ROOT_YIELD_ID,
  type Thresholds,
} from '@leadline/rules';

/**
 * Rules whose finding does not depend on the nut length: they read only the thread, the load, the collar, the
 * screw's material, length and ends, the duty and the drive. A candidate blocked by one of them is blocked at every
 * nut length, so the search judges the screw once and prunes its other nut lengths. A rule not named here
 * (including any rule added later) is treated as nut-dependent: never pruned on. sizing.spec.ts checks the claim
 * by evaluating every nut length of random screws.
 */
export const NUT_INDEPENDENT_RULES: ReadonlySet<string> = new Set([
  LIFTING_SELF_LOCKING_ID,
  SCREW_BODY_YIELD_ID,
  COLUMN_BUCKLING_ID,
  COLUMN_END_FIXITY_ID,
  SHAFT_WHIRL_SPEED_ID,
  DRIVE_TORQUE_MARGIN_ID,
  FRICTION_SOURCE_ASSUMED_ID,
  THREAD_FRICTION_RANGE_ID,
]);

/**
 * The rule a blocked candidate is counted under: the first blocking finding, the screw's own (nut-independent)
 * rules before the nut's, each group in registry order. With this order a pruned candidate is counted under the
 * same rule it would have been had it been evaluated. Null when nothing blocks.
 */
export function firstBlockingRule(findings: readonly Finding[]): string | null {
  let nutRule: string | null = null;
  for (const f of findings) {
    if (f.severity !== 'blocking') continue;
    if (NUT_INDEPENDENT_RULES.has(f.ruleId)) return f.ruleId;
    nutRule ??= f.ruleId;
  }
  return nutRule;
}

/** The first blocking nut-independent rule, or null: when set, no nut length can pass. */
export function screwBlockingRule(findings: readonly Finding[]): string | null {
  for (const f of findings) if (f.severity === 'blocking' && NUT_INDEPENDENT_RULES.has(f.ruleId)) return f.ruleId;
  return null;
}

/** Checks whose value does not change with the axial load (the self-locking margin and the whirl-speed ratio). */
export const LOAD_INDEPENDENT_RULES: ReadonlySet<string> = new Set([LIFTING_SELF_LOCKING_ID, SHAFT_WHIRL_SPEED_ID]);

export interface CheckMargin {
  readonly check: string;
  readonly ruleId: string;
  readonly value: number;
  /** The blocking limit of the rule set (not its warning level) */
  readonly limit: number;
  readonly limitKind: 'minimum' | 'maximum';
  /** value / limit */
  readonly ratio: number;
}

/**
 * Every numeric check with a blocking limit that applies to this design, as value against limit. The limits are
 * the rule set's blocking thresholds, read the same way the rules read them (libs/rules/src/rules/*.rule.ts).
 */
export function checkMargins(design: Design, e: Evaluation, t: Thresholds): CheckMargin[] {
  const out: CheckMargin[] = [];
  const add = (check: string, ruleId: string, value: number | null, limit: number, limitKind: 'minimum' | 'maximum') => {
    if (value === null) return;
    out.push({ check, ruleId, value, limit, limitKind, ratio: value / limit });
  };
  const strength = t.strength.minSafetyFactor[design.duty.kind];
  const d = design.duty;
  // Without a brake, a lifting screw that does not lock blocks (margin 1); with vibration it blocks whatever the margin.
  if (d.kind === 'lifting' && !d.brake && !d.vibration) add('self-locking margin', LIFTING_SELF_LOCKING_ID, e.selfLocking.margin, 1, 'minimum');
  add('screw body strength', SCREW_BODY_YIELD_ID, e.safetyFactors.bodyVonMises, strength, 'minimum');
  add('first-thread root strength', THREAD_ROOT_YIELD_ID, e.safetyFactors.firstThreadRoot, strength, 'minimum');
  add('screw thread stripping', SCREW_THREAD_STRIPPING_ID, e.safetyFactors.strippingScrew, strength, 'minimum');
  add('nut thread stripping', NUT_THREAD_STRIPPING_ID, design.nut.yieldStrength === null ? null : e.safetyFactors.strippingNut, strength, 'minimum');
  // The nut's own threads, where the rule set runs that rule (2026.12-2 on; nutThreads absent before)
  if (t.nutThreads !== undefined && design.nut.yieldStrength !== null) {
    add("nut's own thread root strength", NUT_THREAD_ROOT_YIELD_ID, e.safetyFactors.nutThreadRoot, nutThreadMinSafetyFactor(t)[d.kind], 'minimum');
  }
  if (e.buckling.applies) add('column buckling', COLUMN_BUCKLING_ID, e.buckling.safetyFactor ?? Number.NaN, t.buckling.minSafetyFactor[d.kind], 'minimum');
  // As the whirl rule: the lower of the classical and the partly fixed critical speed governs
  const pf = e.criticalSpeed.partlyFixed ?? null;
  add('whirl speed', SHAFT_WHIRL_SPEED_ID, pf !== null && pf.rpm < e.criticalSpeed.rpm ? pf.ratio : e.criticalSpeed.ratio, t.criticalSpeed.maxRatio, 'maximum');
  add('nut bearing pressure', NUT_BEARING_PRESSURE_ID, e.wear.pressureRatio, t.wear.maxPressureRatio, 'maximum');
  add('nut pV', NUT_PV_ID, e.wear.pvRatio, t.wear.maxPvRatio, 'maximum');
  add('drive torque margin', DRIVE_TORQUE_MARGIN_ID, e.drive?.margin ?? null, t.drive.minMargin, 'minimum');
  // A stated brake torque blocks below its factor on lifting duty only (elsewhere the rule warns)
  const brakeFactor = brakeMinHoldingFactor(t);
  if (d.kind === 'lifting' && d.brake && brakeFactor !== null) add('brake holding torque', BRAKE_HOLDING_TORQUE_ID, e.brake.ratio, brakeFactor, 'minimum');
  return out;
}

/** How far a check is from its limit as a factor: above 1 passes, below 1 fails; NaN counts as failed. */
export function closeness(c: CheckMargin): number {
  const x = c.limitKind === 'minimum' ? c.value / c.limit : c.limit / c.value;
  return Number.isNaN(x) ? 0 : x;
}

/** The check closest to its blocking limit, or null when no numeric check applies. */
export function governingCheck(design: Design, e: Evaluation, t: Thresholds): CheckMargin | null {
  let best: CheckMargin | null = null;
  for (const c of checkMargins(design, e, t)) if (best === null || closeness(c) < closeness(best)) best = c;
  return best;
}

export interface Figures {
  readonly raiseTorque: number;
  readonly efficiency: number;
  readonly selfLockingMargin: number;
  readonly lowestStrengthSafetyFactor: number;
  readonly lowestStrengthCheck: string;
  readonly bucklingFactor: number | null;
  readonly speedRatio: number | null;
  readonly nutPressureRatio: number | null;
  readonly pvRatio: number | null;
  readonly massPerMetre: number;
}

/**
 * Screw mass per metre of length [kg/m]: m' = rho pi d_m^2 / 4. On a symmetric trapezoidal or Acme profile the
 * teeth outside the pitch line fill the grooves inside it, so the section equals a round bar of the mean diameter
 * (geometry of the basic profile; an approximation within a few per cent, crest clearances neglected).
 */
export function massPerMetre(density: number, meanDiameter: number): number {
  return (density * Math.PI * meanDiameter * meanDiameter) / 4;
}

/** The figures a candidate is compared by, all read from its evaluation (SI units). */
export function figuresOf(design: Design, e: Evaluation): Figures {
  const sf = e.safetyFactors;
  const strength: [string, number | null][] = [
    ['screw body', sf.bodyVonMises],
    ['first-thread root', sf.firstThreadRoot],
    ['screw thread stripping', sf.strippingScrew],
    ['nut thread stripping', sf.strippingNut],
    ["nut's own thread root", sf.nutThreadRoot],
  ];
  let lowest = strength[0];
  for (const s of strength) if (s[1] !== null && !(s[1] >= (lowest[1] as number))) lowest = s;
  return {
    raiseTorque: e.torque.raise.atMaxFriction,
    efficiency: e.efficiency.atMinFriction,
    selfLockingMargin: e.selfLocking.margin,
    lowestStrengthSafetyFactor: lowest[1] as number,
    lowestStrengthCheck: lowest[0],
    bucklingFactor: e.buckling.applies ? e.buckling.safetyFactor : null,
    speedRatio: e.criticalSpeed.ratio,
    nutPressureRatio: e.wear.pressureRatio,
    pvRatio: e.wear.pvRatio,
    massPerMetre: massPerMetre(design.screw.density, e.geometry.meanDiameter),
  };
}

/**
 * What the search reads from one judged candidate: which rule blocks it first, which check is closest to its
 * limit, and the figures an engineer compares candidates by. Pure.
 */
import type { Finding } from '@leadline/contracts';
import type { Design, Evaluation } from '@leadline/mechanics';
import { checksOf, lowestStrengthCheck, LOAD_INDEPENDENT_CHECKS, NUT_INDEPENDENT_RULES, type Check, type Thresholds } from '@leadline/rules';

/**
 * The rule a blocked candidate is counted under: the first blocking finding, the screw's own (nut-independent)
 * rules before the nut's, each group in registry order. With this order a pruned candidate is counted under the
 * same rule it would have been had it been evaluated. Null when nothing blocks. Which rules do not depend on the nut
 * is declared by the rules themselves (Rule.nutIndependent); search.spec.ts checks the claim.
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

/** The rules' declared checks of this design that have a value (the search ranks and bisects on numbers). */
export function checkMargins(design: Design, e: Evaluation, t: Thresholds): Check[] {
  return checksOf(design, e, t).filter((c) => c.value !== null);
}

/** Whether a check's value changes with the axial load (declared by the check: self-locking and whirl do not). */
export const loadDependent = (c: Check): boolean => !LOAD_INDEPENDENT_CHECKS.has(c.id);

/** How far a check is from its limit as a factor: above 1 passes, below 1 fails; NaN counts as failed. */
export function closeness(c: Check): number {
  return c.margin === null || Number.isNaN(c.margin) ? 0 : c.margin;
}

/** A candidate's governing check as the sizing answer shows it: the declared check, its label also as `check`. */
export type SizingGoverning = Check & { readonly check: string };
export const sizingGoverning = (c: Check | null): SizingGoverning | null => (c === null ? null : { ...c, check: c.label });

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

/** The figures a candidate is compared by, all read from its evaluation and its declared checks (SI units). */
export function figuresOf(design: Design, e: Evaluation, checks: readonly Check[]): Figures {
  const lowest = lowestStrengthCheck(checks);
  return {
    raiseTorque: e.torque.raise.atMaxFriction,
    efficiency: e.efficiency.atMinFriction,
    selfLockingMargin: e.selfLocking.margin,
    lowestStrengthSafetyFactor: lowest?.value ?? Number.NaN,
    lowestStrengthCheck: lowest?.label ?? 'none',
    bucklingFactor: e.buckling.applies ? e.buckling.safetyFactor : null,
    speedRatio: e.criticalSpeed.ratio,
    nutPressureRatio: e.wear.pressureRatio,
    pvRatio: e.wear.pvRatio,
    massPerMetre: massPerMetre(design.screw.density, e.geometry.meanDiameter),
  };
}

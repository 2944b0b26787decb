/**
 * Static strength of the nut's own threads at their root: root bending against the nut's yield
 * strength and root shear against 0.577 of it, with the same minimum factors as the screw threads. A bronze or
 * polymer nut is usually the weaker part. A nut without a yield strength blocks on lifting duty (the check cannot be
 * computed, and a missing value is never passed silently where a load can fall); on other duty it is information.
 */
import type { Finding } from '@leadline/contracts';
import { mpa } from '../format';
import { assessCheck } from '../check';
import type { Rule, RuleContext } from '../rule';
import { nutThreadMinSafetyFactor } from '../rule-set';
import { missingValueFinding, STRENGTH_BASIS, strengthDeclaration, strengthFinding } from './strength-check';

export const NUT_THREAD_ROOT_YIELD_ID = 'nut-thread-root-yield';
const FORMULA_BASIS =
  "nut thread as a cantilever at its root diameter D4 (Shigley 10th ed. Eqs. (8-10), (8-11) applied to the nut), " +
  'first-thread load max(0.38 F, F / n_t); bending against S_y, shear against 0.577 S_y (Shigley 10th ed. Eq. (5-21))';

export const NUT_THREAD_ROOT_YIELD_CHECK = strengthDeclaration({
  id: NUT_THREAD_ROOT_YIELD_ID,
  label: 'Nut thread root, lower of S_y,nut / σ_b,n and 0.577 S_y,nut / τ_r,n',
  shortLabel: 'Nut thread root',
  subject: 'safetyFactors.nutThreadRoot',
  value: ({ evaluation }) => evaluation.safetyFactors.nutThreadRoot,
  needsNutYield: true,
  // Not part of rule sets before 2026.12-2, which judge as they always did
  applies: ({ thresholds }) => thresholds.nutThreads !== undefined,
  limit: ({ design, thresholds }) => nutThreadMinSafetyFactor(thresholds)[design.duty.kind],
});

export function nutThreadRootYield(ctx: RuleContext): Finding | null {
  const { design, evaluation } = ctx;
  const check = assessCheck(NUT_THREAD_ROOT_YIELD_CHECK, ctx);
  if (check === null) return null;
  const basis = `${STRENGTH_BASIS}; ${FORMULA_BASIS}`;
  // An evaluation from an engine without the nut-thread stresses counts as missing too (never passed silently)
  const nutThread = evaluation.stresses.nutThread as typeof evaluation.stresses.nutThread | undefined;
  if (check.value === null || design.nut.yieldStrength === null || nutThread === undefined) {
    return missingValueFinding(check, "The nut's own threads (root bending and shear)", 'nut.yieldStrength', design.duty.kind, basis);
  }
  if (check.status !== 'fail') return null;
  const Sy = design.nut.yieldStrength;
  const { rootBending, rootShear } = nutThread;
  const bendingGoverns = Sy / rootBending <= (0.577 * Sy) / rootShear;
  return strengthFinding({
    check,
    what: `Nut thread root at the first engaged thread (${bendingGoverns ? 'bending' : 'shear'} governs; bending ${mpa(rootBending)}, shear ${mpa(rootShear)})`,
    duty: design.duty.kind,
    stress: bendingGoverns ? rootBending : rootShear,
    strength: bendingGoverns ? Sy : 0.577 * Sy,
    strengthName: bendingGoverns ? 'nut yield strength' : 'nut shear yield (0.577 S_y)',
    remedy: 'Choose a stronger nut material or a coarser pitch (thicker threads); a longer nut relieves the first thread only while it has fewer than about 2.6 threads.',
    formulaBasis: FORMULA_BASIS,
  });
}

export const nutThreadRootYieldRule: Rule = {
  id: NUT_THREAD_ROOT_YIELD_ID,
  title: "Nut's own thread root static strength",
  basis: `${STRENGTH_BASIS}; ${FORMULA_BASIS}`,
  description:
    "Blocks when the nut thread root factor of safety (bending against S_y, shear against 0.577 S_y, the lower) is below " +
    'nutThreads.minSafetyFactor for the duty kind (rule sets without the group, such as 2026.12-1, do not run it); without ' +
    'a nut yield strength it blocks on lifting duty (missingValues.onLifting) and is information otherwise.',
  check: nutThreadRootYield,
  checks: [NUT_THREAD_ROOT_YIELD_CHECK],
};

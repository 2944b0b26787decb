/** Shear stripping of the nut threads at the screw's major diameter; without a nut yield: blocking on lifting duty, else information. */
import type { Finding } from '@leadline/contracts';
import { SHEAR_YIELD_RATIO } from '@leadline/mechanics';
import { assessCheck } from '../check';
import type { Rule, RuleContext } from '../rule';
import { missingValueFinding, STRENGTH_BASIS, strengthDeclaration, strengthFinding } from './strength-check';

export const NUT_THREAD_STRIPPING_ID = 'nut-thread-stripping';
const FORMULA_BASIS =
  "stripping shear of the nut threads on the cylinder at the screw's major diameter (Machinery's Handbook, 'Strength of screw threads', from memory) against 0.577 S_y (Shigley 10th ed. Eq. (5-21))";

export const NUT_THREAD_STRIPPING_CHECK = strengthDeclaration({
  id: NUT_THREAD_STRIPPING_ID,
  label: 'Nut thread stripping, 0.577 S_y,nut / τ_n',
  shortLabel: 'Stripping, nut',
  subject: 'safetyFactors.strippingNut',
  value: ({ evaluation }) => evaluation.safetyFactors.strippingNut,
  needsNutYield: true,
});

export function nutThreadStripping(ctx: RuleContext): Finding | null {
  const { design, evaluation } = ctx;
  const check = assessCheck(NUT_THREAD_STRIPPING_CHECK, ctx)!;
  if (check.value === null || design.nut.yieldStrength === null) {
    // Lifting duty: a check that cannot be computed for want of a value blocks (missingValues.onLifting)
    return missingValueFinding(check, "Nut thread stripping (shear at the screw's major diameter)", 'nut.yieldStrength', design.duty.kind, `${STRENGTH_BASIS}; ${FORMULA_BASIS}`);
  }
  return strengthFinding({
    check,
    what: "Nut thread stripping (shear at the screw's major diameter)",
    duty: design.duty.kind,
    stress: evaluation.stresses.stripping.nut,
    strength: SHEAR_YIELD_RATIO * design.nut.yieldStrength,
    strengthName: 'nut shear yield (0.577 S_y)',
    remedy: 'Lengthen the nut or choose a stronger nut material.',
    formulaBasis: FORMULA_BASIS,
  });
}

export const nutThreadStrippingRule: Rule = {
  id: NUT_THREAD_STRIPPING_ID,
  title: 'Nut thread stripping',
  basis: `${STRENGTH_BASIS}; ${FORMULA_BASIS}`,
  description:
    'Blocks when the nut-thread stripping factor of safety is below strength.minSafetyFactor for the duty kind; ' +
    'without a nut yield strength it blocks on lifting duty (missingValues.onLifting, 2026.12-2) and is information otherwise.',
  check: nutThreadStripping,
  checks: [NUT_THREAD_STRIPPING_CHECK],
};

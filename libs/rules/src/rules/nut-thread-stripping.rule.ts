/** Shear stripping of the nut threads at the screw's major diameter; without a nut yield: blocking on lifting duty, else information. */
import type { Finding } from '@leadline/contracts';
import { SHEAR_YIELD_RATIO } from '@leadline/mechanics';
import type { Rule, RuleContext } from '../rule';
import { missingValueSeverityOnLifting } from '../rule-set';
import { missingValueFinding, STRENGTH_BASIS, strengthFinding } from './strength-check';

export const NUT_THREAD_STRIPPING_ID = 'nut-thread-stripping';
const FORMULA_BASIS =
  "stripping shear of the nut threads on the cylinder at the screw's major diameter (Machinery's Handbook, 'Strength of screw threads', from memory) against 0.577 S_y (Shigley 10th ed. Eq. (5-21))";

export function nutThreadStripping({ design, evaluation, thresholds }: RuleContext): Finding | null {
  const minimum = thresholds.strength.minSafetyFactor[design.duty.kind];
  const factor = evaluation.safetyFactors.strippingNut;
  if (factor === null || design.nut.yieldStrength === null) {
    // Lifting duty: a check that cannot be computed for want of a value blocks (issue 13 item 12)
    return missingValueFinding(NUT_THREAD_STRIPPING_ID, 'safetyFactors.strippingNut', "Nut thread stripping (shear at the screw's major diameter)", 'nut.yieldStrength', minimum, design.duty.kind, `${STRENGTH_BASIS}; ${FORMULA_BASIS}`, missingValueSeverityOnLifting(thresholds));
  }
  return strengthFinding({
    ruleId: NUT_THREAD_STRIPPING_ID,
    subject: 'safetyFactors.strippingNut',
    what: "Nut thread stripping (shear at the screw's major diameter)",
    safetyFactor: factor,
    minimum,
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
};

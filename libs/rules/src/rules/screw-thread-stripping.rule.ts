/** Shear stripping of the screw threads on the cylinder at the nut's minor diameter, over the engaged length. */
import type { Finding } from '@leadline/contracts';
import { SHEAR_YIELD_RATIO } from '@leadline/mechanics';
import { assessCheck } from '../check';
import type { Rule, RuleContext } from '../rule';
import { STRENGTH_BASIS, strengthDeclaration, strengthFinding } from './strength-check';

export const SCREW_THREAD_STRIPPING_ID = 'screw-thread-stripping';
const FORMULA_BASIS =
  "stripping shear of the screw threads on the cylinder at the nut's minor diameter D1 (Machinery's Handbook, 'Strength of screw threads', from memory) against 0.577 S_y (distortion energy, Shigley 10th ed. Eq. (5-21))";

export const SCREW_THREAD_STRIPPING_CHECK = strengthDeclaration({
  id: SCREW_THREAD_STRIPPING_ID,
  label: 'Screw thread stripping, 0.577 S_y / τ_s',
  shortLabel: 'Stripping, screw',
  subject: 'safetyFactors.strippingScrew',
  value: ({ evaluation }) => evaluation.safetyFactors.strippingScrew,
});

export function screwThreadStripping(ctx: RuleContext): Finding | null {
  const { design, evaluation } = ctx;
  return strengthFinding({
    check: assessCheck(SCREW_THREAD_STRIPPING_CHECK, ctx)!,
    what: "Screw thread stripping (shear at the nut's minor diameter)",
    duty: design.duty.kind,
    stress: evaluation.stresses.stripping.screw,
    strength: SHEAR_YIELD_RATIO * design.screw.yieldStrength,
    strengthName: 'screw shear yield (0.577 S_y)',
    remedy: 'Lengthen the nut, or use a larger thread or a stronger screw material.',
    formulaBasis: FORMULA_BASIS,
  });
}

export const screwThreadStrippingRule: Rule = {
  id: SCREW_THREAD_STRIPPING_ID,
  title: 'Screw thread stripping',
  basis: `${STRENGTH_BASIS}; ${FORMULA_BASIS}`,
  description: 'Blocks when the screw-thread stripping factor of safety is below strength.minSafetyFactor for the duty kind.',
  check: screwThreadStripping,
  checks: [SCREW_THREAD_STRIPPING_CHECK],
};

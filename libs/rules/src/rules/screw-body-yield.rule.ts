/** Static strength of the screw body under axial load plus torsion (von Mises at the root diameter). */
import type { Finding } from '@leadline/contracts';
import { assessCheck } from '../check';
import type { Rule, RuleContext } from '../rule';
import { STRENGTH_BASIS, strengthDeclaration, strengthFinding } from './strength-check';

export const SCREW_BODY_YIELD_ID = 'screw-body-yield';
const FORMULA_BASIS = 'body stresses on the root area, torsion from the raise torque at maximum friction; von Mises (Shigley 10th ed. Sec. 8-2)';

export const SCREW_BODY_YIELD_CHECK = strengthDeclaration({
  id: SCREW_BODY_YIELD_ID,
  label: 'Screw body, S_y / von Mises',
  shortLabel: 'Screw body',
  subject: 'safetyFactors.bodyVonMises',
  value: ({ evaluation }) => evaluation.safetyFactors.bodyVonMises,
});

export function screwBodyYield(ctx: RuleContext): Finding | null {
  const { design, evaluation } = ctx;
  return strengthFinding({
    check: assessCheck(SCREW_BODY_YIELD_CHECK, ctx)!,
    what: 'Screw body (axial plus torsion, von Mises)',
    duty: design.duty.kind,
    stress: evaluation.stresses.body.vonMises,
    strength: design.screw.yieldStrength,
    strengthName: 'screw yield strength',
    remedy: 'Use a larger thread size or a stronger screw material, or reduce the load or the friction torque.',
    formulaBasis: FORMULA_BASIS,
  });
}

export const screwBodyYieldRule: Rule = {
  id: SCREW_BODY_YIELD_ID,
  title: 'Screw body static strength',
  basis: `${STRENGTH_BASIS}; ${FORMULA_BASIS}`,
  description: 'Blocks when the body von Mises factor of safety on screw yield is below strength.minSafetyFactor for the duty kind.',
  check: screwBodyYield,
  nutIndependent: true,
  checks: [SCREW_BODY_YIELD_CHECK],
};

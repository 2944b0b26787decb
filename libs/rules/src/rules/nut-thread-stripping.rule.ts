/** Shear stripping of the nut threads at the nut major diameter; information only when the nut yield is unknown. */
import type { Finding } from '@leadline/contracts';
import { SHEAR_YIELD_RATIO } from '@leadline/mechanics';
import { sig } from '../format';
import type { Rule, RuleContext } from '../rule';
import { STRENGTH_BASIS, strengthFinding } from './strength-check';

export const NUT_THREAD_STRIPPING_ID = 'nut-thread-stripping';
const FORMULA_BASIS = 'stripping shear of the nut threads at the nut major diameter against 0.577 S_y (Shigley 10th ed. Eq. (5-21))';

export function nutThreadStripping({ design, evaluation, thresholds }: RuleContext): Finding | null {
  const minimum = thresholds.strength.minSafetyFactor[design.duty.kind];
  const factor = evaluation.safetyFactors.strippingNut;
  if (factor === null || design.nut.yieldStrength === null) {
    return {
      ruleId: NUT_THREAD_STRIPPING_ID,
      severity: 'info',
      measured: null,
      limit: minimum,
      unit: '-',
      subject: 'safetyFactors.strippingNut',
      message:
        `Nut thread stripping was not checked: the nut material has no yield strength on record (grey iron and ` +
        `polymers have none in the library). Give nut.yieldStrength from the supplier to check it against the minimum ` +
        `factor of safety ${sig(minimum)} for ${design.duty.kind} duty; a polymer nut is often the weakest part.`,
      basis: `${STRENGTH_BASIS}; ${FORMULA_BASIS}`,
    };
  }
  return strengthFinding({
    ruleId: NUT_THREAD_STRIPPING_ID,
    subject: 'safetyFactors.strippingNut',
    what: 'Nut thread stripping (shear at the nut major diameter)',
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
    'information when the nut yield strength is unknown.',
  check: nutThreadStripping,
};

/** Static strength at the root of the first engaged thread, which carries the largest share of the load. */
import type { Finding } from '@leadline/contracts';
import type { Rule, RuleContext } from '../rule';
import { STRENGTH_BASIS, strengthFinding } from './strength-check';

export const THREAD_ROOT_YIELD_ID = 'thread-root-yield';
const FORMULA_BASIS =
  'first thread carries max(0.38 F, F / n_t) (Shigley 10th ed. Sec. 8-2, after Marshek, from memory; the mean share by statics); ' +
  'root bending with body axial and torsion, von Mises at the worse of the two root fillets (Ex. 8-1(g) element, both signs)';

export function threadRootYield({ design, evaluation, thresholds }: RuleContext): Finding | null {
  return strengthFinding({
    ruleId: THREAD_ROOT_YIELD_ID,
    subject: 'safetyFactors.firstThreadRoot',
    what: 'Screw thread root at the first engaged thread (von Mises, worse fillet)',
    safetyFactor: evaluation.safetyFactors.firstThreadRoot,
    minimum: thresholds.strength.minSafetyFactor[design.duty.kind],
    duty: design.duty.kind,
    stress: evaluation.stresses.firstThread.vonMises,
    strength: design.screw.yieldStrength,
    strengthName: 'screw yield strength',
    remedy: 'Use a coarser pitch or a larger thread, or a stronger screw material; a longer nut relieves the first thread only below about 2.6 engaged threads.',
    formulaBasis: FORMULA_BASIS,
  });
}

export const threadRootYieldRule: Rule = {
  id: THREAD_ROOT_YIELD_ID,
  title: 'First-thread root static strength',
  basis: `${STRENGTH_BASIS}; ${FORMULA_BASIS}`,
  description: 'Blocks when the first-thread root von Mises factor of safety is below strength.minSafetyFactor for the duty kind.',
  check: threadRootYield,
};

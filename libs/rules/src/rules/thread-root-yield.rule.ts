/** Static strength at the root of the first engaged thread, which carries the largest share of the load. */
import type { Finding } from '@leadline/contracts';
import { assessCheck } from '../check';
import type { Rule, RuleContext } from '../rule';
import { STRENGTH_BASIS, strengthDeclaration, strengthFinding } from './strength-check';

export const THREAD_ROOT_YIELD_ID = 'thread-root-yield';
const FORMULA_BASIS =
  'first thread carries max(0.38 F, F / n_t) (Shigley 10th ed. Sec. 8-2, after Marshek, from memory; the mean share by statics); ' +
  'root bending with body axial and torsion, von Mises at the worse of the two root fillets (Ex. 8-1(g) element, both signs)';

export const THREAD_ROOT_YIELD_CHECK = strengthDeclaration({
  id: THREAD_ROOT_YIELD_ID,
  label: 'First thread root, S_y / von Mises',
  shortLabel: 'First thread root',
  subject: 'safetyFactors.firstThreadRoot',
  value: ({ evaluation }) => evaluation.safetyFactors.firstThreadRoot,
});

export function threadRootYield(ctx: RuleContext): Finding | null {
  const { design, evaluation } = ctx;
  return strengthFinding({
    check: assessCheck(THREAD_ROOT_YIELD_CHECK, ctx)!,
    what: 'Screw thread root at the first engaged thread (von Mises, worse fillet)',
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
  checks: [THREAD_ROOT_YIELD_CHECK],
};

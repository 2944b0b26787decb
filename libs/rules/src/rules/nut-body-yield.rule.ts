/** Static strength of the nut body: hoop stress from the radial flank force plus axial stress, von Mises, against the nut's yield. */
import type { CheckDeclaration } from '../check';
import type { RuleContext } from '../rule';
import { dynamicFactorOnLifting, missingValueSeverityOnLifting } from '../rule-set';
import { limitRule } from './limit-rule';

export const NUT_BODY_YIELD_ID = 'nut-body-yield';
const BASIS =
  'common practice: the nut body takes the strength minimum of its duty (ASME BTH-1 analogy, from memory); hoop stress of a thick ' +
  'cylinder under bore pressure, Lamé (Shigley 10th ed. Eq. (3-50)); von Mises of the principal stresses (Shigley 10th ed. Eq. (5-12))';

/** True on lifting duty under rule sets that judge strength with the dynamic factor (2026.12-3 on). */
const dynamic = (ctx: RuleContext): boolean => ctx.design.duty.kind === 'lifting' && dynamicFactorOnLifting(ctx.thresholds);

export const NUT_BODY_YIELD_CHECK: CheckDeclaration = {
  id: NUT_BODY_YIELD_ID,
  ruleId: NUT_BODY_YIELD_ID,
  label: 'Nut body, S_y / von Mises (hoop and axial)',
  shortLabel: 'Nut body',
  group: 'strength',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: (ctx) => (dynamic(ctx) ? 'dynamics.safetyFactors.nutBody' : 'nutBody.safetyFactor'),
  applies: ({ design, thresholds }) => thresholds.nutBody !== undefined && design.nut.outsideDiameter != null,
  // Read with `?? null`: an evaluation stored by an engine before 1.2 has no nutBody group (missing, never passed)
  value: (ctx) => (dynamic(ctx) ? ctx.evaluation.dynamics?.safetyFactors?.nutBody ?? null : ctx.evaluation.nutBody?.safetyFactor ?? null),
  limit: ({ design, thresholds }) => (thresholds.nutBody as NonNullable<typeof thresholds.nutBody>).minSafetyFactor[design.duty.kind],
  missing: ({ design, thresholds }) => (design.duty.kind === 'lifting' && missingValueSeverityOnLifting(thresholds) === 'blocking' ? 'blocking' : 'info'),
};

export const nutBodyYieldRule = limitRule({
  id: NUT_BODY_YIELD_ID,
  title: 'Nut body static strength',
  basis: BASIS,
  description:
    "With the nut's outside diameter given: blocks when the nut body's von Mises factor of safety (hoop stress from the radial " +
    'flank force of the first thread, axial stress) is below nutBody.minSafetyFactor for the duty kind; with the dynamic factor ' +
    'on lifting duty. Without a nut yield strength it blocks on lifting duty. Only in rule sets with the nutBody group (2026.12-3 on).',
  check: NUT_BODY_YIELD_CHECK,
  what: 'Nut body (hoop and axial stress, von Mises)',
  missing: ({ design }) => (design.nut.yieldStrength === null ? 'nut.yieldStrength' : 'the engine 1.2 nut body figures (re-evaluate the design)'),
  consequence: 'The nut body can yield and open under the radial push of the flanks, letting the threads jump.',
  remedy: 'Increase nut.outsideDiameter or choose a stronger nut material.',
});

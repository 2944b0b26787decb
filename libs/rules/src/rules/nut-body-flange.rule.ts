/** Static strength of a nut flange: shear at the body and bending as a ring plate, against the nut's yield. */
import type { CheckDeclaration } from '../check';
import type { RuleContext } from '../rule';
import { dynamicFactorOnLifting, missingValueSeverityOnLifting } from '../rule-set';
import { limitRule } from './limit-rule';

export const NUT_BODY_FLANGE_ID = 'nut-body-flange';
const BASIS =
  'common practice: the flange takes the strength minimum of its duty (ASME BTH-1 analogy, from memory); shear on the cylinder ' +
  'pi D_o t_f and bending as a cantilever ring (Shigley 10th ed. Eq. (8-10) applied to the flange, common practice); shear ' +
  'against 0.577 S_y (Shigley 10th ed. Eq. (5-21))';

const dynamic = (ctx: RuleContext): boolean => ctx.design.duty.kind === 'lifting' && dynamicFactorOnLifting(ctx.thresholds);

export const NUT_BODY_FLANGE_CHECK: CheckDeclaration = {
  id: NUT_BODY_FLANGE_ID,
  ruleId: NUT_BODY_FLANGE_ID,
  label: 'Nut flange, shear and bending against S_y',
  shortLabel: 'Nut flange',
  group: 'strength',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: (ctx) => (dynamic(ctx) ? 'dynamics.safetyFactors.nutFlange' : 'nutBody.flange.safetyFactor'),
  applies: ({ design, thresholds }) => thresholds.nutBody !== undefined && design.nut.outsideDiameter != null && design.nut.flange != null,
  value: (ctx) => (dynamic(ctx) ? ctx.evaluation.dynamics?.safetyFactors?.nutFlange ?? null : ctx.evaluation.nutBody?.flange?.safetyFactor ?? null),
  limit: ({ design, thresholds }) => (thresholds.nutBody as NonNullable<typeof thresholds.nutBody>).minSafetyFactor[design.duty.kind],
  missing: ({ design, thresholds }) => (design.duty.kind === 'lifting' && missingValueSeverityOnLifting(thresholds) === 'blocking' ? 'blocking' : 'info'),
};

export const nutBodyFlangeRule = limitRule({
  id: NUT_BODY_FLANGE_ID,
  title: 'Nut flange static strength',
  basis: BASIS,
  description:
    'With a flanged nut: blocks when the lower of the flange shear and bending factors of safety is below nutBody.minSafetyFactor ' +
    'for the duty kind; with the dynamic factor on lifting duty. Only in rule sets with the nutBody group (2026.12-3 on).',
  check: NUT_BODY_FLANGE_CHECK,
  what: 'Nut flange (shear at the body, bending)',
  missing: ({ design }) => (design.nut.yieldStrength === null ? 'nut.yieldStrength' : 'the engine 1.2 nut flange figures (re-evaluate the design)'),
  consequence: 'The flange carries the whole load into the structure; if it yields the nut tilts or tears off.',
  remedy: 'Make the flange thicker, or choose a stronger nut material.',
});

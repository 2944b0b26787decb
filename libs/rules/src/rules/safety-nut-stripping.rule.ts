/** The safety (follower) nut as the second load path: its threads, and the screw's inside it, against stripping. */
import type { CheckDeclaration } from '../check';
import type { RuleContext } from '../rule';
import { dynamicFactorOnLifting, missingValueSeverityOnLifting } from '../rule-set';
import { limitRule } from './limit-rule';

export const SAFETY_NUT_STRIPPING_ID = 'safety-nut-stripping';
const BASIS =
  'common practice: the safety nut is the last load path of a lifting design, so it takes the lifting strength minimum whatever ' +
  "the duty (ASME BTH-1 analogy, from memory); stripping shear on the standard planes (Machinery's Handbook, 'Strength of screw " +
  "threads', from memory), shear against 0.577 S_y (Shigley 10th ed. Eq. (5-21))";

const dynamic = (ctx: RuleContext): boolean => ctx.design.duty.kind === 'lifting' && dynamicFactorOnLifting(ctx.thresholds);

/** The lower of the screw's and the safety nut's stripping factors (the screw's alone where the nut's has no yield strength). */
function staticFactor(ctx: RuleContext): number | null {
  const s = ctx.evaluation.safetyNut ?? null;
  if (s === null) return null;
  return s.strippingNutFactor === null ? s.strippingScrewFactor : Math.min(s.strippingScrewFactor, s.strippingNutFactor);
}

export const SAFETY_NUT_STRIPPING_CHECK: CheckDeclaration = {
  id: SAFETY_NUT_STRIPPING_ID,
  ruleId: SAFETY_NUT_STRIPPING_ID,
  label: 'Safety nut stripping, 0.577 S_y / tau (screw and nut threads)',
  shortLabel: 'Safety nut',
  group: 'strength',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: (ctx) => (dynamic(ctx) ? 'dynamics.safetyFactors.safetyNutStripping' : 'safetyNut.strippingNutFactor'),
  applies: ({ design, thresholds }) => thresholds.safetyNut !== undefined && design.nut.safetyNut != null,
  value: (ctx) => (dynamic(ctx) ? ctx.evaluation.dynamics?.safetyFactors?.safetyNutStripping ?? null : staticFactor(ctx)),
  limit: ({ thresholds }) => (thresholds.safetyNut as NonNullable<typeof thresholds.safetyNut>).minSafetyFactor,
  missing: ({ design, thresholds }) => (design.duty.kind === 'lifting' && missingValueSeverityOnLifting(thresholds) === 'blocking' ? 'blocking' : 'info'),
};

export const safetyNutStrippingRule = limitRule({
  id: SAFETY_NUT_STRIPPING_ID,
  title: 'Safety nut stripping',
  basis: BASIS,
  description:
    "With a safety nut: blocks when the lower of the screw's and the safety nut's stripping factors over the safety nut's length " +
    'is below safetyNut.minSafetyFactor (the lifting minimum); with the dynamic factor on lifting duty. Only in rule sets with the ' +
    'safetyNut group (2026.12-3 on).',
  check: SAFETY_NUT_STRIPPING_CHECK,
  what: 'Safety nut stripping (screw and safety-nut threads)',
  missing: () => 'the engine 1.2 safety nut figures (re-evaluate the design)',
  consequence: 'When the main nut is worn through, the safety nut alone must hold the load.',
  remedy: 'Lengthen the safety nut (nut.safetyNut.length) or choose a stronger nut material.',
});

/** The main nut's threads thinned by the wear allowed before replacement (or the safety nut's gap), against stripping. */
import type { CheckDeclaration } from '../check';
import { missingValueSeverityOnLifting } from '../rule-set';
import { limitRule } from './limit-rule';

export const NUT_WORN_THREAD_STRIPPING_ID = 'nut-worn-thread-stripping';
const BASIS =
  'common practice: the worn nut carries the load until it is replaced, so it takes the strength minimum of its duty (ASME BTH-1 ' +
  "analogy, from memory); the thread thickness less the axial wear (common practice of nut-wear gauging), stripping shear at the " +
  "screw's major diameter against 0.577 S_y (Shigley 10th ed. Eq. (5-21))";

export const NUT_WORN_THREAD_STRIPPING_CHECK: CheckDeclaration = {
  id: NUT_WORN_THREAD_STRIPPING_ID,
  ruleId: NUT_WORN_THREAD_STRIPPING_ID,
  label: 'Worn nut thread stripping, 0.577 S_y / tau',
  shortLabel: 'Worn nut thread',
  group: 'strength',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'wornThread.strippingNutFactor',
  applies: ({ design, thresholds }) => thresholds.safetyNut !== undefined && (design.nut.allowableWear != null || design.nut.safetyNut != null),
  // Read with `?? null`: an evaluation stored by an engine before 1.2 has no wornThread group
  value: ({ evaluation }) => evaluation.wornThread?.strippingNutFactor ?? null,
  limit: ({ design, thresholds }) => (thresholds.safetyNut as NonNullable<typeof thresholds.safetyNut>).minWornSafetyFactor[design.duty.kind],
  missing: ({ design, thresholds }) => (design.duty.kind === 'lifting' && missingValueSeverityOnLifting(thresholds) === 'blocking' ? 'blocking' : 'info'),
};

export const nutWornThreadStrippingRule = limitRule({
  id: NUT_WORN_THREAD_STRIPPING_ID,
  title: 'Worn nut thread stripping',
  basis: BASIS,
  description:
    "With a wear limit (nut.allowableWear, or the safety nut's gap): blocks when the stripping factor of the main nut's threads " +
    'thinned by that wear is below safetyNut.minWornSafetyFactor for the duty kind. Only in rule sets with the safetyNut group (2026.12-3 on).',
  check: NUT_WORN_THREAD_STRIPPING_CHECK,
  what: 'Worn nut thread stripping',
  missing: ({ design }) => (design.nut.yieldStrength === null ? 'nut.yieldStrength' : 'the engine 1.2 worn-thread figures (re-evaluate the design)'),
  consequence: 'The nut is in service until it has worn this far; its thinned threads must still carry the load.',
  remedy: 'Allow less wear before replacement (nut.allowableWear or a smaller safety nut gap), lengthen the nut, or choose a stronger nut material.',
});

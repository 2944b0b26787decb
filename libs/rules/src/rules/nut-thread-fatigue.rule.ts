/** Fatigue of the nut's own threads under repeated lifting (modified Goodman, the nut material's fatigue strength at the cycles). */
import type { CheckDeclaration } from '../check';
import { limitRule } from './limit-rule';

export const NUT_THREAD_FATIGUE_ID = 'nut-thread-fatigue';
const BASIS =
  "common practice: a Goodman factor of safety of at least 1.5 (default); modified Goodman line (Shigley 10th ed. Eq. (6-41)) with " +
  "the nut material's fatigue strength at the design cycles (bronzes have no endurance limit)";

export const NUT_THREAD_FATIGUE_CHECK: CheckDeclaration = {
  id: NUT_THREAD_FATIGUE_ID,
  ruleId: NUT_THREAD_FATIGUE_ID,
  label: 'Nut thread fatigue, Goodman n_f',
  shortLabel: 'Nut fatigue',
  group: 'fatigue',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'fatigue.nutThread.safetyFactor',
  applies: ({ design, thresholds }) => thresholds.fatigue !== undefined && design.duty.cycles != null,
  value: ({ evaluation }) => evaluation.fatigue?.nutThread?.safetyFactor ?? null,
  limit: ({ thresholds }) => (thresholds.fatigue as NonNullable<typeof thresholds.fatigue>).minSafetyFactor,
  missing: () => 'info',
};

export const nutThreadFatigueRule = limitRule({
  id: NUT_THREAD_FATIGUE_ID,
  title: 'Nut thread fatigue',
  basis: BASIS,
  description:
    "With load cycles given: blocks when the Goodman factor of safety of the nut's threads is below fatigue.minSafetyFactor. " +
    'Only in rule sets with the fatigue group (2026.12-3 on).',
  check: NUT_THREAD_FATIGUE_CHECK,
  what: 'Nut thread fatigue (modified Goodman)',
  missing: () => 'nut.fatigueStrength (at the design cycles) and nut.tensileStrength',
  consequence: "Fatigue cracks at the nut's thread roots grow with every lift until the threads shear off.",
  remedy: 'Lengthen the nut or choose a nut material with a higher fatigue strength.',
});

/** Fatigue of the screw's thread root under repeated lifting (modified Goodman). */
import type { CheckDeclaration } from '../check';
import { limitRule } from './limit-rule';

export const SCREW_ROOT_FATIGUE_ID = 'screw-root-fatigue';
const BASIS =
  'common practice: a Goodman factor of safety of at least 1.5 (default); modified Goodman line (Shigley 10th ed. Eq. (6-41)), ' +
  'each lift taking the root stress from 0 to its dynamic maximum';

export const SCREW_ROOT_FATIGUE_CHECK: CheckDeclaration = {
  id: SCREW_ROOT_FATIGUE_ID,
  ruleId: SCREW_ROOT_FATIGUE_ID,
  label: 'Screw root fatigue, Goodman n_f',
  shortLabel: 'Screw fatigue',
  group: 'fatigue',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'fatigue.screwRoot.safetyFactor',
  applies: ({ design, thresholds }) => thresholds.fatigue !== undefined && design.duty.cycles != null,
  // Read with `?? null`: without a tensile strength (or from an engine before 1.2) there is no value
  value: ({ evaluation }) => evaluation.fatigue?.screwRoot?.safetyFactor ?? null,
  limit: ({ thresholds }) => (thresholds.fatigue as NonNullable<typeof thresholds.fatigue>).minSafetyFactor,
  // Without the strength the engine lists what is missing (the engine-not-computed rule speaks)
  missing: () => 'info',
};

export const screwRootFatigueRule = limitRule({
  id: SCREW_ROOT_FATIGUE_ID,
  title: 'Screw root fatigue',
  basis: BASIS,
  description:
    'With load cycles given: blocks when the Goodman factor of safety of the screw thread root is below fatigue.minSafetyFactor. ' +
    'Only in rule sets with the fatigue group (2026.12-3 on).',
  check: SCREW_ROOT_FATIGUE_CHECK,
  what: 'Screw thread root fatigue (modified Goodman)',
  missing: () => 'screw.tensileStrength (or a library screw.material)',
  consequence: 'A fatigue crack at the thread root grows with every lift until the screw breaks under the load.',
  remedy: 'Use a larger thread size or a stronger screw material, or reduce the load.',
  nutIndependent: true,
});

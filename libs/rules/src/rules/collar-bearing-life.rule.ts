/** The rolling thrust bearing's basic rating life L10 (ISO 281) at the collar against the design life (duty.designLife). */
import type { CheckDeclaration } from '../check';
import type { RuleContext } from '../rule';
import { limitRule } from './limit-rule';

export const COLLAR_BEARING_LIFE_ID = 'collar-bearing-life';
const BASIS =
  'common practice: the basic rating life L10 (90 % reliability) should reach the design life; L10 = (C_a / P_a)^p million ' +
  'revolutions, p = 3 for ball and 10/3 for roller bearings (ISO 281:2007, Sec. 6, from memory; Shigley 10th ed. Eq. (11-1))';

/** L10 running hours over the design life [-]. */
function lifeRatio({ design, evaluation }: RuleContext): number | null {
  const hours = evaluation.collarBearing?.ratingLifeHours ?? null;
  const life = design.duty.designLife ?? null;
  return hours === null || life === null ? null : (hours * 3600) / life;
}

export const COLLAR_BEARING_LIFE_CHECK: CheckDeclaration = {
  id: COLLAR_BEARING_LIFE_ID,
  ruleId: COLLAR_BEARING_LIFE_ID,
  label: 'Thrust bearing L10 life over the design life',
  shortLabel: 'Bearing life',
  group: 'bearing',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'collarBearing.ratingLifeHours',
  applies: ({ design, thresholds }) => thresholds.designLife !== undefined && design.duty.designLife != null && design.collar.kind === 'rolling',
  value: lifeRatio,
  limit: ({ thresholds }) => (thresholds.designLife as NonNullable<typeof thresholds.designLife>).minLifeRatio,
  // A short bearing life means an earlier bearing; its static rating guards the load (collar-bearing-static)
  pastLimit: () => 'warning',
  // Without the dynamic rating or a speed the engine lists what is missing (the engine-not-computed rule speaks)
  missing: () => 'info',
};

export const collarBearingLifeRule = limitRule({
  id: COLLAR_BEARING_LIFE_ID,
  title: 'Thrust bearing life against the design life',
  basis: BASIS,
  description:
    "With a rolling thrust bearing and duty.designLife: warns when the bearing's L10 running hours fall short of " +
    'designLife.minLifeRatio times the design life. Only in rule sets with the designLife group (2026.12-4 on).',
  check: COLLAR_BEARING_LIFE_CHECK,
  what: 'Thrust bearing L10 life over the design life',
  missing: () => 'collar.dynamicRating (from the bearing data) and a speed',
  consequence: 'One bearing in ten is expected to show fatigue spalling before the design life.',
  remedy: 'Choose a thrust bearing with a higher dynamic rating, or plan its replacement.',
  nutIndependent: true,
});

/** The nut thread's wear life (Archard, engine 1.2) against the design life the designer states (duty.designLife). */
import type { CheckDeclaration } from '../check';
import type { RuleContext } from '../rule';
import { limitRule } from './limit-rule';

export const WEAR_LIFE_DESIGN_LIFE_ID = 'wear-life-design-life';
const BASIS =
  "common practice: the nut should reach the design life before its wear allowance is used up; the wear life is Archard's " +
  'law with the stated wear coefficient (Archard 1953; Hutchings, Tribology, Sec. 5.2, from memory)';

/** Running hours of the wear life over the design life [-] (both running time: the wear life is at the sliding speed). */
function lifeRatio({ design, evaluation }: RuleContext): number | null {
  const hours = evaluation.wearLife?.runningHours ?? null;
  const life = design.duty.designLife ?? null;
  return hours === null || life === null ? null : (hours * 3600) / life;
}

export const WEAR_LIFE_DESIGN_LIFE_CHECK: CheckDeclaration = {
  id: WEAR_LIFE_DESIGN_LIFE_ID,
  ruleId: WEAR_LIFE_DESIGN_LIFE_ID,
  label: 'Nut wear life over the design life',
  shortLabel: 'Wear life',
  group: 'wear',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'wearLife.runningHours',
  applies: ({ design, thresholds }) => thresholds.designLife !== undefined && design.duty.designLife != null,
  value: lifeRatio,
  limit: ({ thresholds }) => (thresholds.designLife as NonNullable<typeof thresholds.designLife>).minLifeRatio,
  // A short wear life means an earlier nut; the worn-thread check guards the load
  pastLimit: () => 'warning',
  // Without a wear coefficient or a speed the engine lists what is missing (the engine-not-computed rule speaks)
  missing: () => 'info',
};

export const wearLifeDesignLifeRule = limitRule({
  id: WEAR_LIFE_DESIGN_LIFE_ID,
  title: 'Nut wear life against the design life',
  basis: BASIS,
  description:
    'With duty.designLife: warns when the running hours until the nut thread has worn by its allowance fall short of ' +
    'designLife.minLifeRatio times the design life. Only in rule sets with the designLife group (2026.12-4 on).',
  check: WEAR_LIFE_DESIGN_LIFE_CHECK,
  what: 'Nut wear life over the design life',
  missing: () => 'nut.wearCoefficient (with its source), a wear limit (nut.allowableWear or nut.safetyNut) and a speed',
  consequence: 'The nut wears through its allowance before the design life and must be replaced earlier.',
  remedy: 'Lengthen the nut, lower the flank pressure or the speed, choose a pair with a lower wear coefficient, or plan the nut replacement.',
});

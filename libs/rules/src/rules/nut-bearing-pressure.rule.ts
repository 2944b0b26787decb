/** Mean flank bearing pressure in the nut against the allowable for the nut material (wear). */
import type { Finding } from '@leadline/contracts';
import { mpa, percent, sig } from '../format';
import { exceeds, type Rule, type RuleContext } from '../rule';

export const NUT_BEARING_PRESSURE_ID = 'nut-bearing-pressure';
const BASIS =
  "allowable bearing pressure by application class, Shigley 9th ed. Table 8-4 after Rothbart (from memory); " +
  'mean pressure p_b = F / (pi d_m h n_t); common practice: warn within 20 % of the allowable';

/** Rubbing speed note: the handbook allowables fall steeply as rubbing speed rises. */
function speedNote(slidingVelocity: number | null): string {
  const at = slidingVelocity === null ? 'the rubbing speed (no operating speed was given)' : `the rubbing speed of ${sig(slidingVelocity * 60)} m/min`;
  return `Handbook allowables fall steeply as rubbing speed rises (Shigley 9th ed. Table 8-4 classes: screw jack, hoisting screw, lead screw), so confirm the allowable suits ${at}.`;
}

export function nutBearingPressure({ evaluation, thresholds }: RuleContext): Finding | null {
  const w = evaluation.wear;
  const { maxPressureRatio, warnPressureRatio } = thresholds.wear;
  const base = { ruleId: NUT_BEARING_PRESSURE_ID, unit: 'Pa', subject: 'wear.bearingPressure', basis: BASIS } as const;
  if (w.allowablePressure === null || w.pressureRatio === null) {
    return {
      ...base,
      severity: 'warning',
      measured: w.bearingPressure,
      limit: null,
      message:
        `Nut wear was not checked: no allowable bearing pressure is on record for the nut material. The mean flank ` +
        `pressure is ${mpa(w.bearingPressure)}. Ask the nut supplier for the allowable pressure at this rubbing speed and ` +
        `give it as nut.allowablePressure; an overloaded nut wears fast and, on lifting duty, loses thread strength.`,
    };
  }
  const blocking = exceeds(w.pressureRatio, maxPressureRatio);
  if (!blocking && !exceeds(w.pressureRatio, warnPressureRatio)) return null;
  const ratioLimit = blocking ? maxPressureRatio : warnPressureRatio;
  return {
    ...base,
    severity: blocking ? 'blocking' : 'warning',
    measured: w.bearingPressure,
    limit: ratioLimit * w.allowablePressure,
    message:
      `Mean nut bearing pressure ${mpa(w.bearingPressure)} is ${percent(w.pressureRatio)} of the allowable ` +
      `${mpa(w.allowablePressure)}, above the ${blocking ? 'limit' : 'warning level'} of ${percent(ratioLimit)}. ` +
      `Too high a flank pressure squeezes out the lubricant and wears the nut quickly. Lengthen the nut, use a larger ` +
      `thread, or a nut material with a higher allowable. ${speedNote(w.slidingVelocity)}`,
  };
}

export const nutBearingPressureRule: Rule = {
  id: NUT_BEARING_PRESSURE_ID,
  title: 'Nut bearing pressure (wear)',
  basis: BASIS,
  description:
    'Blocks when the mean flank pressure exceeds wear.maxPressureRatio of the allowable, warns above wear.warnPressureRatio; ' +
    'warns when no allowable is known.',
  check: nutBearingPressure,
};

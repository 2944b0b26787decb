/** Mean flank bearing pressure in the nut against the allowable for the nut material (wear). */
import type { Finding } from '@leadline/contracts';
import { mpa, percent, sig } from '../format';
import { assessCheck, type CheckDeclaration } from '../check';
import { finding, type Rule, type RuleContext } from '../rule';

export const NUT_BEARING_PRESSURE_ID = 'nut-bearing-pressure';
const BASIS =
  "allowable bearing pressure by application class and rubbing speed, Shigley 9th ed. Table 8-4 after Rothbart (from memory), " +
  'the class for the actual rubbing speed at the mean diameter; mean pressure p_b = F / (pi d_m h n_t); common practice: warn within 20 % of the allowable';

/** Which allowable applied and at what rubbing speed, for the message. */
function classNote(w: RuleContext['evaluation']['wear']): string {
  const at = w.slidingVelocity === null ? 'no operating speed was given' : `rubbing speed ${sig(w.slidingVelocity * 60)} m/min`;
  if (w.allowablePressureBasis === 'any-speed') {
    return `The allowable is the design's own single value, used at any rubbing speed (${at}); handbook allowables fall steeply with speed, so confirm it holds at this speed.`;
  }
  return `Allowable for the class "${w.allowablePressureClass ?? 'not known'}" (${at}; ${w.allowablePressureSource ?? 'no source'}).`;
}

/** Mean pressure as a fraction of the allowable at the rubbing speed; no allowable on record warns. */
export const NUT_BEARING_PRESSURE_CHECK: CheckDeclaration = {
  id: NUT_BEARING_PRESSURE_ID,
  ruleId: NUT_BEARING_PRESSURE_ID,
  label: 'Nut bearing pressure over its allowable, p_b / p_allow',
  shortLabel: 'Nut pressure',
  group: 'wear',
  quantity: 'fraction',
  limitKind: 'maximum',
  subject: () => 'wear.pressureRatio',
  applies: () => true,
  value: ({ evaluation }) => (evaluation.wear.allowablePressure === null ? null : evaluation.wear.pressureRatio),
  limit: ({ thresholds }) => thresholds.wear.maxPressureRatio,
  warnLimit: ({ thresholds }) => thresholds.wear.warnPressureRatio,
  missing: () => 'warning',
};

export function nutBearingPressure(ctx: RuleContext): Finding | null {
  const { evaluation, thresholds } = ctx;
  const w = evaluation.wear;
  const { maxPressureRatio, warnPressureRatio } = thresholds.wear;
  const check = assessCheck(NUT_BEARING_PRESSURE_CHECK, ctx)!;
  const base = { ruleId: NUT_BEARING_PRESSURE_ID, unit: 'Pa', subject: 'wear.bearingPressure', basis: BASIS } as const;
  if (w.allowablePressure === null || w.pressureRatio === null) {
    return finding(base, {
      severity: 'warning',
      measured: w.bearingPressure,
      limit: null,
      message:
        `Nut wear was not checked: no allowable bearing pressure is on record for the nut material` +
        `${w.allowablePressureSource ? ` at this rubbing speed (${w.allowablePressureSource})` : ''}. The mean flank ` +
        `pressure is ${mpa(w.bearingPressure)}${w.slidingVelocity === null ? '' : ` at a rubbing speed of ${sig(w.slidingVelocity * 60)} m/min`}. ` +
        `Ask the nut supplier for the allowable pressure at this rubbing speed and give it as nut.allowablePressure or ` +
        `nut.allowablePressureBySpeed; an overloaded nut wears fast and, on lifting duty, loses thread strength.`,
    });
  }
  if (check.status === 'pass') return null;
  const blocking = check.status === 'fail';
  const ratioLimit = blocking ? maxPressureRatio : warnPressureRatio;
  return finding(base, {
    severity: blocking ? 'blocking' : 'warning',
    measured: w.bearingPressure,
    limit: ratioLimit * w.allowablePressure,
    message:
      `Mean nut bearing pressure ${mpa(w.bearingPressure)} is ${percent(w.pressureRatio)} of the allowable ` +
      `${mpa(w.allowablePressure)}, above the ${blocking ? 'limit' : 'warning level'} of ${percent(ratioLimit)}. ` +
      `Too high a flank pressure squeezes out the lubricant and wears the nut quickly. Lengthen the nut, use a larger ` +
      `thread, a lower speed, or a nut material with a higher allowable. ${classNote(w)}`,
  });
}

export const nutBearingPressureRule: Rule = {
  id: NUT_BEARING_PRESSURE_ID,
  title: 'Nut bearing pressure (wear)',
  basis: BASIS,
  description:
    'Blocks when the mean flank pressure exceeds wear.maxPressureRatio of the allowable for the actual rubbing speed ' +
    "(the nut material's speed classes, or the design's own single value at any speed), warns above wear.warnPressureRatio; " +
    'warns when no allowable is known for that speed.',
  check: nutBearingPressure,
  checks: [NUT_BEARING_PRESSURE_CHECK],
};

/** Bearing pressure of a plain thrust collar against the allowable of the collar pair. */
import type { CheckDeclaration } from '../check';
import { limitRule } from './limit-rule';

export const COLLAR_BEARING_PRESSURE_ID = 'collar-bearing-pressure';
const BASIS =
  'the allowable collar pressure of the pair, as the design states it with its source (exceeding it blocks); unit bearing ' +
  'pressure 4 F / (pi (D_o^2 - D_i^2)) (Bhandari, Design of Machine Elements, 3rd ed., Sec. 6.8, from memory)';

export const COLLAR_BEARING_PRESSURE_CHECK: CheckDeclaration = {
  id: COLLAR_BEARING_PRESSURE_ID,
  ruleId: COLLAR_BEARING_PRESSURE_ID,
  label: 'Collar bearing pressure, share of the allowable',
  shortLabel: 'Collar pressure',
  group: 'bearing',
  quantity: 'fraction',
  limitKind: 'maximum',
  subject: () => 'collarBearing.pressureRatio',
  applies: ({ design, thresholds }) => thresholds.collarBearing !== undefined && (design.collar.kind === 'plain' || design.collar.kind === 'annular'),
  value: ({ evaluation }) => evaluation.collarBearing?.pressureRatio ?? null,
  limit: ({ thresholds }) => (thresholds.collarBearing as NonNullable<typeof thresholds.collarBearing>).maxPressureRatio,
  // Without the annulus or an allowable the engine lists what is missing (the engine-not-computed rule speaks)
  missing: () => 'info',
};

export const collarBearingPressureRule = limitRule({
  id: COLLAR_BEARING_PRESSURE_ID,
  title: 'Collar bearing pressure',
  basis: BASIS,
  description:
    'With a plain collar of known annulus and allowable pressure: blocks when the bearing pressure exceeds ' +
    'collarBearing.maxPressureRatio of the allowable. Only in rule sets with the collarBearing group (2026.12-3 on).',
  check: COLLAR_BEARING_PRESSURE_CHECK,
  what: 'Collar bearing pressure (share of the allowable)',
  // Name only what is absent: an annular collar lacks only its allowable
  missing: ({ design }) =>
    design.collar.kind === 'annular'
      ? 'collar.allowablePressure'
      : 'collar.kind "annular" with collar.outerDiameter and collar.innerDiameter, and collar.allowablePressure',
  consequence: 'Above its allowable pressure the collar loses its lubricant film, galls and wears fast.',
  remedy: 'Enlarge the collar annulus, choose a collar pair with a higher allowable, or fit a rolling thrust bearing.',
  nutIndependent: true,
});

/** Static safety of a rolling thrust bearing at the collar: its basic static rating over the axial load. */
import type { CheckDeclaration } from '../check';
import { limitRule } from './limit-rule';

export const COLLAR_BEARING_STATIC_ID = 'collar-bearing-static';
const BASIS =
  'common practice: static safety s_0 = C_0a / P_0a of at least 1 for normal running, as bearing catalogues ask (ISO 76:2006, ' +
  'from memory; Shigley 10th ed. Sec. 11-6)';

export const COLLAR_BEARING_STATIC_CHECK: CheckDeclaration = {
  id: COLLAR_BEARING_STATIC_ID,
  ruleId: COLLAR_BEARING_STATIC_ID,
  label: 'Thrust bearing static safety, C_0a / P_0a',
  shortLabel: 'Bearing static',
  group: 'bearing',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'collarBearing.staticSafetyFactor',
  applies: ({ design, thresholds }) => thresholds.collarBearing !== undefined && design.collar.kind === 'rolling',
  value: ({ evaluation }) => evaluation.collarBearing?.staticSafetyFactor ?? null,
  limit: ({ thresholds }) => (thresholds.collarBearing as NonNullable<typeof thresholds.collarBearing>).minStaticSafetyFactor,
  // Without the rating the engine lists what is missing (the engine-not-computed rule speaks)
  missing: () => 'info',
};

export const collarBearingStaticRule = limitRule({
  id: COLLAR_BEARING_STATIC_ID,
  title: 'Thrust bearing static safety',
  basis: BASIS,
  description:
    'With a rolling thrust bearing of stated static rating: blocks when C_0a / F is below collarBearing.minStaticSafetyFactor. ' +
    'Only in rule sets with the collarBearing group (2026.12-3 on).',
  check: COLLAR_BEARING_STATIC_CHECK,
  what: 'Thrust bearing static safety (C_0a / P_0a)',
  missing: () => 'collar.staticRating (from the bearing data, with collar.ratingSource)',
  consequence: 'Below its static rating the bearing raceways dent permanently under the load.',
  remedy: 'Choose a thrust bearing with a higher static rating.',
  nutIndependent: true,
});

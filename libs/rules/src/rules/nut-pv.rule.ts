/** Pressure-velocity product at the thread mean diameter against the nut material's pV limit. */
import type { Finding } from '@leadline/contracts';
import { mpaMetresPerSecond, percent, sig } from '../format';
import { assessCheck, type CheckDeclaration } from '../check';
import { finding, type Rule, type RuleContext } from '../rule';

export const NUT_PV_ID = 'nut-pv';
const BASIS =
  'pV limits for bearing materials in boundary lubrication, Mott, Machine Elements in Mechanical Design, Table 16-1; ' +
  'velocity at the thread mean diameter; common practice: warn within 20 % of the limit';

/** pV as a fraction of the material's limit; no limit on record warns, no speed is information. */
export const NUT_PV_CHECK: CheckDeclaration = {
  id: NUT_PV_ID,
  ruleId: NUT_PV_ID,
  label: 'Nut pV over its limit, pV / pV_allow',
  shortLabel: 'Nut pV',
  group: 'wear',
  quantity: 'fraction',
  limitKind: 'maximum',
  subject: () => 'wear.pvRatio',
  applies: () => true,
  value: ({ evaluation }) => (evaluation.wear.allowablePv === null || evaluation.wear.pv === null ? null : evaluation.wear.pvRatio),
  limit: ({ thresholds }) => thresholds.wear.maxPvRatio,
  warnLimit: ({ thresholds }) => thresholds.wear.warnPvRatio,
  missing: ({ evaluation }) => (evaluation.wear.allowablePv === null ? 'warning' : 'info'),
};

export function nutPv(ctx: RuleContext): Finding | null {
  const { evaluation, thresholds } = ctx;
  const w = evaluation.wear;
  const { maxPvRatio, warnPvRatio } = thresholds.wear;
  const check = assessCheck(NUT_PV_CHECK, ctx)!;
  const base = { ruleId: NUT_PV_ID, unit: 'Pa*m/s', subject: 'wear.pv', basis: BASIS } as const;
  if (w.allowablePv === null) {
    return finding(base, {
      severity: 'warning',
      measured: w.pv,
      limit: null,
      message:
        `Nut heating and wear (pV) was not checked: no pV limit is on record for the nut material` +
        `${w.pv === null ? '' : `; the pV is ${mpaMetresPerSecond(w.pv)}`}. Ask the nut supplier for the pV limit, with ` +
        `the velocity definition it assumes, and give it as nut.allowablePv.`,
    });
  }
  if (w.pv === null || w.pvRatio === null) {
    return finding(base, {
      severity: 'info',
      measured: null,
      limit: maxPvRatio * w.allowablePv,
      message:
        `No operating speed was given, so pV was not checked against the limit ${mpaMetresPerSecond(w.allowablePv)}. ` +
        `Give duty.speed or duty.linearSpeed if the screw runs under power; a hand-operated screw can ignore this.`,
    });
  }
  if (check.status === 'pass') return null;
  const blocking = check.status === 'fail';
  const ratioLimit = blocking ? maxPvRatio : warnPvRatio;
  const velocity = w.slidingVelocity === null ? '' : ` (rubbing speed ${sig(w.slidingVelocity * 60)} m/min)`;
  return finding(base, {
    severity: blocking ? 'blocking' : 'warning',
    measured: w.pv,
    limit: ratioLimit * w.allowablePv,
    message:
      `Nut pV ${mpaMetresPerSecond(w.pv)}${velocity} is ${percent(w.pvRatio)} of the limit ` +
      `${mpaMetresPerSecond(w.allowablePv)}, above the ${blocking ? 'limit' : 'warning level'} of ${percent(ratioLimit)}. ` +
      `Above its pV limit the nut overheats and wears rapidly. Reduce the speed or the pressure (longer nut, larger thread), ` +
      `improve lubrication, or choose a nut material with a higher pV limit.`,
  });
}

export const nutPvRule: Rule = {
  id: NUT_PV_ID,
  title: 'Nut pV (heating and wear)',
  basis: BASIS,
  description:
    'Blocks when pV exceeds wear.maxPvRatio of the limit, warns above wear.warnPvRatio; warns when no pV limit is known; ' +
    'information when no operating speed is given.',
  check: nutPv,
  checks: [NUT_PV_CHECK],
};

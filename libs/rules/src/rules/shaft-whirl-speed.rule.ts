/** Operating speed against the first critical (whirl) speed of the screw shaft. */
import type { Finding } from '@leadline/contracts';
import { percent, revPerMin, sigPair } from '../format';
import { assessCheck, type CheckDeclaration } from '../check';
import { finding, type Rule, type RuleContext } from '../rule';

export const SHAFT_WHIRL_SPEED_ID = 'shaft-whirl-speed';
const BASIS =
  'common practice: run below 80 % of the first critical speed, some designers use 75 % (from memory); ' +
  'first bending mode of a uniform Euler-Bernoulli shaft at the root diameter';
const BASIS_PARTLY_FIXED =
  `${BASIS}; fixed ends taken as only partly fixed (common practice): simply supported shaft over L / sqrt(C) with the ` +
  "recommended end-condition constant C of Shigley 9th ed. Table 4-2, the same partial fixity the column check assumes";

/** Whether the partly fixed critical speed governs: the lower of the two (evaluations before engine 1.1 have only the classical). */
function partlyFixedGoverns(cs: RuleContext['evaluation']['criticalSpeed']): boolean {
  const pf = cs.partlyFixed ?? null;
  return pf !== null && pf.rpm < cs.rpm;
}

export const SHAFT_WHIRL_SPEED_CHECK: CheckDeclaration = {
  id: SHAFT_WHIRL_SPEED_ID,
  ruleId: SHAFT_WHIRL_SPEED_ID,
  label: 'Operating over critical (whirl) speed, n / n_c',
  shortLabel: 'Whirl speed',
  group: 'speed',
  quantity: 'fraction',
  limitKind: 'maximum',
  loadIndependent: true,
  subject: ({ evaluation }) => (partlyFixedGoverns(evaluation.criticalSpeed) ? 'criticalSpeed.partlyFixed.ratio' : 'criticalSpeed.ratio'),
  applies: () => true,
  value: ({ evaluation }) => {
    const cs = evaluation.criticalSpeed;
    return cs.operatingRpm === null ? null : partlyFixedGoverns(cs) ? cs.partlyFixed!.ratio : cs.ratio;
  },
  limit: ({ thresholds }) => thresholds.criticalSpeed.maxRatio,
  warnLimit: ({ thresholds }) => thresholds.criticalSpeed.warnRatio,
};

export function shaftWhirlSpeed(ctx: RuleContext): Finding | null {
  const { evaluation, thresholds } = ctx;
  const cs = evaluation.criticalSpeed;
  const { maxRatio, warnRatio } = thresholds.criticalSpeed;
  const pf = cs.partlyFixed ?? null;
  const governs = partlyFixedGoverns(cs);
  const criticalRpm = governs ? pf!.rpm : cs.rpm;
  const check = assessCheck(SHAFT_WHIRL_SPEED_CHECK, ctx)!;
  const ratio = check.value;
  const which = governs ? 'critical speed with the fixed ends taken as only partly fixed' : 'first critical speed';
  const base = {
    ruleId: SHAFT_WHIRL_SPEED_ID,
    unit: '-',
    subject: governs ? 'criticalSpeed.partlyFixed.ratio' : 'criticalSpeed.ratio',
    basis: governs ? BASIS_PARTLY_FIXED : BASIS,
  } as const;
  if (ratio === null || cs.operatingRpm === null) {
    return finding(base, {
      severity: 'info',
      measured: null,
      limit: maxRatio,
      message:
        `No operating speed was given, so whirl was not checked. The ${which} is ${revPerMin(criticalRpm)}; keep ` +
        `the screw below ${percent(maxRatio)} of it (${revPerMin(maxRatio * criticalRpm)}). Give duty.speed or duty.linearSpeed to check it.`,
    });
  }
  if (check.status === 'pass') return null;
  const blocking = check.status === 'fail';
  const limit = blocking ? maxRatio : warnRatio;
  const [m, l] = sigPair(ratio * 100, limit * 100);
  return finding(base, {
    severity: blocking ? 'blocking' : 'warning',
    measured: ratio,
    limit,
    message:
      `Operating speed ${revPerMin(cs.operatingRpm)} is ${m} % of the ${which} ${revPerMin(criticalRpm)}` +
      `${governs ? ` (classical first mode ${revPerMin(cs.rpm)})` : ''}, ` +
      `above the ${blocking ? 'limit' : 'warning level'} of ${l} %. Near the critical speed the screw whirls, vibrates ` +
      `and can be damaged; end supports that fix the screw less than assumed lower the critical speed further. ` +
      `Reduce the speed, shorten the span between supports, fix the ends, or use a larger root diameter.`,
  });
}

export const shaftWhirlSpeedRule: Rule = {
  id: SHAFT_WHIRL_SPEED_ID,
  title: 'Critical (whirl) speed',
  basis: BASIS,
  description:
    'Blocks above criticalSpeed.maxRatio of the first critical speed, warns above criticalSpeed.warnRatio; ' +
    'where the engine reports a partly fixed critical speed (recommended basis, a fixed end) the lower speed governs; ' +
    'information when no operating speed is given.',
  check: shaftWhirlSpeed,
  nutIndependent: true,
  checks: [SHAFT_WHIRL_SPEED_CHECK],
};

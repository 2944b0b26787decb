/**
 * The governing margin of a judged design: every numeric check that has a limit in the rule set, expressed as
 * "how many times the limit is met" (>= 1 meets it, < 1 falls short), and the smallest of them. Used by the re-check
 * of stored revisions to say whether a correction drops a design below a limit. Pure; reads only the evaluation,
 * the design's duty and the thresholds. Checks an evaluation does not carry (stored by an earlier engine) are skipped.
 */
import type { Design, Evaluation } from '@leadline/mechanics';
import type { Thresholds } from './rule-set';
import { brakeMinHoldingFactor, nutThreadMinSafetyFactor } from './rule-set';

/** One check as a margin against its limit. */
export interface CheckMargin {
  /** Evaluation path of the measured value, e.g. "safetyFactors.bodyVonMises" */
  readonly subject: string;
  readonly measured: number;
  readonly limit: number;
  /** 'min': measured must reach the limit (a factor); 'max': measured must not exceed it (a ratio of an allowable) */
  readonly kind: 'min' | 'max';
  /** measured / limit for 'min', limit / measured for 'max': >= 1 meets the limit */
  readonly margin: number;
}

const asMin = (subject: string, measured: number | null | undefined, limit: number | null | undefined): CheckMargin | null =>
  typeof measured === 'number' && typeof limit === 'number' ? { subject, measured, limit, kind: 'min', margin: measured / limit } : null;
const asMax = (subject: string, measured: number | null | undefined, limit: number | null | undefined): CheckMargin | null =>
  typeof measured === 'number' && typeof limit === 'number' ? { subject, measured, limit, kind: 'max', margin: limit / measured } : null;

/** Every numeric check of the design under the thresholds, in a fixed order. NaN margins are kept (they fall short). */
export function checkMargins(design: Design, evaluation: Evaluation, t: Thresholds): CheckMargin[] {
  const duty = design.duty.kind;
  const sf = evaluation.safetyFactors;
  const strength = t.strength.minSafetyFactor[duty];
  const cs = evaluation.criticalSpeed;
  const pf = cs.partlyFixed ?? null;
  const whirl = pf !== null && pf.rpm < cs.rpm ? asMax('criticalSpeed.partlyFixed.ratio', pf.ratio, t.criticalSpeed.maxRatio) : asMax('criticalSpeed.ratio', cs.ratio, t.criticalSpeed.maxRatio);
  const brakeFactor = brakeMinHoldingFactor(t);
  const list = [
    asMin('safetyFactors.bodyVonMises', sf.bodyVonMises, strength),
    asMin('safetyFactors.firstThreadRoot', sf.firstThreadRoot, strength),
    asMin('safetyFactors.strippingScrew', sf.strippingScrew, strength),
    asMin('safetyFactors.strippingNut', sf.strippingNut, strength),
    asMin('safetyFactors.nutThreadRoot', sf.nutThreadRoot, nutThreadMinSafetyFactor(t)[duty]),
    asMin('buckling.safetyFactor', evaluation.buckling.safetyFactor, t.buckling.minSafetyFactor[duty]),
    whirl,
    asMax('wear.pressureRatio', evaluation.wear.pressureRatio, t.wear.maxPressureRatio),
    asMax('wear.pvRatio', evaluation.wear.pvRatio, t.wear.maxPvRatio),
    asMin('drive.margin', evaluation.drive?.margin, t.drive.minMargin),
    design.duty.brake ? asMin('brake.ratio', evaluation.brake?.ratio, brakeFactor) : null,
    duty === 'lifting' && !design.duty.brake ? asMin('selfLocking.margin', evaluation.selfLocking.margin, 1) : null,
  ];
  return list.filter((c): c is CheckMargin => c !== null);
}

/** The check with the smallest margin (NaN first: a value that could not be computed governs), or null if none. */
export function governingMargin(design: Design, evaluation: Evaluation, t: Thresholds): CheckMargin | null {
  let worst: CheckMargin | null = null;
  for (const c of checkMargins(design, evaluation, t)) {
    if (worst === null || Number.isNaN(c.margin) || (!Number.isNaN(worst.margin) && c.margin < worst.margin)) worst = c;
    if (Number.isNaN(worst.margin)) break;
  }
  return worst;
}

/**
 * The governing margin of a judged design, for the re-check of stored revisions: every declared check (check.ts) as
 * "how many times the limit is met" (>= 1 meets it, < 1 falls short) and the one that governs. Pure; derived from the
 * rules' declarations, so the re-check, the answer's `checks` and judge() cannot disagree on which checks exist,
 * their limits or when they apply. Values an evaluation does not carry (an earlier engine) are missing, never passed.
 */
import type { Design, Evaluation } from '@leadline/mechanics';
import { governingCheck, type Check } from './check';
import { checksOf } from './judge';
import type { Thresholds } from './rule-set';

/** One check as a margin against its limit. */
export interface CheckMargin {
  /** Evaluation path of the measured value, e.g. "safetyFactors.bodyVonMises" */
  readonly subject: string;
  readonly ruleId: string;
  readonly label: string;
  readonly measured: number | null;
  readonly limit: number;
  /** 'min': measured must reach the limit (a factor); 'max': measured must not exceed it (a ratio of an allowable) */
  readonly kind: 'min' | 'max';
  /** measured / limit for 'min', limit / measured for 'max': >= 1 meets the limit; null when not computed */
  readonly margin: number | null;
  readonly status: Check['status'];
}

const asMargin = (c: Check): CheckMargin => ({
  subject: c.subject, ruleId: c.ruleId, label: c.label, measured: c.value, limit: c.limit,
  kind: c.limitKind === 'minimum' ? 'min' : 'max', margin: c.margin, status: c.status,
});

/** Every declared check of the design under the thresholds, in registry order. NaN margins are kept (they fall short). */
export function checkMargins(design: Design, evaluation: Evaluation, t: Thresholds): CheckMargin[] {
  return checksOf(design, evaluation, t).map(asMargin);
}

/** The governing check as a margin (a failing check furthest past its limit, else the nearest), or null if none. */
export function governingMargin(design: Design, evaluation: Evaluation, t: Thresholds): CheckMargin | null {
  const g = governingCheck(checksOf(design, evaluation, t));
  return g === null ? null : asMargin(g);
}

/**
 * Numeric checks, declared once by the rules. A rule file declares each check it makes (the evaluation value it
 * reads, how its limit comes from the rule set, minimum or maximum, when it applies, its label and quantity kind);
 * the rule decides with `assessCheck`, and everything else that speaks of checks (the answer's `checks` and
 * `governing`, the re-check, the screw search, the report, the pages) reads the same declarations. Pure.
 */
import type { CHECK_GROUPS } from '@leadline/contracts';
import type { Design, Evaluation } from '@leadline/mechanics';
import type { RuleContext } from './rule';

/** 'minimum': the value must reach the limit (a factor or margin); 'maximum': it must not exceed it (a fraction of an allowable). */
export type LimitKind = 'minimum' | 'maximum';

/**
 * pass: within its limit (and its warning level); warning: past its warning level, or past a limit that only warns;
 * fail: past its blocking limit, or not computable where the rules block on that; not-computed: a value the
 * engine could not give (no speed, no allowable, no nut yield strength) where the rules do not block on it.
 */
export type CheckStatus = 'pass' | 'warning' | 'fail' | 'not-computed';

/** How a check's value is printed: 'factor' a dimensionless factor or margin, 'fraction' a share of an allowable (as %). */
export type CheckQuantity = 'factor' | 'fraction';

/** What a check is about, for grouping (the report's lowest strength factor is over the 'strength' group). */
export type CheckGroup = (typeof CHECK_GROUPS)[number];

/** Severity of the rule's finding in a case the declaration names. */
export type CheckSeverity = 'blocking' | 'warning' | 'info';

/** One numeric check as a rule declares it. Functions read only the rule context (design, evaluation, thresholds). */
export interface CheckDeclaration {
  /** Stable id, equal to the rule id where a rule makes one check */
  readonly id: string;
  readonly ruleId: string;
  /** Words for a reader: "Screw body, S_y / von Mises" */
  readonly label: string;
  /** A few words, for chart axes and narrow tables */
  readonly shortLabel: string;
  readonly group: CheckGroup;
  readonly quantity: CheckQuantity;
  readonly limitKind: LimitKind;
  /** A minimum check passes only above its limit (self-locking: margin > 1), not at it */
  readonly strict?: boolean;
  /** Evaluation path of the value read (a path starting "design." points into the design) */
  subject(ctx: RuleContext): string;
  /** Whether the check is made for this design under this rule set */
  applies(ctx: RuleContext): boolean;
  /** The value held against the limit; null when the engine could not give it (then `missing` says what that means) */
  value(ctx: RuleContext): number | null;
  /** The limit past which the rule's finding has severity `pastLimit` (blocking unless stated) */
  limit(ctx: RuleContext): number;
  /** A warning level short of the limit, if the rule set has one */
  warnLimit?(ctx: RuleContext): number | null;
  /** Severity past the limit (default 'blocking') */
  pastLimit?(ctx: RuleContext): 'blocking' | 'warning';
  /** Severity when the value is missing (default 'info') */
  missing?(ctx: RuleContext): CheckSeverity;
  /** True when the value does not change with the axial load (the screw search's load headroom skips it) */
  readonly loadIndependent?: boolean;
  /** A reason the check fails whatever its value (e.g. vibration without a brake), or null */
  forcedFailure?(ctx: RuleContext): string | null;
}

/** One check as judged: what the API answers in `checks` and `governing`. */
export interface Check {
  readonly id: string;
  readonly ruleId: string;
  readonly label: string;
  readonly shortLabel: string;
  readonly group: CheckGroup;
  readonly quantity: CheckQuantity;
  readonly subject: string;
  /** null: not computed */
  readonly value: number | null;
  readonly limit: number;
  readonly limitKind: LimitKind;
  readonly warnLimit: number | null;
  /** value / limit (null when the value is missing) */
  readonly ratio: number | null;
  /** How many times the limit is met: value / limit for a minimum, limit / value for a maximum; below 1 falls short */
  readonly margin: number | null;
  readonly status: CheckStatus;
  /** Why a check fails whatever its value, or null */
  readonly note: string | null;
}

/** Finite or NaN numbers only; anything else (undefined from an older engine's evaluation, null) is missing. */
const numberOrNull = (v: number | null | undefined): number | null => (typeof v === 'number' ? v : null);

/** True when the value falls short of (minimum) or exceeds (maximum) the limit; NaN is past it (the safe side). */
function past(value: number, limit: number, kind: LimitKind, strict: boolean): boolean {
  if (kind === 'maximum') return !(value <= limit);
  return strict ? !(value > limit) : !(value >= limit);
}

/** Judges one declared check; null when it does not apply. */
export function assessCheck(d: CheckDeclaration, ctx: RuleContext): Check | null {
  // One judgement assesses each declaration once: the checks list and the rule deciding by it share the result
  const memo = ctx.assessed;
  if (memo === undefined) return assessFresh(d, ctx);
  let c = memo.get(d);
  if (c === undefined) {
    c = assessFresh(d, ctx);
    memo.set(d, c);
  }
  return c;
}

function assessFresh(d: CheckDeclaration, ctx: RuleContext): Check | null {
  if (!d.applies(ctx)) return null;
  const value = numberOrNull(d.value(ctx));
  const limit = d.limit(ctx);
  const warnLimit = d.warnLimit ? d.warnLimit(ctx) : null;
  const forced = d.forcedFailure ? d.forcedFailure(ctx) : null;
  let status: CheckStatus;
  if (forced !== null) status = 'fail';
  else if (value === null) {
    const s = d.missing ? d.missing(ctx) : 'info';
    status = s === 'blocking' ? 'fail' : s === 'warning' ? 'warning' : 'not-computed';
  } else if (past(value, limit, d.limitKind, d.strict === true)) status = (d.pastLimit ? d.pastLimit(ctx) : 'blocking') === 'blocking' ? 'fail' : 'warning';
  else if (warnLimit !== null && past(value, warnLimit, d.limitKind, false)) status = 'warning';
  else status = 'pass';
  return {
    id: d.id,
    ruleId: d.ruleId,
    label: d.label,
    shortLabel: d.shortLabel,
    group: d.group,
    quantity: d.quantity,
    subject: d.subject(ctx),
    value,
    limit,
    limitKind: d.limitKind,
    warnLimit,
    ratio: value === null ? null : value / limit,
    margin: value === null ? null : d.limitKind === 'minimum' ? value / limit : limit / value,
    status,
    note: forced,
  };
}

/** Ordering key of a margin: NaN (not computable) below everything. */
const marginKey = (c: Check): number => (c.margin === null || Number.isNaN(c.margin) ? Number.NEGATIVE_INFINITY : c.margin);

/**
 * The governing check: the one furthest past its limit when any fails, else the one nearest to its limit. Checks
 * without a value count only when they fail (a missing value the rules block on governs first).
 */
export function governingCheck(checks: readonly Check[]): Check | null {
  let worst: Check | null = null;
  for (const c of checks) {
    if (c.value === null && c.status !== 'fail') continue;
    if (worst === null) { worst = c; continue; }
    const cf = c.status === 'fail';
    const wf = worst.status === 'fail';
    if (cf !== wf) { if (cf) worst = c; continue; }
    if (marginKey(c) < marginKey(worst)) worst = c;
  }
  return worst;
}

/** The lowest factor of safety over the strength checks that have a value (NaN lowest), or null. */
export function lowestStrengthCheck(checks: readonly Check[]): Check | null {
  let lowest: Check | null = null;
  const key = (c: Check): number => (Number.isNaN(c.value) ? Number.NEGATIVE_INFINITY : (c.value as number));
  for (const c of checks) {
    if (c.group !== 'strength' || c.value === null) continue;
    if (lowest === null || key(c) < key(lowest)) lowest = c;
  }
  return lowest;
}

/** A context for the declarations outside a rule run (re-check, report, search). */
export function checkContext(design: Design, evaluation: Evaluation, thresholds: RuleContext['thresholds']): RuleContext {
  return { design, evaluation, thresholds };
}

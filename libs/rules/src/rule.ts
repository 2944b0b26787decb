/**
 * The shape of a design rule: a pure function of (design, evaluation, thresholds) that returns one
 * finding or none, plus the listing fields the API shows.
 *
 * Subjects: a bare path ("stresses.body.vonMises") points into the Evaluation; a path starting with
 * "design." ("design.friction.thread.source") points into the normalized Design, for inputs the
 * evaluation does not carry.
 */
import type { Finding } from '@leadline/contracts';
import type { Design, DutyKind, Evaluation } from '@leadline/mechanics';
import type { Check, CheckDeclaration } from './check';
import type { Thresholds } from './rule-set';

export interface RuleContext {
  readonly design: Design;
  readonly evaluation: Evaluation;
  readonly thresholds: Thresholds;
  /** Checks already assessed in this judgement, by declaration (judgeWithChecks; a Check is never changed once made) */
  readonly assessed?: Map<CheckDeclaration, Check | null>;
}

export type RuleCheck = (ctx: RuleContext) => Finding | null;

/** Any part of a finding: the fields a rule fixes once (its base) or sets per case. */
export type FindingPart = { readonly [K in keyof Finding]?: Finding[K] };

/**
 * A finding from a rule's fixed part and the case's fields: the same keys, in the same order and with the same
 * values as the literal `{ ...base, ...fields }`, which on Node 20 (V8 11.3) falls off the fast object-clone path
 * whenever keys follow the spread (2-8 us per finding measured, against under 0.5 us here; docs/performance.md).
 */
export function finding(base: FindingPart, fields: FindingPart): Finding {
  return Object.assign({}, base, fields) as Finding;
}

/** A registered rule. `basis` is the rule's general basis; a finding may state a more specific one. */
export interface Rule {
  /** Short kebab-case id; a finding carries it as its ruleId */
  readonly id: string;
  readonly title: string;
  readonly basis: string;
  /** What the rule checks and how it grades severity */
  readonly description: string;
  readonly check: RuleCheck;
  /** The numeric checks the rule makes, declared once (check.ts); the rule decides with assessCheck on them */
  readonly checks?: readonly CheckDeclaration[];
  /**
   * True when the rule's finding does not depend on the nut length (it reads only the thread, the load, the collar,
   * the screw's material, length and ends, the duty and the drive). The screw search prunes a screw's other nut
   * lengths when such a rule blocks it; a rule without the flag is treated as nut-dependent (never pruned on).
   */
  readonly nutIndependent?: boolean;
}

/** The listing the API shows for a rule. */
export interface RuleSummary {
  readonly id: string;
  readonly title: string;
  readonly basis: string;
  readonly description: string;
}

/**
 * True when `value` fails to reach `minimum`; NaN fails, so a value the engine could not compute
 * is never passed silently (the safe side).
 */
export function fallsShort(value: number, minimum: number): boolean {
  return !(value >= minimum);
}

/** True when `value` exceeds `maximum`; NaN counts as exceeding (the safe side). */
export function exceeds(value: number, maximum: number): boolean {
  return !(value <= maximum);
}

/** Duty kind as a phrase for messages. */
export function dutyPhrase(kind: DutyKind): string {
  return `${kind} duty`;
}

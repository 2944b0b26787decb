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
import type { Thresholds } from './rule-set';

export interface RuleContext {
  readonly design: Design;
  readonly evaluation: Evaluation;
  readonly thresholds: Thresholds;
}

export type RuleCheck = (ctx: RuleContext) => Finding | null;

/** A registered rule. `basis` is the rule's general basis; a finding may state a more specific one. */
export interface Rule {
  /** Short kebab-case id; a finding carries it as its ruleId */
  readonly id: string;
  readonly title: string;
  readonly basis: string;
  /** What the rule checks and how it grades severity */
  readonly description: string;
  readonly check: RuleCheck;
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

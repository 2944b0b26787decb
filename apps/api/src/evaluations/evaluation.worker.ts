/**
 * A worker thread of the evaluation route (evaluation-pool.ts): assesses a design and writes the route's answer as
 * JSON text, so that the request's thread only authenticates, reads the body and sends the text. Runs exactly the
 * functions the in-request path runs (assess-design.ts, evaluation-answer.ts).
 */
import type { RuleSet } from '@leadline/rules';
import { isMainThread } from 'node:worker_threads';
import { Piscina } from 'piscina';
import { assessDesign, type AssessmentProblem } from './assess-design';
import { evaluationAnswer, writeEvaluationAnswer } from './evaluation-answer';

/** One evaluation: the raw body, the rule set by its key (sent whole only when this thread asked for it) and the trace flag. */
export interface EvaluationTask {
  readonly body: unknown;
  readonly ruleSetKey: string;
  readonly ruleSet?: RuleSet;
  readonly trace: boolean;
}

/**
 * The answer as UTF-8 bytes (moved to the request's thread, not copied), the fields that refuse the design, or the
 * key of a rule set this thread does not hold yet.
 */
export type EvaluationOutcome = Uint8Array | { readonly problems: readonly AssessmentProblem[] } | { readonly ruleSetWanted: string };

/** Rule sets this thread was sent, by key; at most RULE_SETS_KEPT (the oldest forgotten first, asked for again if needed). */
const ruleSets = new Map<string, RuleSet>();
const RULE_SETS_KEPT = 16;
const encoder = new TextEncoder();
const inWorker = !isMainThread;

/** The task's answer (the pool calls it by name). */
export function answerEvaluation(task: EvaluationTask): EvaluationOutcome {
  if (task.ruleSet && !ruleSets.has(task.ruleSetKey)) {
    if (ruleSets.size >= RULE_SETS_KEPT) ruleSets.delete(ruleSets.keys().next().value as string);
    ruleSets.set(task.ruleSetKey, task.ruleSet);
  }
  const ruleSet = task.ruleSet ?? ruleSets.get(task.ruleSetKey);
  if (ruleSet === undefined) return { ruleSetWanted: task.ruleSetKey };
  const outcome = assessDesign(task.body, ruleSet);
  if ('problems' in outcome) return { problems: outcome.problems };
  const bytes = encoder.encode(writeEvaluationAnswer(evaluationAnswer(outcome.assessment, task.trace)));
  // Moved as the task's whole result (Piscina moves a top-level result only); in the request's thread it stays as is
  return inWorker ? (Piscina.move(bytes) as unknown as Uint8Array) : bytes;
}

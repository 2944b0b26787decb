/**
 * The evaluation route's answer and its text, shared by the route's worker threads and the in-request path.
 */
import type { Assessment } from './assess-design';

/**
 * The answer as JSON text. JSON.stringify, not a serializer compiled from the schema: on answers the engine has just
 * built, a compiled serializer (fast-json-stringify) took about three times JSON.stringify's time, although it was
 * faster on one answer written again and again (docs/performance.md, "The evaluation route").
 */
export function writeEvaluationAnswer(answer: Record<string, unknown>): string {
  return JSON.stringify(answer);
}

/** The evaluation route's answer: the evaluation (its trace only when asked), the declared checks, the governing one and the verdict. */
export function evaluationAnswer(a: Assessment, withTrace: boolean): Record<string, unknown> {
  // Copied key by key: an object rest pattern ({ trace, ...rest }) costs about 7 us here, the loop under 1 us
  const answer: Record<string, unknown> = {};
  const evaluation = a.evaluation as unknown as Record<string, unknown>;
  for (const key in evaluation) if (key !== 'trace') answer[key] = evaluation[key];
  if (withTrace) answer.trace = evaluation.trace;
  answer.checks = a.checks;
  answer.governing = a.governing;
  answer.verdict = a.verdict;
  answer.ruleSetVersion = a.ruleSetVersion;
  return answer;
}

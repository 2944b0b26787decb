import { Body, Controller, HttpCode, Post, Query, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { UserLimit } from '../infra/http/user-limits';
import { AssessmentService } from './assessment.service';
import { RuleSetsService } from '../rules/rule-sets.service';

/**
 * The answer as JSON text. JSON.stringify, not a serializer compiled from the schema: on answers the engine has just
 * built, a compiled serializer (fast-json-stringify) took about three times JSON.stringify's time, although it was
 * faster on one answer written again and again (docs/performance.md, "The evaluation route").
 */
export function writeEvaluationAnswer(answer: Record<string, unknown>): string {
  return JSON.stringify(answer);
}

@Controller('api/v1/evaluations')
export class EvaluationsController {
  constructor(
    private readonly assessor: AssessmentService,
    private readonly ruleSets: RuleSetsService,
  ) {}

  /**
   * Stateless: evaluates and judges a design; nothing is stored. Returns the Evaluation with its findings.
   * The formula trace (two thirds of the body) comes with `?trace=true`; stored revisions always keep it.
   */
  @Post()
  @HttpCode(200)
  @UserLimit('evaluations')
  evaluate(@Body() body: unknown, @Res({ passthrough: true }) reply: FastifyReply, @Query('trace') trace?: string): string {
    const answer = evaluationAnswer(this.assessor.assess(body, this.ruleSets.current()), trace === 'true');
    reply.header('content-type', 'application/json; charset=utf-8');
    return writeEvaluationAnswer(answer);
  }
}

/** The evaluation route's answer: the evaluation (its trace only when asked), the declared checks, the governing one and the verdict. */
export function evaluationAnswer(a: ReturnType<AssessmentService['assess']>, withTrace: boolean): Record<string, unknown> {
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

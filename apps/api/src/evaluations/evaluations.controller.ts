import { Body, Controller, HttpCode, Post, Query, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { UserLimit } from '../infra/http/user-limits';
import { EvaluationPool } from './evaluation-pool';
import { RuleSetsService } from '../rules/rule-sets.service';

@Controller('api/v1/evaluations')
export class EvaluationsController {
  constructor(
    private readonly pool: EvaluationPool,
    private readonly ruleSets: RuleSetsService,
  ) {}

  /**
   * Stateless: evaluates and judges a design; nothing is stored. Returns the Evaluation with its findings.
   * The formula trace (two thirds of the body) comes with `?trace=true`; stored revisions always keep it.
   */
  @Post()
  @HttpCode(200)
  @UserLimit('evaluations')
  async evaluate(@Body() body: unknown, @Res({ passthrough: true }) reply: FastifyReply, @Query('trace') trace?: string): Promise<Buffer> {
    const json = await this.pool.answer(body, this.ruleSets.current(), trace === 'true');
    reply.header('content-type', 'application/json; charset=utf-8');
    return json;
  }
}


import { Body, Controller, HttpCode, Post, Query } from '@nestjs/common';
import { AssessmentService } from './assessment.service';
import { RuleSetsService } from '../rules/rule-sets.service';

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
  evaluate(@Body() body: unknown, @Query('trace') trace?: string) {
    const a = this.assessor.assess(body, this.ruleSets.current());
    const { trace: formulaTrace, ...evaluation } = a.evaluation;
    return { ...evaluation, ...(trace === 'true' ? { trace: formulaTrace } : {}), verdict: a.verdict, ruleSetVersion: a.ruleSetVersion };
  }
}

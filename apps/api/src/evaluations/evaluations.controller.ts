import { Body, Controller, HttpCode, Post } from '@nestjs/common';
import { AssessmentService } from './assessment.service';
import { RuleSetsService } from '../rules/rule-sets.service';

@Controller('api/v1/evaluations')
export class EvaluationsController {
  constructor(
    private readonly assessor: AssessmentService,
    private readonly ruleSets: RuleSetsService,
  ) {}

  /** Stateless: evaluates and judges a design; nothing is stored. Returns the Evaluation with its findings. */
  @Post()
  @HttpCode(200)
  evaluate(@Body() body: unknown) {
    const a = this.assessor.assess(body, this.ruleSets.current());
    return { ...a.evaluation, verdict: a.verdict, ruleSetVersion: a.ruleSetVersion };
  }
}

import { Body, Controller, HttpCode, Post, Query } from '@nestjs/common';
import { UserLimit } from '../infra/http/user-limits';
import { z } from 'zod';
import { AssessmentService } from '../evaluations/assessment.service';
import { validate } from '../infra/http/problem';
import { RuleSetsService } from '../rules/rule-sets.service';
import { renderDesignCharts } from './charts';

export const chartsQuerySchema = z.object({ units: z.enum(['SI', 'US']).optional().describe('display units; default: the system the design was entered in') });

/**
 * The report's torque-friction and column charts for a design that is not saved (the design form's live
 * preview), as SVG from the same charting path as the report; nothing is stored.
 */
@Controller('api/v1/evaluations')
export class DesignChartsController {
  constructor(
    private readonly assessor: AssessmentService,
    private readonly ruleSets: RuleSetsService,
  ) {}

  @Post('charts')
  @UserLimit('evaluations')
  @HttpCode(200)
  async charts(@Body() body: unknown, @Query() query: unknown) {
    const { units } = validate(chartsQuerySchema, query);
    const a = this.assessor.assess(body, this.ruleSets.current());
    const system = units ?? a.design.unitSystem;
    const charts = await renderDesignCharts(a.design, a.evaluation, system);
    return { unitSystem: system, torqueFriction: charts.torqueFriction, column: charts.column };
  }
}

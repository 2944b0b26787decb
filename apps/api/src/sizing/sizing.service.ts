/**
 * Screw selection over the standard size tables (POST /api/v1/sizing): validates the requirements and runs the pure
 * search (libs/sizing) under the adopted rule set. Nothing is stored.
 */
import { Injectable } from '@nestjs/common';
import { parseSizingRequest, searchSteps, type SizingResult } from '@leadline/sizing';
import { SlicedRunner } from '../infra/slices';
import { ValidationProblem } from '../infra/http/problem';
import { RuleSetsService } from '../rules/rule-sets.service';

@Injectable()
export class SizingService {
  /** Searches run in slices of the event loop, two at a time, so other requests are served while they run */
  readonly runner = new SlicedRunner();

  constructor(private readonly ruleSets: RuleSetsService) {}

  /** Every standard screw that passes the requirements, ranked; invalid requirements answer 422 naming the field. */
  async size(body: unknown): Promise<SizingResult> {
    const parsed = parseSizingRequest(body);
    if (!parsed.success) throw new ValidationProblem(parsed.issues);
    return this.runner.run(searchSteps(parsed.plan, this.ruleSets.current()));
  }
}

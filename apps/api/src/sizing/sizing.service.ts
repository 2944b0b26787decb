/**
 * Screw selection over the standard size tables (POST /api/v1/sizing): validates the requirements and runs the pure
 * search (libs/sizing) under the adopted rule set. Nothing is stored.
 */
import { Injectable } from '@nestjs/common';
import { parseSizingRequest, searchScrews, type SizingResult } from '@leadline/sizing';
import { ValidationProblem } from '../infra/http/problem';
import { RuleSetsService } from '../rules/rule-sets.service';

@Injectable()
export class SizingService {
  constructor(private readonly ruleSets: RuleSetsService) {}

  /** Every standard screw that passes the requirements, ranked; invalid requirements answer 422 naming the field. */
  size(body: unknown): SizingResult {
    const parsed = parseSizingRequest(body);
    if (!parsed.success) throw new ValidationProblem(parsed.issues);
    return searchScrews(parsed.plan, this.ruleSets.current());
  }
}

/**
 * Turns a raw design input into an assessment (assess-design.ts) in the request, or refuses it with a 422 naming the
 * fields; used by durable submissions, drafts and charts. The stateless evaluation route runs the same function on
 * worker threads (evaluation-pool.ts).
 */
import { Injectable } from '@nestjs/common';
import type { RuleSet } from '@leadline/rules';
import { ValidationProblem } from '../infra/http/problem';
import { assessDesign, type Assessment } from './assess-design';

@Injectable()
export class AssessmentService {
  /** @param pathPrefix - prefix for field paths in errors, e.g. "design." when the input is nested */
  assess(raw: unknown, ruleSet: RuleSet, pathPrefix = ''): Assessment {
    const outcome = assessDesign(raw, ruleSet, pathPrefix);
    if ('problems' in outcome) throw new ValidationProblem(outcome.problems);
    return outcome.assessment;
  }
}

/**
 * Turns a raw design input into an assessment: validated design, engine evaluation, findings and verdict.
 * Pure apart from the rule set it is given; used by the stateless route and by durable submissions alike.
 */
import { Injectable } from '@nestjs/common';
import { parseDesign, type Finding, type Verdict } from '@leadline/contracts';
import { evaluate, ENGINE_VERSION, type Design, type Evaluation } from '@leadline/mechanics';
import { judge, verdictOf, type RuleSet } from '@leadline/rules';
import { ValidationProblem } from '../infra/http/problem';

export interface Assessment {
  readonly design: Design;
  readonly evaluation: Evaluation;
  readonly findings: readonly Finding[];
  readonly verdict: Verdict;
  readonly engineVersion: string;
  readonly ruleSetVersion: string;
}

@Injectable()
export class AssessmentService {
  /** @param pathPrefix - prefix for field paths in errors, e.g. "design." when the input is nested */
  assess(raw: unknown, ruleSet: RuleSet, pathPrefix = ''): Assessment {
    const parsed = parseDesign(raw);
    if (!parsed.success) {
      throw new ValidationProblem(parsed.issues.map((i) => ({ path: pathPrefix + i.path, message: i.message })));
    }
    const evaluation = evaluate(parsed.design);
    const findings = judge(parsed.design, evaluation, ruleSet);
    return {
      design: parsed.design,
      evaluation: { ...evaluation, findings },
      findings,
      verdict: verdictOf(findings),
      engineVersion: ENGINE_VERSION,
      ruleSetVersion: ruleSet.version,
    };
  }
}

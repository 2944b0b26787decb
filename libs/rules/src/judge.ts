/** Runs the registered rules over one evaluated design and grades the result. Pure and deterministic. */
import type { Finding, Verdict } from '@leadline/contracts';
import type { Design, Evaluation } from '@leadline/mechanics';
import { assessCheck, governingCheck, type Check } from './check';
import { CHECK_DECLARATIONS, RULE_REGISTRY } from './registry';
import { DEFAULT_RULE_SET, type RuleSet, type Thresholds } from './rule-set';

/**
 * All findings for a design under a rule set, in registry order, at most one per rule id.
 * The rule set is taken as already validated (ruleSetDefinitionSchema).
 */
export function judge(design: Design, evaluation: Evaluation, ruleSet: RuleSet = DEFAULT_RULE_SET): Finding[] {
  const ctx = { design, evaluation, thresholds: ruleSet.thresholds };
  const findings: Finding[] = [];
  for (const rule of RULE_REGISTRY) {
    const finding = rule.check(ctx);
    if (finding !== null) findings.push(finding);
  }
  return findings;
}

/** Every declared check that applies to the design under the thresholds, judged, in registry order. */
export function checksOf(design: Design, evaluation: Evaluation, thresholds: Thresholds): Check[] {
  const ctx = { design, evaluation, thresholds };
  const checks: Check[] = [];
  for (const d of CHECK_DECLARATIONS) {
    const c = assessCheck(d, ctx);
    if (c !== null) checks.push(c);
  }
  return checks;
}

/** What an evaluation answer carries besides the engine's figures: findings, every applicable check, the governing one. */
export interface Judgement {
  readonly findings: Finding[];
  readonly checks: Check[];
  readonly governing: Check | null;
}

/** judge() plus the declared checks and the governing check, from the same declarations the rules decide by. */
export function judgeWithChecks(design: Design, evaluation: Evaluation, ruleSet: RuleSet = DEFAULT_RULE_SET): Judgement {
  const findings = judge(design, evaluation, ruleSet);
  const checks = checksOf(design, evaluation, ruleSet.thresholds);
  return { findings, checks, governing: governingCheck(checks) };
}

/** 'blocked' if any finding blocks, 'needs-acknowledgement' if any warns, else 'clear'. */
export function verdictOf(findings: readonly Finding[]): Verdict {
  if (findings.some((f) => f.severity === 'blocking')) return 'blocked';
  if (findings.some((f) => f.severity === 'warning')) return 'needs-acknowledgement';
  return 'clear';
}

/** Runs the registered rules over one evaluated design and grades the result. Pure and deterministic. */
import type { Finding, Verdict } from '@leadline/contracts';
import type { Design, Evaluation } from '@leadline/mechanics';
import { assessCheck, governingCheck, type Check } from './check';
import { CHECK_DECLARATIONS, RULE_REGISTRY } from './registry';
import { DEFAULT_RULE_SET, type RuleSet, type Thresholds } from './rule-set';
import type { RuleContext } from './rule';

/**
 * All findings for a design under a rule set, in registry order, at most one per rule id.
 * The rule set is taken as already validated (ruleSetDefinitionSchema).
 */
export function judge(design: Design, evaluation: Evaluation, ruleSet: RuleSet = DEFAULT_RULE_SET): Finding[] {
  return findingsOf({ design, evaluation, thresholds: ruleSet.thresholds });
}

function findingsOf(ctx: RuleContext): Finding[] {
  const findings: Finding[] = [];
  for (const rule of RULE_REGISTRY) {
    const finding = rule.check(ctx);
    if (finding !== null) findings.push(finding);
  }
  return findings;
}

/** Every declared check that applies to the design under the thresholds, judged, in registry order. */
export function checksOf(design: Design, evaluation: Evaluation, thresholds: Thresholds): Check[] {
  return declaredChecks({ design, evaluation, thresholds });
}

function declaredChecks(ctx: RuleContext): Check[] {
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
  // One context with a memo: each declaration is assessed once, for the checks list and for the rule that decides by it
  const ctx: RuleContext = { design, evaluation, thresholds: ruleSet.thresholds, assessed: new Map() };
  const checks = declaredChecks(ctx);
  const findings = findingsOf(ctx);
  return { findings, checks, governing: governingCheck(checks) };
}

/** 'blocked' if any finding blocks, 'needs-acknowledgement' if any warns, else 'clear'. */
export function verdictOf(findings: readonly Finding[]): Verdict {
  if (findings.some((f) => f.severity === 'blocking')) return 'blocked';
  if (findings.some((f) => f.severity === 'warning')) return 'needs-acknowledgement';
  return 'clear';
}

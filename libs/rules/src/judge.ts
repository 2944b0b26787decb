/** Runs the registered rules over one evaluated design and grades the result. Pure and deterministic. */
import type { Finding, Verdict } from '@leadline/contracts';
import type { Design, Evaluation } from '@leadline/mechanics';
import { RULE_REGISTRY } from './registry';
import { DEFAULT_RULE_SET, type RuleSet } from './rule-set';

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

/** 'blocked' if any finding blocks, 'needs-acknowledgement' if any warns, else 'clear'. */
export function verdictOf(findings: readonly Finding[]): Verdict {
  if (findings.some((f) => f.severity === 'blocking')) return 'blocked';
  if (findings.some((f) => f.severity === 'warning')) return 'needs-acknowledgement';
  return 'clear';
}

/**
 * Shared shape of the rules on the engine 1.2 figures: one declared check (check.ts) decides the finding. Past its limit
 * the finding has the declaration's severity; a value the engine could not give is a finding naming what is missing
 * (blocking where the declaration says so), never a silent pass.
 */
import type { Finding } from '@leadline/contracts';
import { assessCheck, type CheckDeclaration } from '../check';
import { percent, sig, sigPair } from '../format';
import { finding, type Rule, type RuleContext } from '../rule';

export interface LimitRuleSpec {
  readonly id: string;
  readonly title: string;
  readonly basis: string;
  readonly description: string;
  readonly check: CheckDeclaration;
  /** What is checked, for the message: "Nut body (hoop and axial stress, von Mises)" */
  readonly what: string;
  /** The inputs that would let a missing value be computed */
  readonly missing: (ctx: RuleContext) => string;
  /** What to change when the check fails */
  readonly remedy: string;
  /** Why falling short matters, one sentence */
  readonly consequence: string;
  readonly nutIndependent?: boolean;
}

const shown = (quantity: CheckDeclaration['quantity'], v: number): string => (quantity === 'fraction' ? percent(v) : sig(v));

/** The rule of one declared check. */
export function limitRule(spec: LimitRuleSpec): Rule {
  const d = spec.check;
  const check = (ctx: RuleContext): Finding | null => {
    const c = assessCheck(d, ctx);
    if (c === null || c.status === 'pass') return null;
    const base = { ruleId: spec.id, unit: '-', subject: c.subject, basis: spec.basis, limit: c.limit } as const;
    if (c.value === null) {
      const what = spec.missing(ctx);
      const blocking = c.status === 'fail';
      return finding(base, {
        severity: blocking ? 'blocking' : c.status === 'warning' ? 'warning' : 'info',
        measured: null,
        message:
          `${spec.what} cannot be checked: ${what} ${what.includes(' or ') || what.includes(', ') ? 'are' : 'is'} missing.` +
          (blocking ? ' On lifting duty a check that cannot be computed blocks.' : '') +
          ` Give ${what} to check it against the limit ${shown(d.quantity, c.limit)}.`,
      });
    }
    const [v, l] = d.quantity === 'fraction' ? [percent(c.value), percent(c.limit)] : sigPair(c.value, c.limit);
    const relation = d.limitKind === 'minimum' ? `below the minimum ${l}` : `above the maximum ${l}`;
    const short = c.status === 'warning' && c.warnLimit !== null ? `near its limit (warning from ${shown(d.quantity, c.warnLimit)}; limit ${l})` : relation;
    return finding(base, {
      severity: c.status === 'fail' ? 'blocking' : 'warning',
      measured: c.value,
      message: `${spec.what}: ${v}, ${short}${c.note ? ` (${c.note})` : ''}. ${spec.consequence} ${spec.remedy}`,
    });
  };
  return {
    id: spec.id,
    title: spec.title,
    basis: spec.basis,
    description: spec.description,
    check,
    checks: [d],
    ...(spec.nutIndependent ? { nutIndependent: true } : {}),
  };
}

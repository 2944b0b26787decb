/**
 * Shared shape of the static-strength rules: a yield-based factor of safety from the engine
 * (capacity over demand) held against the rule set's minimum for the duty kind.
 */
import type { Finding } from '@leadline/contracts';
import type { DutyKind } from '@leadline/mechanics';
import type { Check, CheckDeclaration } from '../check';
import { mpa, sig, sigPair } from '../format';
import type { RuleContext } from '../rule';
import { missingValueSeverityOnLifting } from '../rule-set';

/** Common practice behind the minimum static factors of safety. */
export const STRENGTH_BASIS =
  'common practice on yield (defaults: lifting 3.0, other duty 2.0), by analogy with ASME BTH-1 design factors ' +
  'N_d = 3.00 (Category B) and 2.00 (Category A) (from memory; BTH-1 does not itself cover screw jacks)';

/**
 * The declaration of a static-strength check: a factor of safety against the rule set's minimum for the duty kind
 * (strength.minSafetyFactor unless `limit` says otherwise), blocking below it. A check whose value needs the nut's
 * yield strength is missing without it: blocking on lifting duty under rule sets that say so, information otherwise.
 */
export function strengthDeclaration(d: {
  readonly id: string;
  readonly label: string;
  readonly shortLabel: string;
  readonly subject: string;
  readonly value: (ctx: RuleContext) => number | null | undefined;
  readonly limit?: (ctx: RuleContext) => number;
  readonly applies?: (ctx: RuleContext) => boolean;
  readonly needsNutYield?: boolean;
}): CheckDeclaration {
  return {
    id: d.id,
    ruleId: d.id,
    label: d.label,
    shortLabel: d.shortLabel,
    group: 'strength',
    quantity: 'factor',
    limitKind: 'minimum',
    subject: () => d.subject,
    applies: d.applies ?? (() => true),
    value: d.needsNutYield
      ? (ctx) => (ctx.design.nut.yieldStrength === null ? null : d.value(ctx) ?? null)
      : (ctx) => d.value(ctx) ?? null,
    limit: d.limit ?? ((ctx) => ctx.thresholds.strength.minSafetyFactor[ctx.design.duty.kind]),
    missing: (ctx) => (ctx.design.duty.kind === 'lifting' && missingValueSeverityOnLifting(ctx.thresholds) === 'blocking' ? 'blocking' : 'info'),
  };
}

export interface StrengthCheck {
  /** The judged check (assessCheck of the rule's declaration) */
  readonly check: Check;
  /** What is checked, e.g. "Screw body (axial + torsion, von Mises)" */
  readonly what: string;
  readonly duty: DutyKind;
  /** Stress and the strength it is held against [Pa], for the message */
  readonly stress: number;
  readonly strength: number;
  readonly strengthName: string;
  /** What to change when the check fails */
  readonly remedy: string;
  /** Formula basis of the engine's stress, appended to the threshold basis */
  readonly formulaBasis: string;
}

/** A blocking finding when the factor of safety falls short of the minimum, else null. */
export function strengthFinding(c: StrengthCheck): Finding | null {
  if (c.check.status !== 'fail' || c.check.value === null) return null;
  const [n, limit] = sigPair(c.check.value, c.check.limit);
  return {
    ruleId: c.check.ruleId,
    severity: 'blocking',
    measured: c.check.value,
    limit: c.check.limit,
    unit: '-',
    subject: c.check.subject,
    message:
      `${c.what}: stress ${mpa(c.stress)} against ${c.strengthName} ${mpa(c.strength)} gives a factor of safety of ${n}, ` +
      `below the minimum ${limit} for ${c.duty} duty. Below this margin, load peaks, material scatter and model ` +
      `simplifications can reach yield. ${c.remedy}`,
    basis: `${STRENGTH_BASIS}; ${c.formulaBasis}`,
  };
}

/**
 * The finding for a strength check that cannot be computed for want of a value: blocking on lifting duty under a rule
 * set that says so (missingValues.onLifting, 2026.12-2), information otherwise.
 */
export function missingValueFinding(check: Check, what: string, missing: string, duty: DutyKind, basis: string): Finding {
  // The declaration's `missing` decided the status: blocking on lifting duty where the rule set says so
  const lifting = check.status === 'fail';
  const minimum = check.limit;
  return {
    ruleId: check.ruleId,
    severity: lifting ? 'blocking' : 'info',
    measured: null,
    limit: minimum,
    unit: '-',
    subject: check.subject,
    message: lifting
      ? `${what} cannot be checked: ${missing} is missing. On lifting duty a strength check that cannot be computed blocks, ` +
        `because a failure drops the load. Give ${missing} (the supplier's or the specification's minimum) to check it ` +
        `against the minimum factor of safety ${sig(minimum)}.`
      : `${what} was not checked: ${missing} is missing (grey iron and polymers have none in the library). Give ${missing} ` +
        `from the supplier to check it against the minimum factor of safety ${sig(minimum)} for ${duty} duty.`,
    basis,
  };
}

/**
 * Shared shape of the static-strength rules: a yield-based factor of safety from the engine
 * (capacity over demand) held against the rule set's minimum for the duty kind.
 */
import type { Finding } from '@leadline/contracts';
import type { DutyKind } from '@leadline/mechanics';
import { mpa, sig, sigPair } from '../format';
import { fallsShort } from '../rule';

/** Common practice behind the minimum static factors of safety. */
export const STRENGTH_BASIS =
  'common practice on yield (defaults: lifting 3.0, other duty 2.0), by analogy with ASME BTH-1 design factors ' +
  'N_d = 3.00 (Category B) and 2.00 (Category A) (from memory; BTH-1 does not itself cover screw jacks)';

export interface StrengthCheck {
  readonly ruleId: string;
  readonly subject: string;
  /** What is checked, e.g. "Screw body (axial + torsion, von Mises)" */
  readonly what: string;
  readonly safetyFactor: number;
  readonly minimum: number;
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
  if (!fallsShort(c.safetyFactor, c.minimum)) return null;
  const [n, limit] = sigPair(c.safetyFactor, c.minimum);
  return {
    ruleId: c.ruleId,
    severity: 'blocking',
    measured: c.safetyFactor,
    limit: c.minimum,
    unit: '-',
    subject: c.subject,
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
export function missingValueFinding(
  ruleId: string, subject: string, what: string, missing: string, minimum: number, duty: DutyKind, basis: string,
  onLifting: 'blocking' | 'info',
): Finding {
  const lifting = duty === 'lifting' && onLifting === 'blocking';
  return {
    ruleId,
    severity: lifting ? 'blocking' : 'info',
    measured: null,
    limit: minimum,
    unit: '-',
    subject,
    message: lifting
      ? `${what} cannot be checked: ${missing} is missing. On lifting duty a strength check that cannot be computed blocks, ` +
        `because a failure drops the load. Give ${missing} (the supplier's or the specification's minimum) to check it ` +
        `against the minimum factor of safety ${sig(minimum)}.`
      : `${what} was not checked: ${missing} is missing (grey iron and polymers have none in the library). Give ${missing} ` +
        `from the supplier to check it against the minimum factor of safety ${sig(minimum)} for ${duty} duty.`,
    basis,
  };
}

/** Column buckling of a screw in compression (Euler or J. B. Johnson, as the engine chose). */
import type { Finding } from '@leadline/contracts';
import { sig, sigPair } from '../format';
import { assessCheck, type CheckDeclaration } from '../check';
import type { Rule, RuleContext } from '../rule';

export const COLUMN_BUCKLING_ID = 'column-buckling';
const BASIS =
  'common practice: strength factor plus 0.5 (defaults: lifting 3.5, other duty 2.5), since the critical load is sensitive to end ' +
  'fixity, crookedness and eccentricity; Shigley 9th ed. Table 4-2 restricts its recommended C to liberal factors of safety; ' +
  'Euler Eq. (4-43) and Johnson parabola, Shigley 9th ed. Sec. 4-11 ff.';

/** Only a screw in compression is a column; a factor the engine could not compute blocks (never passed silently). */
export const COLUMN_BUCKLING_CHECK: CheckDeclaration = {
  id: COLUMN_BUCKLING_ID,
  ruleId: COLUMN_BUCKLING_ID,
  label: 'Column buckling, P_cr / F',
  shortLabel: 'Buckling',
  group: 'column',
  quantity: 'factor',
  limitKind: 'minimum',
  subject: () => 'buckling.safetyFactor',
  applies: ({ evaluation }) => evaluation.buckling.applies,
  value: ({ evaluation }) => evaluation.buckling.safetyFactor,
  limit: ({ design, thresholds }) => thresholds.buckling.minSafetyFactor[design.duty.kind],
  missing: () => 'blocking',
};

export function columnBuckling(ctx: RuleContext): Finding | null {
  const { design, evaluation } = ctx;
  const b = evaluation.buckling;
  const check = assessCheck(COLUMN_BUCKLING_CHECK, ctx);
  if (check === null || check.status !== 'fail') return null;
  const minimum = check.limit;
  const [n, limit] = sigPair(check.value ?? Number.NaN, minimum);
  const critical = b.criticalLoad === null ? 'not computable' : `${sig(b.criticalLoad / 1000)} kN`;
  return {
    ruleId: COLUMN_BUCKLING_ID,
    severity: 'blocking',
    measured: b.safetyFactor,
    limit: minimum,
    unit: '-',
    subject: 'buckling.safetyFactor',
    message:
      `Screw in compression can buckle: critical load ${critical} (${b.regime ?? 'no'} regime, slenderness ${sig(b.slenderness)}, ` +
      `end-condition constant C = ${sig(b.endConditionConstant)}, ${b.endConditionBasis}) over the axial load ` +
      `${sig(design.load.axial / 1000)} kN gives a factor of ${n}, below the minimum ${limit} for ${design.duty.kind} duty. ` +
      `Buckling gives no warning and real columns fail below the ideal load. Shorten the unsupported length, fix the ends ` +
      `better, use a larger root diameter, or arrange the load to put the screw in tension.`,
    basis: BASIS,
  };
}

export const columnBucklingRule: Rule = {
  id: COLUMN_BUCKLING_ID,
  title: 'Column buckling',
  basis: BASIS,
  description: 'Blocks when a compressed screw has a buckling factor P_cr / F below buckling.minSafetyFactor for the duty kind.',
  check: columnBuckling,
  nutIndependent: true,
  checks: [COLUMN_BUCKLING_CHECK],
};

/**
 * Theoretical end-condition constants for fixed ends (C = 2 or 4) assume a fixity real supports do not give;
 * Shigley recommends C = 1.2 for both. This rule asks the engineer to justify the choice.
 */
import type { Finding } from '@leadline/contracts';
import { END_CONDITION_CONSTANT } from '@leadline/mechanics';
import { sig } from '../format';
import type { Rule, RuleContext } from '../rule';

export const COLUMN_END_FIXITY_ID = 'column-end-fixity';
const BASIS =
  "Shigley 9th ed. Table 4-2: recommended C = 1.2 for fixed-pinned and fixed-fixed columns against theoretical 2 and 4; " +
  'common practice: real bearings do not fully fix a screw end';

export function columnEndFixity({ design, evaluation }: RuleContext): Finding | null {
  const b = evaluation.buckling;
  if (!b.applies || b.endConditionBasis !== 'theoretical') return null;
  const recommended = END_CONDITION_CONSTANT.recommended[design.screw.ends];
  if (!(b.endConditionConstant > recommended)) return null;
  return {
    ruleId: COLUMN_END_FIXITY_ID,
    severity: 'warning',
    measured: b.endConditionConstant,
    limit: recommended,
    unit: '-',
    subject: 'buckling.endConditionConstant',
    message:
      `The column check uses the theoretical end-condition constant C = ${sig(b.endConditionConstant)} for ${design.screw.ends} ` +
      `ends, against the recommended C = ${sig(recommended)}. Theoretical fixity overstates the critical load by a factor of ` +
      `up to ${sig(b.endConditionConstant / recommended)} unless the supports are truly rigid. Use the recommended basis, or ` +
      `record why the supports fix the screw.`,
    basis: BASIS,
  };
}

export const columnEndFixityRule: Rule = {
  id: COLUMN_END_FIXITY_ID,
  title: 'Theoretical end fixity in the column check',
  basis: BASIS,
  description: 'Warns when a compressed screw is checked with a theoretical end-condition constant above the recommended one.',
  check: columnEndFixity,
  nutIndependent: true,
};

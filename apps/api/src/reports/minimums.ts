/**
 * The minimum factors a report prints beside each safety factor: those of the rule set the revision was judged by,
 * for its duty, named by the rule that holds each one. One place, used by the report service and the report fixtures.
 */
import type { DutyKind } from '@leadline/mechanics';
import { nutThreadMinSafetyFactor, type Thresholds } from '@leadline/rules';
import type { ReportInput } from './report-model';

export function ruleSetMinimums(thresholds: Thresholds, duty: DutyKind): NonNullable<ReportInput['minimums']> {
  const strength = thresholds.strength.minSafetyFactor[duty];
  return {
    bodyVonMises: { limit: strength, ruleId: 'screw-body-yield' },
    firstThreadRoot: { limit: strength, ruleId: 'thread-root-yield' },
    strippingScrew: { limit: strength, ruleId: 'screw-thread-stripping' },
    strippingNut: { limit: strength, ruleId: 'nut-thread-stripping' },
    nutThreadRoot: { limit: nutThreadMinSafetyFactor(thresholds)[duty], ruleId: 'nut-thread-root-yield' },
    buckling: { limit: thresholds.buckling.minSafetyFactor[duty], ruleId: 'column-buckling' },
    drive: { limit: thresholds.drive.minMargin, ruleId: 'drive-torque-margin' },
  };
}

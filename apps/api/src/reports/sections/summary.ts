/**
 * Section 1 of the report, the summary: the figures a checking engineer reads first, the governing check and the lowest strength factor from the rules' declared checks.
 */
import { SHEAR_YIELD_RATIO, type Design, type Evaluation } from '@leadline/mechanics';
import { formatQuantity, sig, type QuantityKind, type UnitSystem } from '@leadline/presentation';
import { governingCheck, lowestStrengthCheck, type Check } from '@leadline/rules';
import type { ConventionsView, KeyValue, SafetyFactorRow } from '../report-view';
import { notComputedBy } from './inputs';

// ---------------------------------------------------------------------------------------------------------
// Summary and conventions

export function buildSummary(design: Design, e: Evaluation, system: UnitSystem, checks: readonly Check[], factors: readonly SafetyFactorRow[], engineVersion: string): KeyValue[] {
  const q = (si: number, kind: QuantityKind) => formatQuantity(si, kind, system);
  // Both from the rules' declared checks: every strength check the rules apply (the nut's own threads included)
  const governing = governingCheck(checks);
  const lowest = lowestStrengthCheck(checks);
  const row = (c: Check) => factors.find((f) => f.key === c.id) as SafetyFactorRow;
  const rows: KeyValue[] = [
    { label: 'Axial load', value: `${q(design.load.axial, 'force')} ${design.load.sense}`, note: `${design.duty.kind} duty` },
    { label: 'Raise torque at maximum friction', value: q(e.torque.raise.atMaxFriction, 'torque'), note: 'drive sizing; collar included' },
    {
      label: 'Lowering torque at minimum friction',
      value: q(e.torque.lower.atMinFriction, 'torque'),
      note: e.torque.lower.atMinFriction < 0 ? 'negative: the load back-drives the screw' : 'positive: torque is needed to lower',
    },
    { label: 'Efficiency', value: `${formatQuantity(e.efficiency.atMaxFriction, 'percent', system)} to ${formatQuantity(e.efficiency.atMinFriction, 'percent', system)}`, note: 'at maximum and minimum friction, collar included' },
    {
      label: 'Self-locking (thread alone, minimum friction)',
      value: e.selfLocking.locks ? `yes, margin ${sig(e.selfLocking.margin)}` : `no, margin ${sig(e.selfLocking.margin)}`,
      note: `boundary friction ${sig(e.selfLocking.boundaryFriction)}; brake fitted: ${design.duty.brake ? 'yes' : 'no'}`,
    },
  ];
  if (governing) {
    const g = row(governing);
    rows.push({ label: 'Governing check', value: `${g.valueText} against ${g.limitText}`, note: `${governing.label}: ${g.statusText}` });
  }
  if (lowest) {
    const l = row(lowest);
    rows.push({ label: 'Lowest strength safety factor', value: l.valueText, note: `${lowest.label} (minimum ${formatQuantity(lowest.limit, 'ratio', system)})` });
  }
  rows.push({
    label: 'Buckling safety factor',
    value: e.buckling.safetyFactor === null ? 'not applicable' : sig(e.buckling.safetyFactor),
    note: e.buckling.applies ? `${e.buckling.regime === 'euler' ? 'Euler' : 'Johnson'} column, l/k = ${sig(e.buckling.slenderness)}` : 'screw in tension',
  });
  if (e.criticalSpeed.ratio !== null) rows.push({ label: 'Operating / critical speed', value: sig(e.criticalSpeed.ratio), note: `critical speed ${q(e.criticalSpeed.rpm, 'rpm')}` });
  // An evaluation of an earlier engine lacks the brake figures and the partly fixed whirl speed: said, not left out
  const older = notComputedBy(engineVersion);
  if (e.brake === undefined) rows.push({ label: 'Brake holding torque, thread friction lost (f → 0)', value: older });
  if (e.criticalSpeed.partlyFixed === undefined) rows.push({ label: 'Operating / critical speed, ends partly fixed', value: older });
  if (e.brake) {
    rows.push({
      label: 'Brake holding torque, thread friction lost (f → 0)',
      value: q(e.brake.holdingTorqueNoFriction, 'torque'),
      note: `at minimum friction ${q(e.brake.holdingTorqueMinFriction, 'torque')}; reverse efficiency ${sig(e.brake.reverseEfficiency)}; brake rated ${e.brake.ratedTorque === null ? 'not stated' : q(e.brake.ratedTorque, 'torque')}`,
    });
  }
  if (e.criticalSpeed.partlyFixed?.ratio != null) {
    rows.push({ label: 'Operating / critical speed, ends partly fixed', value: sig(e.criticalSpeed.partlyFixed.ratio), note: `critical speed ${q(e.criticalSpeed.partlyFixed.rpm, 'rpm')}` });
  }
  if (e.drive) {
    const peakNote = e.drive.peakTorqueAtMotor !== undefined ? `; peak torque ${q(e.drive.peakTorqueAtMotor, 'torque')} at the motor` : '';
    rows.push({ label: 'Drive torque margin', value: sig(e.drive.margin), note: `${q(e.drive.availableTorque, 'torque')} available${peakNote}` });
  }
  return rows;
}

/** The facts of this revision that section 3's prose (templates/reports/sections/conventions.hbs) names. */
export function conventionsOf(design: Design, system: UnitSystem): ConventionsView {
  return { system, screwMaterial: design.screw.material ?? null, shearYieldRatio: String(SHEAR_YIELD_RATIO) };
}

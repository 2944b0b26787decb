/**
 * The facts each calculation section's notes print (report section 4): values formatted in the revision's unit system
 * and the flags that choose a sentence. The sentences themselves are the templates
 * templates/reports/sections/notes-<section id>.hbs; a section without such a template has no notes.
 */
import type { Design, Evaluation, FrictionRange } from '@leadline/mechanics';
import { coefficient, formatNumber, formatQuantity, sig, type QuantityKind, type UnitSystem } from '@leadline/presentation';
import type { SectionNotes } from '../report-view';

type Facts = Record<string, unknown>;

const notes = (id: string, facts: Facts): SectionNotes => ({ partial: `notes-${id}`, facts });

/** The evaluation groups (engine 1.2) each such section reports, for its "not computed" notes. */
const NOT_COMPUTED_GROUPS: Readonly<Record<string, readonly string[]>> = {
  'nut-body': ['nutBody'],
  'safety-nut': ['safetyNut', 'wornThread'],
  operation: ['operation', 'thermal', 'wear.pvAtTemperature'],
  'wear-life': ['wearLife'],
  dynamics: ['dynamics', 'stopping'],
  fatigue: ['fatigue'],
  'collar-bearing': ['collarBearing'],
};

/** What the engine could not compute for a section's groups, each with the inputs to give. */
export function notComputedOf(id: string, e: Evaluation): { subject: string; missing: string; reason: string }[] {
  const groups = NOT_COMPUTED_GROUPS[id] ?? [];
  return (e.notComputed ?? [])
    .filter((n) => groups.some((g) => n.subject === g || n.subject.startsWith(`${g}.`)))
    .map((n) => ({ subject: n.subject, missing: n.missing.join('; '), reason: `${n.reason.charAt(0).toUpperCase()}${n.reason.slice(1)}` }));
}

/** The notes of a calculation section, or null when the section has none. */
export function sectionNotes(id: string, design: Design, e: Evaluation, system: UnitSystem): SectionNotes | null {
  const q = (si: number, kind: QuantityKind) => formatQuantity(si, kind, system);
  const qOrNull = (si: number | null | undefined, kind: QuantityKind) => (si === null || si === undefined ? null : q(si, kind));
  const fr = (r: FrictionRange | null) => (r ? `${coefficient(r.min)} to ${coefficient(r.max)}` : 'none');
  switch (id) {
    case 'geometry':
      return notes(id, { standard: e.geometry.standard, size: e.geometry.size, starts: e.geometry.starts, manyStarts: e.geometry.starts > 1 });
    case 'torque':
      return notes(id, {
        load: q(design.load.axial, 'force'), sense: design.load.sense, threadFriction: fr(design.friction.thread), collarFriction: fr(design.friction.collar),
        collarKind: design.collar.kind, collarModel: design.collar.kind === 'annular' ? design.collar.model : null,
      });
    case 'self-locking':
      return notes(id, {
        locks: e.selfLocking.locks, minFriction: coefficient(design.friction.thread.min), boundary: sig(e.selfLocking.boundaryFriction),
        brake: design.duty.brake, vibration: design.duty.vibration,
      });
    case 'threads': {
      const st = e.stresses.stripping as Partial<Evaluation['stresses']['stripping']>;
      return notes(id, {
        planes: st.screwArea !== undefined && st.nutArea !== undefined && e.geometry.nutMinorDiameter !== undefined
          ? { nutMinorDiameter: q(e.geometry.nutMinorDiameter, 'length'), screwArea: q(st.screwArea, 'area'), nutArea: q(st.nutArea, 'area') }
          : null,
        nutThread: e.stresses.nutThread ? { yieldStrength: qOrNull(design.nut.yieldStrength, 'stress') } : null,
      });
    }
    case 'column': {
      const b = e.buckling;
      return notes(id, {
        applies: b.applies, length: q(design.screw.unsupportedLength, 'length'), ends: design.screw.ends, constant: sig(b.endConditionConstant),
        basis: b.endConditionBasis, euler: b.regime === 'euler',
      });
    }
    case 'brake': {
      const b = e.brake;
      return notes(id, b ? { computed: true, brake: design.duty.brake, location: b.location, ratedTorque: qOrNull(b.ratedTorque, 'torque') } : { computed: false });
    }
    case 'whirl': {
      const cs = e.criticalSpeed;
      return notes(id, {
        span: q(cs.span ?? design.screw.unsupportedLength, 'length'), spanStated: design.screw.whirlSpan != null,
        ends: cs.ends ?? design.screw.ends, endsStated: design.screw.whirlEnds != null, frequencyFactor: sig(cs.frequencyFactor),
        partlyFixed: cs.partlyFixed
          ? { constant: sig(cs.partlyFixed.endConditionConstant), frequencyFactor: sig(cs.partlyFixed.frequencyFactor), factor: sig(cs.partlyFixed.factor) }
          : null,
      });
    }
    case 'wear': {
      const w = e.wear;
      return notes(id, {
        material: design.nut.material, ownMaterial: design.nut.material !== null && design.nut.materialSource === 'design',
        allowablePv: qOrNull(design.nut.allowablePv, 'pv'), basis: w.allowablePressureBasis ?? null,
        allowablePressure: qOrNull(w.allowablePressure, 'pressure'), pressureClass: w.allowablePressureClass ?? null,
        rubbingSpeed: qOrNull(w.slidingVelocity, 'slidingSpeed'), pressureSource: w.allowablePressureSource ?? null,
        steps: (design.nut.pressureBySpeed ?? []).map((s) => ({ allowablePressure: qOrNull(s.allowablePressure, 'pressure'), upTo: qOrNull(s.upToRubbingSpeed, 'slidingSpeed') })),
      });
    }
    case 'power': {
      if (!design.drive) return notes(id, { drive: null, gearbox: null });
      const d = e.drive;
      const gb = design.drive.gearbox ?? null;
      return notes(id, {
        drive: { availableTorque: q(design.drive.availableTorque, 'torque'), loadMassBasis: d?.loadMassBasis ?? null, noAcceleration: d !== null && d.angularAcceleration === null },
        gearbox: gb ? { ratio: sig(gb.ratio), efficiency: sig(gb.efficiency), reverseEfficiency: sig(gb.reverseEfficiency) } : null,
      });
    }
    case 'operation': {
      const o = e.operation;
      const d = design.duty;
      const duty = [
        d.stroke != null ? `stroke ${q(d.stroke, 'length')}` : 'no stroke',
        d.cyclesPerHour != null ? `${formatNumber(d.cyclesPerHour, 'count', system)} cycles per hour` : null,
        d.dutyCycle != null ? `duty cycle ${q(d.dutyCycle, 'percent')}` : null,
      ].filter((x): x is string => x !== null);
      return notes(id, {
        computed: o !== undefined, duty: duty.join(', '), basis: o?.meanPowerLossBasis ?? null,
        thermal: e.thermal ? { ambientStated: e.thermal.ambientBasis === 'stated' } : null, notComputed: notComputedOf(id, e),
      });
    }
    case 'nut-body':
    case 'safety-nut':
    case 'wear-life':
    case 'dynamics':
    case 'fatigue':
    case 'collar-bearing':
      return { partial: 'notes-not-computed', facts: { notComputed: notComputedOf(id, e) } };
    default:
      return null;
  }
}

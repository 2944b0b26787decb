/**
 * Section 4 of the report, the calculation: every traced result in reading order with its registered formula, the values substituted and its source, and each section's notes on the design.
 */
import type { Finding } from '@leadline/contracts';
import { FORMULAS, type Design, type Evaluation, type FrictionRange } from '@leadline/mechanics';
import { coefficient, formatNumber, formatQuantity, sig, unitSymbol, type QuantityKind, type UnitSystem } from '@leadline/presentation';
import { PRESENTATION, SYMBOL_KINDS, type Substituted } from '../formula-presentation';
import { escapeHtml, mathHtml, mathText } from '../markup';
import type { CalcLine, CalcSection, FindingRef } from '../report-view';

// ---------------------------------------------------------------------------------------------------------
// Labels

export const AT_MIN = 'atMinFriction';
export const AT_MAX = 'atMaxFriction';

/** Result paths in reading order, with labels. Paths the engine adds later still print, at their section's end. */
export const PATH_LABELS: readonly (readonly [string, string])[] = [
  ['geometry.lead', 'Lead'],
  ['geometry.meanDiameter', 'Mean (pitch) diameter'],
  ['geometry.minorDiameter', 'Minor (root) diameter'],
  ['geometry.leadAngle', 'Lead angle at the mean diameter'],
  ['geometry.normalFlankAngle', 'Flank angle in the normal plane'],
  ['geometry.engagedThreads', 'Engaged threads'],
  ['geometry.tensileStressArea', 'Tensile stress area (for reference only: no check uses it)'],
  ['torque.threadRaise', 'Thread torque to raise'],
  ['torque.threadLower', 'Thread torque to lower'],
  ['torque.collar', 'Collar torque'],
  ['torque.raise', 'Raise torque, thread + collar'],
  ['torque.lower', 'Lowering torque, thread + collar'],
  ['torque.raiseSecAlpha', 'Thread raise torque, sec α approximation (comparison only)'],
  ['efficiency', 'Efficiency, collar included'],
  ['efficiency.thread', 'Efficiency, thread alone'],
  ['selfLocking.margin', 'Self-locking margin, thread alone at minimum friction'],
  ['selfLocking.backDrivingTorque', 'Back-driving torque of the load at minimum friction'],
  ['brake.holdingTorqueNoFriction', 'Holding torque with thread friction lost (f → 0)'],
  ['brake.holdingTorqueMinFriction', 'Holding torque at minimum thread friction'],
  ['brake.reverseEfficiency', 'Reverse (back-driving) efficiency at minimum friction'],
  ['brake.requiredTorque', 'Zero-friction holding torque at the brake on the motor'],
  ['brake.ratio', 'Rated brake torque over the zero-friction holding torque'],
  ['stresses.body.axial', 'Axial stress on the root area'],
  ['stresses.body.torsion', 'Torsional shear on the root diameter (raise torque at maximum friction)'],
  ['stresses.body.vonMises', 'von Mises stress in the screw body'],
  ['stresses.firstThread.load', 'Load on the first thread, max(0.38 F, F / n_t)'],
  ['stresses.firstThread.bearing', 'Flank bearing stress, first thread'],
  ['stresses.firstThread.rootBending', 'Root bending stress, first thread'],
  ['stresses.firstThread.rootShear', 'Root transverse shear, first thread'],
  ['stresses.firstThread.vonMises', 'von Mises stress at the root, first thread (worse fillet)'],
  ['stresses.mean.bearing', 'Flank bearing stress, even sharing (F / n_t)'],
  ['stresses.mean.rootBending', 'Root bending stress, even sharing'],
  ['stresses.mean.rootShear', 'Root transverse shear, even sharing'],
  ['stresses.mean.vonMises', 'von Mises stress at the root, even sharing'],
  ['stresses.stripping.screw', "Stripping shear of the screw threads (at the nut's minor diameter)"],
  ['stresses.stripping.nut', "Stripping shear of the nut threads (at the screw's major diameter)"],
  ['stresses.nutThread.rootBending', "Root bending stress of the nut's own thread, first thread"],
  ['stresses.nutThread.rootShear', "Root transverse shear of the nut's own thread, first thread"],
  ['buckling.slenderness', 'Slenderness ratio'],
  ['buckling.transitionSlenderness', 'Transition slenderness (Johnson to Euler)'],
  ['buckling.criticalLoad', 'Critical load'],
  ['buckling.safetyFactor', 'Buckling safety factor'],
  ['criticalSpeed.rpm', 'First critical (whirling) speed'],
  ['criticalSpeed.ratio', 'Operating speed over critical speed'],
  ['criticalSpeed.partlyFixed.frequencyFactor', 'Frequency factor with fixed ends only partly fixed'],
  ['criticalSpeed.partlyFixed.factor', 'Partly fixed over classical critical speed'],
  ['criticalSpeed.partlyFixed.rpm', 'Critical speed with fixed ends only partly fixed'],
  ['criticalSpeed.partlyFixed.ratio', 'Operating speed over the partly fixed critical speed'],
  ['wear.bearingPressure', 'Mean bearing pressure on the nut flanks'],
  ['wear.slidingVelocity', 'Sliding velocity at the mean diameter'],
  ['wear.pv', 'pV at the mean diameter'],
  ['power.rotationalSpeed', 'Screw speed from the travel speed'],
  ['power.linearSpeed', 'Nut travel speed'],
  ['power.input', 'Input power at maximum friction'],
  ['drive.loadMass', 'Load mass from its weight'],
  ['drive.screwInertia', 'Screw inertia'],
  ['drive.loadInertia', 'Load inertia referred to the screw'],
  ['drive.angularAcceleration', 'Angular acceleration of the screw'],
  ['drive.accelerationTorque', 'Acceleration torque at the screw'],
  ['drive.peakTorque', 'Peak torque at the screw (steady + acceleration)'],
  ['drive.peakTorqueAtMotor', 'Peak torque at the motor through the gearbox'],
  ['drive.holdingTorqueAtMotor', 'Zero-friction holding torque at the motor through the gearbox'],
  ['drive.margin', 'Drive torque margin'],
  ['design.duty.brake', 'Brake fitted'],
  ['design.duty.vibration', 'Vibration expected'],
  ['design.friction.thread', 'Thread friction range'],
  ['design.friction.thread.source', 'Source of the thread friction range'],
  ['design.friction.collar.source', 'Source of the collar friction range'],
  ['buckling.endConditionConstant', 'End-condition constant'],
  ['safetyFactors.bodyVonMises', 'Safety factor of the screw body'],
  ['safetyFactors.firstThreadRoot', 'Safety factor at the first thread root'],
  ['safetyFactors.strippingScrew', 'Safety factor against stripping the screw threads'],
  ['safetyFactors.strippingNut', 'Safety factor against stripping the nut threads'],
  ['safetyFactors.nutThreadRoot', "Safety factor of the nut's own thread root"],
  ['safetyFactors.buckling', 'Buckling safety factor'],
  // Engine 1.2 groups
  ['nutBody.axialStress', 'Axial stress in the nut body'],
  ['nutBody.radialForce', 'Radial push of the first thread on the nut body'],
  ['nutBody.borePressure', 'Pressure on the nut bore over one pitch'],
  ['nutBody.hoopStress', 'Hoop stress at the nut bore (Lamé)'],
  ['nutBody.vonMises', 'von Mises stress in the nut body'],
  ['nutBody.flange.shear', 'Shear of the flange at the nut body'],
  ['nutBody.flange.bending', 'Bending of the flange at the nut body'],
  ['safetyNut.strippingScrew', 'Stripping shear of the screw threads in the safety nut'],
  ['safetyNut.strippingNut', 'Stripping shear of the safety nut threads'],
  ['wornThread.wornNutThickness', 'Nut thread thickness worn by the wear allowed'],
  ['wornThread.strippingNut', 'Stripping shear of the worn nut threads'],
  ['operation.travelTime', 'Travel time of one stroke'],
  ['operation.motorPower', 'Motor power at maximum friction'],
  ['operation.heatPerCycle', 'Heat of friction per cycle (raise and lower one stroke)'],
  ['operation.runningPowerLoss', 'Friction loss while running'],
  ['operation.meanPowerLoss', 'Mean friction loss over the duty'],
  ['thermal.nutSurfaceArea', 'Outside surface of the nut'],
  ['thermal.temperatureRise', 'Steady temperature rise of the nut'],
  ['wearLife.slidingDistance', 'Sliding distance until the wear allowed'],
  ['wearLife.cycles', 'Wear life in cycles'],
  ['dynamics.dynamicFactor', 'Dynamic factor on the lifted load'],
  ['stopping.inertia', 'Inertia at the screw while stopping'],
  ['stopping.stoppingAngle', 'Screw rotation while stopping a descending load'],
  ['stopping.brakeEnergy', 'Energy the brake absorbs'],
  ['fatigue.screwRoot.enduranceLimit', 'Endurance limit of the screw at its root'],
  ['fatigue.screwRoot.safetyFactor', 'Fatigue factor of safety at the screw root (Goodman)'],
  ['fatigue.nutThread.safetyFactor', 'Fatigue factor of safety of the nut threads (Goodman)'],
  ['collarBearing.bearingPressure', 'Bearing pressure on the collar annulus'],
  ['collarBearing.ratingLife', 'Basic rating life L10 of the thrust bearing'],
  ['collarBearing.ratingLifeHours', 'Basic rating life L10 in running hours'],
  ['collarBearing.staticSafetyFactor', 'Static safety of the thrust bearing'],
];
export const LABEL_OF = new Map(PATH_LABELS);
export const ORDER_OF = new Map(PATH_LABELS.map(([p], i) => [p, i]));

export const SECTIONS: readonly { id: string; title: string; prefixes: readonly string[]; chart: CalcSection['chart'] }[] = [
  { id: 'geometry', title: 'Thread geometry', prefixes: ['geometry.'], chart: null },
  { id: 'torque', title: 'Torque and efficiency', prefixes: ['torque.', 'efficiency.'], chart: 'torqueFriction' },
  { id: 'self-locking', title: 'Self-locking', prefixes: ['selfLocking.'], chart: null },
  { id: 'brake', title: 'Brake and back-driving', prefixes: ['brake.'], chart: null },
  { id: 'body', title: 'Screw body stresses', prefixes: ['stresses.body.'], chart: null },
  { id: 'threads', title: 'Thread stresses and stripping', prefixes: ['stresses.'], chart: null },
  { id: 'column', title: 'Column buckling', prefixes: ['buckling.'], chart: 'column' },
  { id: 'whirl', title: 'Whirling speed', prefixes: ['criticalSpeed.'], chart: null },
  { id: 'wear', title: 'Nut wear', prefixes: ['wear.'], chart: null },
  { id: 'power', title: 'Speed, power and drive', prefixes: ['power.', 'drive.'], chart: null },
  { id: 'nut-body', title: 'Nut body and flange', prefixes: ['nutBody.'], chart: null },
  { id: 'safety-nut', title: 'Safety nut and worn thread', prefixes: ['safetyNut.', 'wornThread.'], chart: null },
  { id: 'operation', title: 'Operation, duty cycle and heat', prefixes: ['operation.', 'thermal.'], chart: null },
  { id: 'wear-life', title: 'Wear life', prefixes: ['wearLife.'], chart: null },
  { id: 'dynamics', title: 'Lifting dynamics and stopping', prefixes: ['dynamics.', 'stopping.'], chart: null },
  { id: 'fatigue', title: 'Fatigue', prefixes: ['fatigue.'], chart: null },
  { id: 'collar-bearing', title: 'The collar as a bearing', prefixes: ['collarBearing.'], chart: null },
];

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


// ---------------------------------------------------------------------------------------------------------
// Helpers

/** Readable name of a result path, with the friction end as a suffix. */
export function pathLabel(path: string): string {
  const parts = path.split('.');
  const last = parts[parts.length - 1];
  if (last === AT_MIN || last === AT_MAX) {
    const base = LABEL_OF.get(parts.slice(0, -1).join('.')) ?? parts.slice(0, -1).join('.');
    return `${base}, ${last === AT_MIN ? 'minimum' : 'maximum'} friction`;
  }
  return LABEL_OF.get(path) ?? path;
}

export function pathOrder(path: string): number {
  const base = path.replace(/\.(atMinFriction|atMaxFriction)$/, '');
  const i = ORDER_OF.get(base) ?? ORDER_OF.get(path) ?? 1000;
  return i * 2 + (path.endsWith(AT_MAX) ? 1 : 0);
}

export function valueAt(root: unknown, path: string): number | null {
  let node: unknown = root;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return null;
    node = (node as Record<string, unknown>)[key];
  }
  return typeof node === 'number' && Number.isFinite(node) ? node : null;
}

/** UTC, minute precision: reports are read across time zones and must not depend on the server's. */

export function findingsOn(findings: readonly Finding[], paths: readonly string[]): FindingRef[] {
  return findings.filter((f) => f.subject !== null && paths.includes(f.subject)).map((f) => ({ ruleId: f.ruleId, severity: f.severity }));
}

// ---------------------------------------------------------------------------------------------------------
// Calculation lines

/**
 * What a result path is called and the kind of quantity it is, as the report prints it: the label beside the trace key
 * and the result kind of the formula that produced it (none for a path the trace does not hold, e.g. a flag or a name).
 * The comparison of two revisions labels its rows with it.
 */
export function resultPresentation(path: string, evaluation: Pick<Evaluation, 'trace'>): { label: string; quantity: QuantityKind | null } {
  const entry = (evaluation.trace as Record<string, { formula: string } | undefined>)[path];
  const quantity = entry === undefined ? null : (PRESENTATION[entry.formula]?.result ?? null);
  return { label: pathLabel(path), quantity };
}

export function calcLine(path: string, evaluation: Evaluation, system: UnitSystem, findings: readonly Finding[]): CalcLine {
  const entry = evaluation.trace[path];
  const formula = FORMULAS[entry.formula];
  const presentation = PRESENTATION[entry.formula];
  const kindOf = (symbol: string): QuantityKind | null => presentation?.inputs?.[symbol] ?? SYMBOL_KINDS[symbol] ?? null;
  const substituted: Record<string, string> = {};
  for (const [symbol, si] of Object.entries(entry.inputs)) {
    const kind = kindOf(symbol);
    substituted[symbol] = kind === null ? sig(si) : formatQuantity(si, kind, system);
  }
  const resultKind: QuantityKind | null = presentation?.result ?? null;
  const raw = valueAt(evaluation, path);
  const value = raw === null ? '—' : resultKind === null ? sig(raw) : formatNumber(raw, resultKind, system);
  const unit = resultKind === null ? '' : unitSymbol(resultKind, system);
  const display = raw === null ? '—' : resultKind === null ? value : formatQuantity(raw, resultKind, system);
  const symbol = formula?.symbol ?? entry.formula;
  let rhs = presentation?.substitute?.(substituted as Substituted) ?? null;
  if (rhs !== null && /undefined/.test(rhs)) rhs = null;
  const inputsList = Object.entries(substituted)
    .map(([k, v]) => `${k} = ${v}`)
    .join(', ');
  const tail = rhs !== null ? ` = ${rhs} = ${display}` : ` = ${display}, with ${mathText(inputsList)}`;
  const substitution = `${mathText(symbol)}${tail}`;
  const substitutionHtml = `${mathHtml(symbol)}${escapeHtml(tail)}`;
  const regimeLabel =
    path === 'buckling.criticalLoad' && evaluation.buckling.regime
      ? `Critical load (${evaluation.buckling.regime === 'euler' ? 'Euler' : 'Johnson'})`
      : pathLabel(path);
  const aliases = path === 'buckling.safetyFactor' ? [path, 'safetyFactors.buckling'] : [path];
  return {
    path,
    label: regimeLabel,
    formulaId: entry.formula,
    symbolHtml: mathHtml(symbol),
    equationHtml: mathHtml(formula?.equation ?? '(formula not in this engine’s registry)'),
    source: formula?.source ?? '—',
    substitution,
    substitutionHtml,
    value,
    unit,
    display,
    findings: findingsOn(findings, aliases),
  };
}

export function sectionNotes(id: string, design: Design, e: Evaluation, system: UnitSystem): string[] {
  const q = (si: number, kind: QuantityKind) => formatQuantity(si, kind, system);
  const fr = (r: FrictionRange | null) => (r ? `${coefficient(r.min)} to ${coefficient(r.max)}` : 'none');
  switch (id) {
    case 'geometry':
      return [`${e.geometry.standard}${e.geometry.size ? `, size ${e.geometry.size}` : ''}; ${e.geometry.starts} start${e.geometry.starts > 1 ? 's' : ''}.`];
    case 'torque':
      return [
        `Axial load F = ${q(design.load.axial, 'force')} (${design.load.sense}). Thread friction f = ${fr(design.friction.thread)}; collar friction f_c = ${fr(design.friction.collar)} (${design.collar.kind}${design.collar.kind === 'annular' ? `, ${design.collar.model}` : ''} collar).`,
        'Negative lowering torque: the load drives the screw down and the drive or a brake must hold it.',
      ];
    case 'self-locking':
      return [
        e.selfLocking.locks
          ? `The thread holds the load at the lowest friction in the range: f_min = ${coefficient(design.friction.thread.min)} exceeds the boundary cos α_n tan λ = ${sig(e.selfLocking.boundaryFriction)}.`
          : `The thread does not hold the load at the lowest friction: f_min = ${coefficient(design.friction.thread.min)} is at or below the boundary cos α_n tan λ = ${sig(e.selfLocking.boundaryFriction)}; the load back-drives the screw.`,
        `Collar friction is ignored here (the safe side). Brake fitted: ${design.duty.brake ? 'yes' : 'no'}. Vibration expected: ${design.duty.vibration ? 'yes' : 'no'}.`,
      ];
    case 'threads':
      return threadNotes(design, e, system);
    case 'column': {
      const b = e.buckling;
      if (!b.applies) return ['The screw is in tension: column buckling does not apply.'];
      return [
        `Unsupported length L = ${q(design.screw.unsupportedLength, 'length')}, ends ${design.screw.ends}, end-condition constant C = ${sig(b.endConditionConstant)} (${b.endConditionBasis}); k = d_r / 4 on the root diameter.`,
        `Regime: ${b.regime === 'euler' ? 'Euler, since l/k is at or above the transition slenderness' : 'Johnson, since l/k is below the transition slenderness'}.`,
      ];
    }
    case 'brake': {
      const b = e.brake;
      if (!b) return ['This evaluation was made by an engine version that did not report brake figures.'];
      return [
        'The brake must hold the load when thread friction is lost (vibration, lubrication, wear): T_0 = F l / (2π), the lowering torque in the limit f → 0; collar friction is ignored (the safe side).',
        `Brake fitted: ${design.duty.brake ? 'yes' : 'no'}${design.duty.brake ? `, on the ${b.location}` : ''}; rated torque ${b.ratedTorque === null ? 'not stated' : q(b.ratedTorque, 'torque')}. A reverse efficiency at or below zero means the load cannot drive the screw at minimum friction.`,
      ];
    }
    case 'whirl': {
      const cs = e.criticalSpeed;
      const span = cs.span ?? design.screw.unsupportedLength;
      const ends = cs.ends ?? design.screw.ends;
      const notes = [`Uniform shaft on the root diameter between supports L = ${q(span, 'length')}${design.screw.whirlSpan != null ? ' (stated whirl span)' : ' (the column length)'}, ends ${ends}${design.screw.whirlEnds != null ? ' (stated for whirl)' : ''}, β₁L = ${sig(cs.frequencyFactor)}. Axial load and gyroscopic effects are neglected.`];
      if (cs.partlyFixed) {
        notes.push(`Fixed ends taken as only partly fixed (common practice, the same partial fixity as the recommended column constant C = ${sig(cs.partlyFixed.endConditionConstant)}): a simply supported shaft over L / √C, (β₁L)′ = π√C = ${sig(cs.partlyFixed.frequencyFactor)}, ${sig(cs.partlyFixed.factor)} × the classical critical speed. The whirl check uses the lower speed.`);
      }
      return notes;
    }
    case 'wear':
      return wearNotes(design, e, system);
    case 'power': {
      if (!design.drive) return ['No drive torque given.'];
      const d = e.drive;
      const gb = design.drive.gearbox ?? null;
      const notes = [`Drive torque available at start: ${q(design.drive.availableTorque, 'torque')}${gb ? ' at the motor' : ''}.`];
      if (d?.loadMassBasis === 'not-included') notes.push('Load mass not given and not lifting duty: the load inertia is not included in the acceleration torque.');
      if (d?.loadMassBasis === 'weight') notes.push('Load mass taken from the lifted weight, m = F / g_n.');
      if (d && d.angularAcceleration === null) notes.push('No acceleration given: the peak torque is the steady raise torque.');
      if (gb) notes.push(`Gearbox ratio ${sig(gb.ratio)}, forward efficiency ${sig(gb.efficiency)}, reverse efficiency ${sig(gb.reverseEfficiency)}; motor and gearbox inertia are not included.`);
      notes.push('The drive check uses the peak torque at the motor, not the steady torque.');
      return notes;
    }
    case 'operation':
      return [...operationNotes(design, e, system), ...notComputedNotes(id, e)];
    case 'nut-body':
    case 'safety-nut':
    case 'wear-life':
    case 'dynamics':
    case 'fatigue':
    case 'collar-bearing':
      return notComputedNotes(id, e);
    default:
      return [];
  }
}

/** Operation and heat: the duty the heat balance reads, and the basis of its mean loss. */
export function operationNotes(design: Design, e: Evaluation, system: UnitSystem): string[] {
  const o = e.operation;
  if (!o) return ['This evaluation was made by an engine version that did not report operation and heat figures.'];
  const d = design.duty;
  const duty = [
    d.stroke != null ? `stroke ${formatQuantity(d.stroke, 'length', system)}` : 'no stroke',
    d.cyclesPerHour != null ? `${formatNumber(d.cyclesPerHour, 'count', system)} cycles per hour` : null,
    d.dutyCycle != null ? `duty cycle ${formatQuantity(d.dutyCycle, 'percent', system)}` : null,
  ].filter((x): x is string => x !== null);
  const notes = [`Duty: ${duty.join(', ')}.`];
  if (o.meanPowerLossBasis === 'cycles-per-hour') notes.push('The mean friction loss is the heat per cycle times the cycles per hour (the larger of the two estimates when a duty cycle is also given).');
  if (o.meanPowerLossBasis === 'duty-cycle') notes.push('The mean friction loss is the running loss times the duty cycle (the larger of the two estimates when cycles per hour are also given).');
  if (e.thermal) {
    notes.push(
      `All friction heat is taken into the nut and shed by its outside surface in still air (the safe side); the ambient temperature is ${e.thermal.ambientBasis === 'stated' ? 'as stated' : 'the default upper ambient of IEC 60204-1 (from memory)'}.`,
    );
  }
  return notes;
}

/** What the engine could not compute for a section's groups, each with the inputs to give. */
export function notComputedNotes(id: string, e: Evaluation): string[] {
  const groups = NOT_COMPUTED_GROUPS[id] ?? [];
  return (e.notComputed ?? [])
    .filter((n) => groups.some((g) => n.subject === g || n.subject.startsWith(`${g}.`)))
    .map((n) => `Not computed (${n.subject}): give ${n.missing.join('; ')}. ${n.reason.charAt(0).toUpperCase()}${n.reason.slice(1)}.`);
}

/** Thread-stress notes: load share, root fillet, stripping planes and the nut's own threads. */
export function threadNotes(design: Design, e: Evaluation, system: UnitSystem): string[] {
  const notes = [
    'First thread carries max(0.38 F, F / n_t) (after Marshek; the mean share governs below 2.6 engaged threads); even sharing F / n_t is printed for comparison. ' +
      'The root von Mises stress is taken at the worse of the two root fillets (the bending stress has one sign on each).',
  ];
  const st = e.stresses.stripping as Partial<Evaluation['stresses']['stripping']>;
  if (st.screwArea !== undefined && st.nutArea !== undefined) {
    notes.push(
      `Stripping on the standard shear planes: the screw's threads on the cylinder at the nut's minor diameter D1 = ${formatQuantity(e.geometry.nutMinorDiameter, 'length', system)} ` +
        `(area ${formatQuantity(st.screwArea, 'area', system)}), the nut's threads at the screw's major diameter (area ${formatQuantity(st.nutArea, 'area', system)}); both judged against 0.577 S_y of their own material.`,
    );
  } else {
    notes.push('Stripping is judged against 0.577 S_y (this evaluation was made by an engine version with the earlier shear planes).');
  }
  if (e.stresses.nutThread) {
    notes.push(
      design.nut.yieldStrength === null
        ? "The nut's own threads (root bending and shear) cannot be judged: the nut has no yield strength on record."
        : `The nut's own threads are judged against the nut's yield strength ${formatQuantity(design.nut.yieldStrength, 'stress', system)} with the same minimum factors as the screw threads.`,
    );
  }
  return notes;
}

/** Nut-wear notes: the material as entered, and which allowable pressure applied at which rubbing speed. */
export function wearNotes(design: Design, e: Evaluation, system: UnitSystem): string[] {
  const q = (si: number, kind: QuantityKind) => formatQuantity(si, kind, system);
  const w = e.wear;
  const material =
    design.nut.material === null
      ? 'not named'
      : design.nut.materialSource === 'design'
        ? `${design.nut.material} (the design's own material, as entered)`
        : design.nut.material;
  const notes = [`Nut material: ${material}; allowable pV ${design.nut.allowablePv === null ? 'not known' : q(design.nut.allowablePv, 'pv')}.`];
  if (w.allowablePressureBasis === 'any-speed') {
    notes.push(`Allowable pressure ${q(w.allowablePressure as number, 'pressure')}: the design's own single value, used at any rubbing speed (handbook allowables fall steeply with speed).`);
  } else if (w.allowablePressureBasis === 'speed-rated') {
    notes.push(
      `Allowable pressure ${w.allowablePressure === null ? 'not known' : q(w.allowablePressure, 'pressure')} for the class "${w.allowablePressureClass}"` +
        `${w.slidingVelocity === null ? '' : ` at a rubbing speed of ${q(w.slidingVelocity, 'slidingSpeed')}`} (${w.allowablePressureSource}).`,
    );
    const steps = design.nut.pressureBySpeed ?? [];
    if (steps.length > 0) {
      notes.push(
        'Allowable against rubbing speed: ' +
          steps
            .map((s) => `${s.allowablePressure === null ? 'none published' : q(s.allowablePressure, 'pressure')} ${s.upToRubbingSpeed === null ? 'above' : `up to ${q(s.upToRubbingSpeed, 'slidingSpeed')}`}`)
            .join('; ') +
          '.',
      );
    }
  } else {
    notes.push(`Allowable pressure ${w.allowablePressure === null ? 'not known' : q(w.allowablePressure, 'pressure')}.`);
  }
  return notes;
}

export function buildSections(design: Design, e: Evaluation, system: UnitSystem, findings: readonly Finding[]): CalcSection[] {
  const paths = Object.keys(e.trace).sort((a, b) => pathOrder(a) - pathOrder(b) || a.localeCompare(b));
  const taken = new Set<string>();
  const sections: CalcSection[] = [];
  let n = 0;
  for (const s of SECTIONS) {
    const mine = paths.filter((p) => !taken.has(p) && s.prefixes.some((prefix) => p.startsWith(prefix)));
    mine.forEach((p) => taken.add(p));
    // A 1.2 group's section also stands for what could not be computed (its notes say what to give)
    if (mine.length === 0 && s.id !== 'column' && notComputedNotes(s.id, e).length === 0) continue;
    n++;
    sections.push({
      id: s.id,
      number: `4.${n}`,
      title: s.title,
      notes: sectionNotes(s.id, design, e, system),
      lines: mine.map((p) => calcLine(p, e, system, findings)),
      chart: s.chart === 'column' && !e.buckling.applies ? null : s.chart,
    });
  }
  const rest = paths.filter((p) => !taken.has(p));
  if (rest.length > 0) {
    n++;
    sections.push({ id: 'other', number: `4.${n}`, title: 'Further results', notes: [], lines: rest.map((p) => calcLine(p, e, system, findings)), chart: null });
  }
  return sections;
}


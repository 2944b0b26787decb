/**
 * Section 4 of the report, the calculation: every traced result in reading order with its registered formula, the values
 * substituted and its source; each section's notes are facts here (calculation-notes.ts) and sentences in templates.
 */
import type { Finding } from '@leadline/contracts';
import { FORMULAS, type Design, type Evaluation } from '@leadline/mechanics';
import { formatNumber, formatQuantity, sig, unitSymbol, type QuantityKind, type UnitSystem } from '@leadline/presentation';
import { PRESENTATION, SYMBOL_KINDS, type Substituted } from '../formula-presentation';
import { escapeHtml, mathHtml, mathText } from '../markup';
import type { CalcLine, CalcSection, FindingRef } from '../report-view';
import { notComputedOf, sectionNotes } from './calculation-notes';

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

export function buildSections(design: Design, e: Evaluation, system: UnitSystem, findings: readonly Finding[]): CalcSection[] {
  const paths = Object.keys(e.trace).sort((a, b) => pathOrder(a) - pathOrder(b) || a.localeCompare(b));
  const taken = new Set<string>();
  const sections: CalcSection[] = [];
  let n = 0;
  for (const s of SECTIONS) {
    const mine = paths.filter((p) => !taken.has(p) && s.prefixes.some((prefix) => p.startsWith(prefix)));
    mine.forEach((p) => taken.add(p));
    // A 1.2 group's section also stands for what could not be computed (its notes say what to give)
    if (mine.length === 0 && s.id !== 'column' && notComputedOf(s.id, e).length === 0) continue;
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
    sections.push({ id: 'other', number: `4.${n}`, title: 'Further results', notes: null, lines: rest.map((p) => calcLine(p, e, system, findings)), chart: null });
  }
  return sections;
}


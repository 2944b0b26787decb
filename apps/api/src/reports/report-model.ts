/**
 * The calculation report as data: everything the template prints, already converted to the design's unit
 * system, rounded to engineering significant figures and laid out in reading order. Pure: the same input
 * gives the same view (generatedAt is an input), so the report of a stored revision can be reproduced.
 */
import { SIGNATURE_METHOD_LABELS, signatureOf, type Signature } from '../reviews/signature';
import type { Actor, Finding, ProductEvent, ReviewState, RevisionRecord, Severity, Verdict } from '@leadline/contracts';
import {
  FORMULAS,
  FRICTION_LIBRARY,
  SHEAR_YIELD_RATIO,
  findNutMaterial,
  findScrewMaterial,
  type Design,
  type Evaluation,
  type FrictionRange,
} from '@leadline/mechanics';
import {
  coefficient,
  formatNumber,
  formatQuantity,
  siRecord,
  sig,
  unitSymbol,
  type QuantityKind,
  type UnitSystem,
} from './format';
import { PRESENTATION, SYMBOL_KINDS, type Substituted } from './formula-presentation';

// ---------------------------------------------------------------------------------------------------------
// Input

export interface ReportHistoryEntry {
  readonly id: string;
  readonly revision: number;
  readonly createdAt: string;
  readonly verdict: Verdict;
  readonly state: ReviewState;
  readonly author: Actor | null;
}

export interface ReportInput {
  readonly product: { readonly id: string; readonly code: string; readonly name: string; readonly description?: string | null };
  readonly calculation: { readonly id: string; readonly title: string };
  readonly revision: RevisionRecord;
  readonly state: ReviewState;
  readonly reviewer: Actor | null;
  readonly decidedAt: string | null;
  /** Events of this revision, chronological */
  readonly events: readonly ProductEvent[];
  /** All revisions of the calculation */
  readonly history: readonly ReportHistoryEntry[];
  /** Revisions of the calculation left out of `history`, before and after the window around this one */
  readonly omittedHistory?: { readonly before: number; readonly after: number } | null;
  /** Comments of this revision left out of `events` (the report prints comments in full only up to a bound) */
  readonly omittedComments?: { readonly count: number; readonly firstSeq: number; readonly lastSeq: number } | null;
  readonly generatedAt: string;
  /** The product chain's head signed at generatedAt (checkpoints module): what an auditor checks the record against */
  readonly checkpoint?: {
    readonly productId: string; readonly seq: number; readonly headHash: string; readonly time: string;
    readonly algorithm: string; readonly keyId: string; readonly signature: string;
  } | null;
  /**
   * Minimum safety factors of the rule set the revision was judged by, for the checks that passed
   * (a finding's own limit, when there is one, takes precedence)
   */
  readonly minimums?: Readonly<Partial<Record<SafetyFactorKey, { readonly limit: number; readonly ruleId: string }>>>;
}

export type SafetyFactorKey = 'bodyVonMises' | 'firstThreadRoot' | 'strippingScrew' | 'strippingNut' | 'nutThreadRoot' | 'buckling' | 'drive';

// ---------------------------------------------------------------------------------------------------------
// View

/** Printed on the first page and again at the end; the PDF footer carries CAUTION_SHORT on every page. */
export const CAUTION_TEXT: readonly string[] = [
  'This calculation supports, and does not replace, the judgement of a qualified engineer who checks it against the actual design, its manufacture and its use.',
  'Lifting equipment must be designed, built, examined and used in accordance with the local codes and regulations and with licensed engineering practice.',
  'Self-locking is no substitute for a brake or load-holding device wherever a falling or running-back load can hurt someone.',
];
export const CAUTION_SHORT =
  'Supports, does not replace, a qualified engineer’s judgement. Lifting equipment: follow local codes and licensed practice. Self-locking is no substitute for a brake.';

export interface KeyValue {
  readonly label: string;
  readonly value: string;
  /** Optional note printed small beside the value */
  readonly note?: string;
  /** Value printed in a monospace face (hashes, ids) */
  readonly mono?: boolean;
}

export interface FindingRef {
  readonly ruleId: string;
  readonly severity: Severity;
}

export interface CalcLine {
  readonly path: string;
  readonly label: string;
  readonly formulaId: string;
  /** Symbol and equation as HTML-safe markup (escaped text with sub/sup) */
  readonly symbolHtml: string;
  readonly equationHtml: string;
  readonly source: string;
  /** "symbol = substituted = result", plain text */
  readonly substitution: string;
  /** The same as escaped HTML, the symbol with its subscripts */
  readonly substitutionHtml: string;
  /** Result number as printed, and its unit */
  readonly value: string;
  readonly unit: string;
  /** value + unit */
  readonly display: string;
  readonly findings: readonly FindingRef[];
}

export interface CalcSection {
  readonly id: string;
  readonly number: string;
  readonly title: string;
  readonly notes: readonly string[];
  readonly lines: readonly CalcLine[];
  /** Which chart belongs under this section */
  readonly chart: 'torqueFriction' | 'column' | null;
}

export interface SafetyFactorRow {
  readonly key: string;
  readonly label: string;
  /** Few words, for the chart axis */
  readonly shortLabel: string;
  readonly path: string;
  readonly value: number | null;
  readonly limit: number | null;
  readonly valueText: string;
  readonly limitText: string;
  readonly status: 'meets' | 'below' | 'no-limit' | 'not-applicable';
  readonly statusText: string;
  /** Finding the limit came from */
  readonly limitFrom: string | null;
}

export interface CheckRow {
  readonly ruleId: string;
  readonly severity: Severity;
  readonly subject: string;
  readonly measured: string;
  readonly limit: string;
  /** measured / limit, when both are numbers */
  readonly ratio: string;
}

export interface FindingView {
  readonly ruleId: string;
  readonly severity: Severity;
  readonly message: string;
  readonly basis: string;
  readonly subject: string | null;
  readonly measured: string;
  readonly limit: string;
  readonly acknowledgedBy: string | null;
}

export interface FindingGroup {
  readonly severity: Severity;
  readonly title: string;
  readonly explanation: string;
  readonly findings: readonly FindingView[];
}

/** One decision's signature block (reviews/signature.ts). */
export interface SignatureView {
  readonly printedName: string;
  readonly meaning: string;
  readonly signedAt: string;
  /** signedAt split for print: the date, and the time with its offset */
  readonly signedDate: string;
  readonly signedTime: string;
  readonly method: string;
  readonly fingerprint: string;
  readonly revisionHash: string;
}

export interface EventView {
  readonly seq: number;
  readonly type: string;
  readonly typeLabel: string;
  readonly actor: string;
  readonly at: string;
  readonly text: string | null;
  readonly details: readonly string[];
}

export interface HistoryRow {
  readonly revision: number;
  readonly createdAt: string;
  readonly author: string;
  readonly verdict: string;
  readonly state: string;
  readonly current: boolean;
}

export interface InputRow {
  readonly path: string;
  readonly value: string;
  readonly unit?: string;
}

export interface FrictionRow {
  readonly surface: string;
  readonly range: string;
  readonly sourceKind: string;
  readonly reference: string;
  readonly entry: string;
}

export interface MaterialRow {
  readonly part: string;
  readonly property: string;
  readonly value: string;
  readonly origin: string;
}

export interface ReportView {
  readonly title: string;
  readonly unitSystem: UnitSystem;
  readonly unitSystemLabel: string;
  readonly caution: readonly string[];
  readonly cautionShort: string;
  readonly header: {
    readonly productCode: string;
    readonly productName: string;
    readonly productDescription: string | null;
    readonly calculationId: string;
    readonly calculationTitle: string;
    readonly revision: number;
    readonly revisionNote: string | null;
    readonly state: ReviewState;
    readonly stateLabel: string;
    readonly verdict: Verdict;
    readonly verdictLabel: string;
    readonly author: string;
    readonly reviewer: string;
    readonly decidedAt: string | null;
    readonly rows: readonly KeyValue[];
  };
  readonly summary: readonly KeyValue[];
  readonly findingCounts: { readonly blocking: number; readonly warning: number; readonly info: number };
  readonly input: {
    readonly asEntered: readonly InputRow[];
    readonly engineUnits: readonly InputRow[];
    readonly friction: readonly FrictionRow[];
    readonly materials: readonly MaterialRow[];
    readonly geometry: readonly KeyValue[];
  };
  readonly sections: readonly CalcSection[];
  readonly safetyFactors: readonly SafetyFactorRow[];
  readonly checks: readonly CheckRow[];
  readonly findingGroups: readonly FindingGroup[];
  readonly events: readonly EventView[];
  /** A signature block per decision of this revision, in chain order */
  readonly signatures: readonly SignatureView[];
  /** What the review record leaves out, and where the full trail is (null when it prints everything) */
  readonly eventsOmitted: string | null;
  readonly history: readonly HistoryRow[];
  /** What the revision history leaves out, and where the full list is (null when it lists every revision) */
  readonly historyOmitted: string | null;
  readonly conventions: readonly string[];
  readonly record: readonly KeyValue[];
  /** The signed checkpoint printed under the record's hashes, or null when the report was built without one */
  readonly checkpoint: readonly KeyValue[] | null;
  readonly hash: string;
  readonly previousHash: string | null;
  readonly generatedAt: string;
  /** Label for the PDF page header */
  readonly headerLabel: string;
}

// ---------------------------------------------------------------------------------------------------------
// Labels

const STATE_LABELS: Record<ReviewState, string> = {
  submitted: 'Submitted, awaiting review',
  approved: 'Approved',
  rejected: 'Rejected',
  superseded: 'Superseded by a later revision',
  withdrawn: 'Withdrawn',
};

const VERDICT_LABELS: Record<Verdict, string> = {
  blocked: 'Blocked: at least one blocking finding',
  'needs-acknowledgement': 'Needs acknowledgement of warnings',
  clear: 'Clear: no blocking findings or warnings',
};

const EVENT_LABELS: Record<string, string> = {
  'product-registered': 'Product registered',
  'calculation-opened': 'Calculation opened',
  'revision-submitted': 'Revision submitted',
  comment: 'Comment',
  approved: 'Approved',
  rejected: 'Rejected',
  withdrawn: 'Withdrawn',
};

const SEVERITY_GROUPS: readonly { severity: Severity; title: string; explanation: string }[] = [
  { severity: 'blocking', title: 'Blocking findings', explanation: 'Must be resolved by a new revision; a blocked revision cannot be approved.' },
  { severity: 'warning', title: 'Warnings', explanation: 'Each must be acknowledged by the reviewer, with a reason, before approval.' },
  { severity: 'info', title: 'Information', explanation: 'Recorded for the reader; no action required.' },
];

const AT_MIN = 'atMinFriction';
const AT_MAX = 'atMaxFriction';

/** Result paths in reading order, with labels. Paths the engine adds later still print, at their section's end. */
const PATH_LABELS: readonly (readonly [string, string])[] = [
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
];
const LABEL_OF = new Map(PATH_LABELS);
const ORDER_OF = new Map(PATH_LABELS.map(([p], i) => [p, i]));

const SECTIONS: readonly { id: string; title: string; prefixes: readonly string[]; chart: CalcSection['chart'] }[] = [
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
];

/** Safety factors the report holds against minimums; a finding on any of the paths supplies the minimum. */
const FACTORS: readonly { key: SafetyFactorKey; label: string; shortLabel: string; paths: readonly string[]; value: (e: Evaluation) => number | null }[] = [
  { key: 'bodyVonMises', label: 'Screw body, S_y / von Mises', shortLabel: 'Screw body', paths: ['safetyFactors.bodyVonMises'], value: (e) => e.safetyFactors.bodyVonMises },
  { key: 'firstThreadRoot', label: 'First thread root, S_y / von Mises', shortLabel: 'First thread root', paths: ['safetyFactors.firstThreadRoot'], value: (e) => e.safetyFactors.firstThreadRoot },
  { key: 'strippingScrew', label: 'Screw thread stripping, 0.577 S_y / τ_s', shortLabel: 'Stripping, screw', paths: ['safetyFactors.strippingScrew'], value: (e) => e.safetyFactors.strippingScrew },
  { key: 'strippingNut', label: 'Nut thread stripping, 0.577 S_y,nut / τ_n', shortLabel: 'Stripping, nut', paths: ['safetyFactors.strippingNut'], value: (e) => e.safetyFactors.strippingNut },
  { key: 'nutThreadRoot', label: 'Nut thread root, lower of S_y,nut / σ_b,n and 0.577 S_y,nut / τ_r,n', shortLabel: 'Nut thread root', paths: ['safetyFactors.nutThreadRoot'], value: (e) => e.safetyFactors.nutThreadRoot ?? null },
  { key: 'buckling', label: 'Column buckling, P_cr / F', shortLabel: 'Buckling', paths: ['safetyFactors.buckling', 'buckling.safetyFactor'], value: (e) => e.safetyFactors.buckling },
  { key: 'drive', label: 'Drive torque, T_av / T_R,max', shortLabel: 'Drive torque', paths: ['drive.margin'], value: (e) => e.drive?.margin ?? null },
];

// ---------------------------------------------------------------------------------------------------------
// Helpers

const escapeHtml = (s: string): string =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

const GREEK: Record<string, string> = { alpha: 'α', lambda: 'λ', sigma: 'σ', tau: 'τ', rho: 'ρ', beta: 'β', pi: 'π', omega: 'ω' };

/** Registry plain text with Greek letters and root signs in place ("alpha_n" -> "α_n"). */
export function mathText(text: string): string {
  return text
    .replace(/(?<![A-Za-z])(alpha|lambda|sigma|tau|rho|beta|pi|omega)(?![A-Za-z])/g, (w) => GREEK[w])
    .replace(/(?<![A-Za-z])sqrt(?![A-Za-z])/g, '√');
}

/** Plain-text symbols and equations from the registry ("alpha_n", "d_r^2") as escaped HTML with Greek, sub and sup. */
export function mathHtml(text: string): string {
  return escapeHtml(mathText(text))
    .replace(/([A-Za-zα-ω)'&#;39]+?)_([A-Za-z0-9]+(?:,[A-Za-z0-9]+)*)/g, (_m, base: string, sub: string) => `${base}<sub>${sub}</sub>`)
    .replace(/\^(\d+)/g, '<sup>$1</sup>')
    .replace(/ - /g, ' − ')
    .replace(/(^|[\s(=])-(?=[\s(/\dA-Za-zα-ω])/g, '$1−');
}

/** A dotted path as escaped HTML that may break after each dot. */
export function pathHtml(path: string): string {
  return escapeHtml(path).replace(/\./g, '.<wbr>');
}

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

function pathOrder(path: string): number {
  const base = path.replace(/\.(atMinFriction|atMaxFriction)$/, '');
  const i = ORDER_OF.get(base) ?? ORDER_OF.get(path) ?? 1000;
  return i * 2 + (path.endsWith(AT_MAX) ? 1 : 0);
}

function valueAt(root: unknown, path: string): number | null {
  let node: unknown = root;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return null;
    node = (node as Record<string, unknown>)[key];
  }
  return typeof node === 'number' && Number.isFinite(node) ? node : null;
}

/** UTC, minute precision: reports are read across time zones and must not depend on the server's. */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}

const actorName = (a: Actor | null | undefined): string => a?.name ?? '—';

function findingsOn(findings: readonly Finding[], paths: readonly string[]): FindingRef[] {
  return findings.filter((f) => f.subject !== null && paths.includes(f.subject)).map((f) => ({ ruleId: f.ruleId, severity: f.severity }));
}

/** Kind of a finding's measured/limit from its unit (and subject, to tell pressure from stress). */
function findingKind(unit: string | null, subject: string | null): QuantityKind | null {
  const u = (unit ?? '').replace(/\s/g, '').replace('·', '*');
  if (u === '' || u === '-') return 'ratio';
  if (u === 'Pa') return subject?.startsWith('wear.') ? 'pressure' : 'stress';
  if (u === 'N*m' || u === 'Nm') return 'torque';
  if (u === 'N') return 'force';
  if (u === 'm') return 'length';
  if (u === 'rpm' || u === 'rev/min') return 'rpm';
  if (u === 'm/s') return subject?.startsWith('wear.') ? 'slidingSpeed' : 'travelSpeed';
  if (u === 'Pa*m/s') return 'pv';
  if (u === 'W') return 'power';
  if (u === 'deg' || u === '°') return 'angle';
  return null;
}

function findingValue(value: Finding['measured'], unit: string | null, subject: string | null, system: UnitSystem): string {
  if (value === null) return '—';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') return value;
  const kind = findingKind(unit, subject);
  if (kind === null) return `${sig(value)} ${unit ?? ''}`.trim();
  return formatQuantity(value, kind, system);
}

// ---------------------------------------------------------------------------------------------------------
// Calculation lines

function calcLine(path: string, evaluation: Evaluation, system: UnitSystem, findings: readonly Finding[]): CalcLine {
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

function sectionNotes(id: string, design: Design, e: Evaluation, system: UnitSystem): string[] {
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
    default:
      return [];
  }
}

/** Thread-stress notes: load share, root fillet, stripping planes and the nut's own threads (issue 13 items 2-5). */
function threadNotes(design: Design, e: Evaluation, system: UnitSystem): string[] {
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

/** Nut-wear notes: the material as entered, and which allowable pressure applied at which rubbing speed (issue 13 item 1). */
function wearNotes(design: Design, e: Evaluation, system: UnitSystem): string[] {
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

function buildSections(design: Design, e: Evaluation, system: UnitSystem, findings: readonly Finding[]): CalcSection[] {
  const paths = Object.keys(e.trace).sort((a, b) => pathOrder(a) - pathOrder(b) || a.localeCompare(b));
  const taken = new Set<string>();
  const sections: CalcSection[] = [];
  let n = 0;
  for (const s of SECTIONS) {
    const mine = paths.filter((p) => !taken.has(p) && s.prefixes.some((prefix) => p.startsWith(prefix)));
    mine.forEach((p) => taken.add(p));
    if (mine.length === 0 && s.id !== 'column') continue;
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

// ---------------------------------------------------------------------------------------------------------
// Safety factors, checks and findings

function buildSafetyFactors(e: Evaluation, findings: readonly Finding[], minimums: ReportInput['minimums'] = {}): SafetyFactorRow[] {
  return FACTORS.map((factor) => {
    const value = factor.value(e);
    const finding = findings.find((f) => f.subject !== null && factor.paths.includes(f.subject) && typeof f.limit === 'number' && (f.unit === null || f.unit === '-' || f.unit === ''));
    const fromRuleSet = minimums[factor.key];
    const source = finding ? { limit: finding.limit as number, ruleId: finding.ruleId } : fromRuleSet;
    const limit = source ? source.limit : null;
    // A factor that could not be computed for want of a value, where the rules block on it, is not "not applicable"
    const missingBlocks = value === null && finding?.severity === 'blocking';
    const status: SafetyFactorRow['status'] = missingBlocks ? 'below' : value === null ? 'not-applicable' : limit === null ? 'no-limit' : value >= limit ? 'meets' : 'below';
    const statusText = missingBlocks
      ? 'not computed: a value is missing (blocking)'
      : { meets: 'meets the minimum', below: 'below the minimum', 'no-limit': 'no minimum recorded by the rules', 'not-applicable': 'not applicable' }[status];
    return {
      key: factor.key,
      label: factor.label,
      shortLabel: factor.shortLabel,
      path: factor.paths[0],
      value,
      limit,
      valueText: value === null ? '—' : sig(value),
      limitText: limit === null ? '—' : sig(limit),
      status,
      statusText,
      limitFrom: source?.ruleId ?? null,
    };
  });
}

function buildChecks(findings: readonly Finding[], system: UnitSystem): CheckRow[] {
  return findings
    .filter((f) => f.measured !== null || f.limit !== null)
    .map((f) => ({
      ruleId: f.ruleId,
      severity: f.severity,
      subject: f.subject === null ? '—' : pathLabel(f.subject),
      measured: findingValue(f.measured, f.unit, f.subject, system),
      limit: findingValue(f.limit, f.unit, f.subject, system),
      ratio: typeof f.measured === 'number' && typeof f.limit === 'number' && f.limit !== 0 ? sig(f.measured / f.limit) : '—',
    }));
}

/** Acknowledgements carried by review events: data.acknowledgements as { finding, comment } (or rule ids / { ruleId }). */
function acknowledgements(events: readonly ProductEvent[]): Map<string, string> {
  const acks = new Map<string, string>();
  for (const ev of events) {
    const list = ev.data.acknowledgements ?? ev.data.acknowledged;
    if (!Array.isArray(list)) continue;
    for (const item of list) {
      const obj = item && typeof item === 'object' ? (item as Record<string, unknown>) : null;
      // The review workflow writes { finding: ruleId, comment }; older shapes carry { ruleId } or a bare id.
      const id = typeof item === 'string' ? item : (obj?.finding ?? obj?.ruleId ?? null);
      const comment = typeof obj?.comment === 'string' ? obj.comment : null;
      if (typeof id === 'string') acks.set(id, comment ? `${actorName(ev.actor)}: ${comment}` : actorName(ev.actor));
    }
  }
  return acks;
}

function buildFindingGroups(findings: readonly Finding[], events: readonly ProductEvent[], system: UnitSystem): FindingGroup[] {
  const acks = acknowledgements(events);
  return SEVERITY_GROUPS.map((g) => ({
    ...g,
    findings: findings
      .filter((f) => f.severity === g.severity)
      .map((f) => ({
        ruleId: f.ruleId,
        severity: f.severity,
        message: f.message,
        basis: f.basis,
        subject: f.subject === null ? null : `${pathLabel(f.subject)} (${f.subject})`,
        measured: findingValue(f.measured, f.unit, f.subject, system),
        limit: findingValue(f.limit, f.unit, f.subject, system),
        acknowledgedBy: acks.get(f.ruleId) ?? null,
      })),
  }));
}

// ---------------------------------------------------------------------------------------------------------
// Events and history

const TEXT_KEYS = ['text', 'comment', 'body', 'note', 'reason', 'message'];

function scalarText(value: unknown): string {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'string') return value;
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (Array.isArray(value)) return value.map(scalarText).join(', ');
  if (typeof value === 'object') {
    const o = value as Record<string, unknown>;
    if (typeof o.ruleId === 'string') return o.note ? `${o.ruleId} (${scalarText(o.note)})` : o.ruleId;
    return Object.entries(o)
      .map(([k, v]) => `${k}: ${scalarText(v)}`)
      .join('; ');
  }
  return String(value);
}

function buildSignatures(events: readonly ProductEvent[]): SignatureView[] {
  return [...events]
    .sort((a, b) => a.seq - b.seq)
    .filter((ev) => ev.type === 'approved' || ev.type === 'rejected')
    .map((ev) => signatureOf(ev.data, ev.createdAt, ev.hash))
    .filter((s): s is Signature => s !== null)
    .map((s) => ({ printedName: s.printedName, meaning: s.meaning, signedAt: s.signedAt, signedDate: s.signedAt.slice(0, 10), signedTime: s.signedAt.slice(11), method: SIGNATURE_METHOD_LABELS[s.method] ?? s.method, fingerprint: s.fingerprint, revisionHash: s.revisionHash }));
}

function buildEvents(events: readonly ProductEvent[]): EventView[] {
  return [...events]
    .sort((a, b) => a.seq - b.seq)
    .map((ev) => {
      const textKey = TEXT_KEYS.find((k) => typeof ev.data[k] === 'string');
      const details = Object.entries(ev.data)
        .filter(([k]) => k !== textKey)
        .map(([k, v]) => `${k}: ${scalarText(v)}`);
      return {
        seq: ev.seq,
        type: ev.type,
        typeLabel: EVENT_LABELS[ev.type] ?? ev.type,
        actor: actorName(ev.actor),
        at: formatDate(ev.createdAt),
        text: textKey ? (ev.data[textKey] as string) : null,
        details,
      };
    });
}

// ---------------------------------------------------------------------------------------------------------
// Input tables

function flatten(value: unknown, prefix: string, out: InputRow[]): void {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) flatten(v, prefix ? `${prefix}.${k}` : k, out);
    return;
  }
  if (Array.isArray(value)) {
    value.forEach((v, i) => flatten(v, `${prefix}[${i}]`, out));
    return;
  }
  out.push({ path: prefix || '(input)', value: value === null || value === undefined ? '—' : String(value) });
}

/** Engine units of normalized-design leaves, by field name. */
const SI_UNIT_OF: Record<string, string> = {
  majorDiameter: 'm', pitch: 'm', meanDiameter: 'm', outerDiameter: 'm', innerDiameter: 'm', length: 'm', unsupportedLength: 'm',
  axial: 'N', allowablePressure: 'Pa', yieldStrength: 'Pa', elasticModulus: 'Pa', allowablePv: 'Pa·m/s', density: 'kg/m³',
  speed: 'rpm', linearSpeed: 'm/s', availableTorque: 'N·m', loadFlankAngle: '°',
  whirlSpan: 'm', brakeTorque: 'N·m', loadMass: 'kg', accelerationTime: 's', acceleration: 'm/s²',
};

function engineUnitRows(design: Design): InputRow[] {
  const rows: InputRow[] = [];
  const walk = (value: unknown, prefix: string): void => {
    if (prefix === 'friction') return; // printed with its sources in its own table
    if (value !== null && typeof value === 'object') {
      for (const [k, v] of Object.entries(value as Record<string, unknown>)) walk(v, prefix ? `${prefix}.${k}` : k);
      return;
    }
    const key = prefix.split('.').pop() as string;
    if (typeof value === 'number') rows.push({ path: prefix, value: siRecord(value), unit: SI_UNIT_OF[key] ?? '' });
    else rows.push({ path: prefix, value: value === null ? '—' : String(value), unit: '' });
  };
  walk(design, '');
  return rows;
}

function frictionRows(design: Design): FrictionRow[] {
  const row = (surface: string, r: FrictionRange | null): FrictionRow | null => {
    if (!r) return null;
    const entry = r.entry ? FRICTION_LIBRARY.find((e) => e.id === r.entry) : undefined;
    return {
      surface,
      range: `${coefficient(r.min)} to ${coefficient(r.max)}`,
      sourceKind: r.source.kind,
      reference: r.source.reference,
      entry: entry ? `${entry.id} (${entry.pair}, ${entry.lubrication})` : r.entry ?? 'typed in',
    };
  };
  return [row('Thread, f', design.friction.thread), row('Collar, f_c', design.friction.collar)].filter((r): r is FrictionRow => r !== null);
}

function entered(input: unknown, path: string): boolean {
  return valueAtAny(input, path) !== undefined;
}
function valueAtAny(root: unknown, path: string): unknown {
  let node: unknown = root;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

function materialRows(design: Design, input: unknown, system: UnitSystem): MaterialRow[] {
  const q = (si: number | null, kind: QuantityKind) => (si === null ? 'not known' : formatQuantity(si, kind, system));
  const screw = design.screw.material ? findScrewMaterial(design.screw.material) : undefined;
  const nut = design.nut.material ? findNutMaterial(design.nut.material) : undefined;
  const origin = (path: string, library: string | undefined) => (entered(input, path) ? 'as entered' : library ?? '—');
  const screwName = screw ? `${screw.name} (${screw.id})` : design.screw.material ?? 'not named';
  const nutName = nut ? `${nut.name} (${nut.id})` : design.nut.material ?? 'not named';
  return [
    { part: 'Screw', property: 'Material', value: screwName, origin: screw ? 'material library' : 'as entered' },
    { part: 'Screw', property: 'Yield strength S_y', value: q(design.screw.yieldStrength, 'stress'), origin: origin('screw.yieldStrength', screw?.source) },
    { part: 'Screw', property: 'Elastic modulus E', value: q(design.screw.elasticModulus, 'modulus'), origin: origin('screw.elasticModulus', screw?.source) },
    { part: 'Screw', property: 'Density ρ', value: q(design.screw.density, 'density'), origin: origin('screw.density', screw?.source) },
    { part: 'Nut', property: 'Material', value: nutName, origin: nut ? 'material library' : design.nut.material ? "as entered (the design's own material)" : 'as entered' },
    design.nut.allowablePressure !== null || !design.nut.pressureBySpeed
      ? { part: 'Nut', property: 'Allowable bearing pressure (used at any rubbing speed)', value: q(design.nut.allowablePressure, 'pressure'), origin: origin('nut.allowablePressure', nut?.allowablePressureSource) }
      : {
          part: 'Nut',
          property: 'Allowable bearing pressure by rubbing speed',
          value: design.nut.pressureBySpeed
            .map((s) => `${q(s.allowablePressure, 'pressure')} ${s.upToRubbingSpeed === null ? 'above' : `to ${formatQuantity(s.upToRubbingSpeed, 'slidingSpeed', system)}`}`)
            .join('; '),
          origin: entered(input, 'nut.allowablePressureBySpeed') ? 'as entered' : 'Shigley 9th ed. Table 8-4 after Rothbart (from memory), low end of each class',
        },
    { part: 'Nut', property: 'Allowable pV', value: q(design.nut.allowablePv, 'pv'), origin: origin('nut.allowablePv', nut?.allowablePvSource) },
    { part: 'Nut', property: 'Yield strength', value: q(design.nut.yieldStrength, 'stress'), origin: origin('nut.yieldStrength', nut?.yieldSource) },
  ];
}

/** Tolerance class and the minimum-material diameters the checks used, or the statement that the basic profile was used. */
function minimumMaterialRows(g: Evaluation['geometry'], system: UnitSystem): KeyValue[] {
  const mm = g.minimumMaterial;
  if (!mm) return [];
  if (mm.toleranceClass === null) {
    return [{ label: 'Tolerance class', value: 'none named: the checks use the basic profile; the minimum-material diameters of any class are lower for the screw and higher for the nut, so real stresses are somewhat higher' }];
  }
  const L = (si: number) => formatQuantity(si, 'length', system);
  return [
    { label: 'Tolerance class (the strength, bearing and stripping checks use its minimum-material diameters)', value: `${mm.toleranceClass}: ${mm.basis}` },
    { label: 'Minimum-material screw diameters: major, pitch, minor', value: `${L(mm.majorDiameter)}, ${L(mm.pitchDiameter)}, ${L(mm.minorDiameter)}` },
    { label: 'Minimum-material nut diameters: minor D1, pitch D2', value: `${L(mm.nutMinorDiameter)}, ${L(mm.nutPitchDiameter)}` },
    { label: 'Flank engagement at minimum material (d_min − D1_max) / 2', value: L(mm.engagedHeight) },
  ];
}

function geometryRows(e: Evaluation, system: UnitSystem): KeyValue[] {
  const g = e.geometry;
  const L = (si: number) => formatQuantity(si, 'length', system);
  const deg = (x: number) => formatQuantity(x, 'angle', system);
  return [
    { label: 'Form and standard', value: `${g.form}, ${g.standard}` },
    { label: 'Size', value: g.size ?? 'not a standard size' },
    { label: 'Major diameter d', value: L(g.majorDiameter) },
    { label: 'Pitch p', value: L(g.pitch) },
    { label: 'Starts n_s', value: String(g.starts) },
    { label: 'Lead l', value: L(g.lead) },
    { label: 'Mean diameter d_m', value: L(g.meanDiameter) },
    { label: 'Minor diameter d_r (the section of the body, column and whirl checks)', value: L(g.minorDiameter) },
    ...(g.minorDiameterArea === undefined ? [] : [{ label: 'Minor-diameter area π d_r² / 4', value: formatQuantity(g.minorDiameterArea, 'area', system) }]),
    ...(g.tensileStressArea == null
      ? []
      : [{ label: 'Tensile stress area A_s (ISO 898-1 / ASME B1.1), for reference only: no check uses it', value: formatQuantity(g.tensileStressArea, 'area', system) }]),
    ...(g.nutMinorDiameter === undefined ? [] : [{ label: "Nut minor diameter D1 (the screw threads' stripping plane)", value: L(g.nutMinorDiameter) }]),
    ...minimumMaterialRows(g, system),
    { label: 'Engaged flank height h', value: L(g.threadHeight) },
    { label: 'Crest clearance a_c', value: L(g.crestClearance) },
    { label: 'Nut major diameter D', value: L(g.nutMajorDiameter) },
    { label: 'Load-flank angle α', value: deg(g.flankAngle) },
    { label: 'Lead angle λ', value: deg(g.leadAngle) },
    { label: 'Normal flank angle α_n', value: deg(g.normalFlankAngle) },
    { label: 'Engaged threads n_t', value: sig(g.engagedThreads) },
    { label: 'Thread thickness at the root, screw b', value: L(g.rootThickness) },
    { label: 'Thread thickness at the root, nut b_n', value: L(g.nutRootThickness) },
  ];
}

// ---------------------------------------------------------------------------------------------------------
// Summary and conventions

function buildSummary(design: Design, e: Evaluation, system: UnitSystem, factors: readonly SafetyFactorRow[]): KeyValue[] {
  const q = (si: number, kind: QuantityKind) => formatQuantity(si, kind, system);
  const strength = factors.filter((f) => ['bodyVonMises', 'firstThreadRoot', 'strippingScrew', 'strippingNut'].includes(f.key) && f.value !== null);
  const lowest = strength.reduce<SafetyFactorRow | null>((lo, f) => (lo === null || (f.value as number) < (lo.value as number) ? f : lo), null);
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
  if (lowest) rows.push({ label: 'Lowest strength safety factor', value: lowest.valueText, note: lowest.label });
  rows.push({
    label: 'Buckling safety factor',
    value: e.buckling.safetyFactor === null ? 'not applicable' : sig(e.buckling.safetyFactor),
    note: e.buckling.applies ? `${e.buckling.regime === 'euler' ? 'Euler' : 'Johnson'} column, l/k = ${sig(e.buckling.slenderness)}` : 'screw in tension',
  });
  if (e.criticalSpeed.ratio !== null) rows.push({ label: 'Operating / critical speed', value: sig(e.criticalSpeed.ratio), note: `critical speed ${q(e.criticalSpeed.rpm, 'rpm')}` });
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

function conventions(design: Design, system: UnitSystem): string[] {
  const units =
    system === 'SI'
      ? 'Values are printed in the system the design was entered in, SI: mm, kN, MPa (modulus in GPa), N·m, W, rpm, nut travel in m/min, sliding speed in m/s, pV in MPa·m/s.'
      : 'Values are printed in the system the design was entered in, US customary: in, lbf, ksi for stresses and psi for bearing pressure (modulus in Mpsi), lbf·in, hp, rpm, nut travel in in/min, sliding speed in ft/min, pV in psi·ft/min.';
  return [
    units,
    'The engine computes in SI base units (m, N, Pa, N·m, s; angles in degrees only at the edges). Conversions are exact by definition: 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N, 1 hp = 745.700 W (NIST SP 811).',
    'Printed numbers carry three significant figures, four when the leading digit is 1; checks and safety factors are evaluated on unrounded values, so a printed substitution may differ from its result in the last digit.',
    'Every torque is evaluated at both ends of the stated friction ranges. Self-locking is judged on the thread alone at minimum friction (collar ignored: the safe side); drive sizing, body torsion and input power use maximum friction with the collar included.',
    'Torques use the exact normal-plane form with tan α_n = tan α cos λ; the sec α approximation is printed for comparison only.',
    'Sign: axial stress is negative in compression. A negative lowering torque means the load drives the screw down by itself and must be held by the drive or a brake.',
    'Thread stresses: the first engaged thread carries max(0.38 F, F / n_t); the thread is a cantilever of root thickness b loaded at the pitch line, judged at the worse of its two root fillets; the nut\'s own threads are judged the same way against the nut\'s yield strength. Stripping shear acts on the standard planes (the screw\'s threads at the nut\'s minor diameter, the nut\'s at the screw\'s major diameter) and is held against 0.577 S_y (distortion energy).',
    'Safety factors are capacity over demand on yield. Minimum values are those of the rule set this revision was judged by, for its duty; a finding that states its own limit takes precedence.',
    'Column: k = d_r / 4 on the root diameter; Johnson parabola below the transition slenderness, Euler above it; the end-condition constant follows the design’s basis (recommended or theoretical).',
    'Whirling: first bending mode of a uniform shaft on the root diameter over the whirl span and ends (the column’s unless stated); where the column uses the recommended basis, fixed ends are also taken as only partly fixed and the lower speed is judged; axial load and gyroscopic effects are neglected.',
    'Brake: the holding torque is taken with thread friction lost, F l / (2π), and the drive is judged on the peak torque at the motor (steady raise torque plus acceleration torque, through the gearbox).',
    'Nut wear: mean bearing pressure over all engaged threads, against the allowable for the actual rubbing speed (the nut material\'s speed classes) or the design\'s own single value used at any speed; pV with the sliding velocity along the helix at the mean diameter.',
    'Torque-friction chart: collar friction moves linearly with thread friction between the two ends of its range (extended beyond them, never below zero), so the curves pass through the tabulated torques at minimum and maximum friction.',
    `Dates and times are UTC. The record hash is stored with the revision and chains to the previous record's hash; a changed record would not reproduce it.`,
    `Material: S_y, E and ρ of the screw ${design.screw.material ? `from library entry "${design.screw.material}" unless entered` : 'as entered'}; shear yield taken as ${SHEAR_YIELD_RATIO} S_y.`,
  ];
}

// ---------------------------------------------------------------------------------------------------------
// The view

/** Prepares everything the calculation report prints. */
export function buildReportView(input: ReportInput): ReportView {
  const { revision, product, calculation } = input;
  const design = revision.normalized;
  const e = revision.evaluation;
  const system: UnitSystem = design.unitSystem === 'US' ? 'US' : 'SI';
  const findings = revision.findings;
  const factors = buildSafetyFactors(e, findings, input.minimums);
  const count = (s: Severity) => findings.filter((f) => f.severity === s).length;
  const title = `Calculation report: ${calculation.title}`;
  const headerRows: KeyValue[] = [
    { label: 'Product', value: `${product.code}, ${product.name}` },
    { label: 'Calculation', value: calculation.title, note: calculation.id },
    { label: 'Revision', value: String(revision.revision), note: revision.note ?? undefined },
    { label: 'Review state', value: STATE_LABELS[input.state] ?? input.state },
    { label: 'Verdict of the rules', value: VERDICT_LABELS[revision.verdict] ?? revision.verdict },
    { label: 'Author', value: actorName(revision.author) },
    { label: 'Submitted', value: formatDate(revision.createdAt) },
    { label: 'Reviewer', value: actorName(input.reviewer) },
    { label: 'Decided', value: formatDate(input.decidedAt) },
    { label: 'Report generated', value: formatDate(input.generatedAt) },
    { label: 'Record hash', value: revision.hash, mono: true },
  ];
  return {
    title,
    unitSystem: system,
    unitSystemLabel: system === 'SI' ? 'SI (metric)' : 'US customary',
    caution: CAUTION_TEXT,
    cautionShort: CAUTION_SHORT,
    header: {
      productCode: product.code,
      productName: product.name,
      productDescription: product.description ?? null,
      calculationId: calculation.id,
      calculationTitle: calculation.title,
      revision: revision.revision,
      revisionNote: revision.note,
      state: input.state,
      stateLabel: STATE_LABELS[input.state] ?? input.state,
      verdict: revision.verdict,
      verdictLabel: VERDICT_LABELS[revision.verdict] ?? revision.verdict,
      author: actorName(revision.author),
      reviewer: actorName(input.reviewer),
      decidedAt: input.decidedAt ? formatDate(input.decidedAt) : null,
      rows: headerRows,
    },
    summary: buildSummary(design, e, system, factors),
    findingCounts: { blocking: count('blocking'), warning: count('warning'), info: count('info') },
    input: {
      asEntered: (() => {
        const rows: InputRow[] = [];
        flatten(revision.input, '', rows);
        return rows;
      })(),
      engineUnits: engineUnitRows(design),
      friction: frictionRows(design),
      materials: materialRows(design, revision.input, system),
      geometry: geometryRows(e, system),
    },
    sections: buildSections(design, e, system, findings),
    safetyFactors: factors,
    checks: buildChecks(findings, system),
    findingGroups: buildFindingGroups(findings, input.events, system),
    events: buildEvents(input.events),
    signatures: buildSignatures(input.events),
    historyOmitted: input.omittedHistory
      ? `Listed: the revisions around this one. Not listed: ${input.omittedHistory.before} earlier and ${input.omittedHistory.after} later ` +
        `revision${input.omittedHistory.before + input.omittedHistory.after === 1 ? '' : 's'}; every revision is in GET /api/v1/calculations/${calculation.id}/revisions.`
      : null,
    eventsOmitted: input.omittedComments
      ? `${input.omittedComments.count} further comment${input.omittedComments.count === 1 ? '' : 's'} on this revision (chain links ${input.omittedComments.firstSeq} to ${input.omittedComments.lastSeq}) ` +
        `are not printed here; every decision and acknowledgement above is. The full review trail, with every comment, is the product's audit ` +
        `download: GET /api/v1/products/${product.id}/audit (JSON, or ?format=csv), checked against the hash chain by GET /api/v1/products/${product.id}/verify.`
      : null,
    history: [...input.history]
      .sort((a, b) => a.revision - b.revision)
      .map((h) => ({
        revision: h.revision,
        createdAt: formatDate(h.createdAt),
        author: actorName(h.author),
        verdict: VERDICT_LABELS[h.verdict] ?? h.verdict,
        state: STATE_LABELS[h.state] ?? h.state,
        current: h.id === revision.id,
      })),
    conventions: conventions(design, system),
    record: [
      { label: 'Revision record id', value: revision.id, mono: true },
      { label: 'Record hash', value: revision.hash, mono: true },
      { label: 'Previous record hash', value: revision.previousHash ?? 'none (first record of the chain)', mono: revision.previousHash !== null },
      { label: 'Engine version', value: revision.engineVersion },
      { label: 'Rule set version', value: revision.ruleSetVersion },
      { label: 'Unit system of the input', value: system === 'SI' ? 'SI (metric)' : 'US customary' },
    ],
    checkpoint: input.checkpoint
      ? [
          { label: 'Chain link', value: `${input.checkpoint.seq} of product ${input.checkpoint.productId}`, mono: true },
          { label: 'Chain head hash', value: input.checkpoint.headHash, mono: true },
          { label: 'Signed at', value: input.checkpoint.time, mono: true },
          { label: 'Signing key', value: `${input.checkpoint.algorithm} ${input.checkpoint.keyId}`, mono: true },
          { label: 'Signature', value: input.checkpoint.signature, mono: true },
        ]
      : null,
    hash: revision.hash,
    previousHash: revision.previousHash,
    generatedAt: formatDate(input.generatedAt),
    headerLabel: `${product.code} · ${calculation.title} (${calculation.id}) · revision ${revision.revision}`,
  };
}

/**
 * Section 2 of the report, the design input: as entered, in engine units, friction with its sources, materials and the thread geometry.
 */
import { FRICTION_LIBRARY, findNutMaterial, findScrewMaterial, type Design, type Dimension, type Evaluation, type FrictionRange } from '@leadline/mechanics';
import { coefficient, formatQuantity, sig, type QuantityKind, type UnitSystem } from '@leadline/presentation';
import { designFieldDimension, designFieldLabel } from '@leadline/contracts';
import type { FrictionRow, InputRow, KeyValue, MaterialRow } from '../report-view';

// ---------------------------------------------------------------------------------------------------------
// Input tables

export function flatten(value: unknown, prefix: string, out: InputRow[]): void {
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

/**
 * How the report prints a quantity of each dimension the design input declares (designFieldDimension): the kind of
 * the presentation module, which holds its display units in either system.
 */
const KIND_OF_DIMENSION: Readonly<Record<Dimension, QuantityKind>> = {
  length: 'length', force: 'force', stress: 'stress', torque: 'torque', density: 'density', rotationalSpeed: 'rpm',
  linearSpeed: 'slidingSpeed', angle: 'angle', pv: 'pv', mass: 'mass', time: 'time', linearAcceleration: 'linearAcceleration',
  temperature: 'temperature', inertia: 'inertia', specificWearRate: 'specificWearRate', serviceTime: 'serviceTime',
};

/**
 * A field of the design input in words: the contract's one label of it (designFieldLabel, from the description each
 * field carries), with the report's "[i]" array paths read as the contract's dotted ones.
 */
export function inputLabel(path: string, input?: unknown): string {
  return designFieldLabel(path.replace(/\[(\d+)\]/g, '.$1'), input);
}

/** Every leaf of the normalized design with its path and key, but the friction (printed with its sources in its own table). */
function designLeaves(design: Design, visit: (path: string, key: string, value: unknown) => void): void {
  const walk = (value: unknown, prefix: string): void => {
    if (prefix === 'friction') return;
    if (value !== null && typeof value === 'object') {
      for (const [k, v] of Object.entries(value as Record<string, unknown>)) walk(v, prefix ? `${prefix}.${k}` : k);
      return;
    }
    visit(prefix, prefix.split('.').pop() as string, value);
  };
  walk(design, '');
}

/**
 * The values the engine used, each by its label, in the report's unit system (rounded as the report rounds). The
 * unit of each comes from the dimension its field declares in the design input; the normalized design names the
 * library's pressure steps `pressureBySpeed` where the input names them `allowablePressureBySpeed`.
 */
export function engineValueRows(design: Design, system: UnitSystem): InputRow[] {
  const rows: InputRow[] = [];
  designLeaves(design, (path, key, value) => {
    const field = path.replace(/^nut\.pressureBySpeed/, 'nut.allowablePressureBySpeed');
    const dimension = typeof value === 'number' ? designFieldDimension(field) : null;
    // the elastic modulus is a stress in parsing, printed in GPa as handbooks list it
    const kind = dimension === null ? undefined : key === 'elasticModulus' ? 'modulus' : KIND_OF_DIMENSION[dimension];
    const text = typeof value !== 'number' ? String(value)
      : kind ? formatQuantity(value, kind, system)
        : Number.isInteger(value) ? String(value) : sig(value);
    rows.push({ path, label: inputLabel(field, design), value: text });
  });
  return rows;
}

export function frictionRows(design: Design): FrictionRow[] {
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

export function entered(input: unknown, path: string): boolean {
  return valueAtAny(input, path) !== undefined;
}
export function valueAtAny(root: unknown, path: string): unknown {
  let node: unknown = root;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

export function materialRows(design: Design, input: unknown, system: UnitSystem): MaterialRow[] {
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
export function minimumMaterialRows(g: Evaluation['geometry'], system: UnitSystem): KeyValue[] {
  const mm = g.minimumMaterial;
  if (!mm) return [];
  if (mm.toleranceClass === null) {
    // What the engine recorded as its basis: for most forms the basic profile, for Acme the root every class shares
    return [{ label: 'Tolerance class', value: mm.basis }];
  }
  const L = (si: number) => formatQuantity(si, 'length', system);
  return [
    { label: 'Tolerance class (the strength, bearing and stripping checks use its minimum-material diameters)', value: `${mm.toleranceClass}: ${mm.basis}` },
    { label: 'Minimum-material screw diameters: major, pitch, minor', value: `${L(mm.majorDiameter)}, ${L(mm.pitchDiameter)}, ${L(mm.minorDiameter)}` },
    { label: 'Minimum-material nut diameters: minor D1, pitch D2', value: `${L(mm.nutMinorDiameter)}, ${L(mm.nutPitchDiameter)}` },
    { label: 'Flank engagement at minimum material (d_min − D1_max) / 2', value: L(mm.engagedHeight) },
  ];
}

/**
 * The minor diameter, and which root the body, column and whirl checks used: the evaluation's minimum-material root
 * when it recorded one that differs from the basic minor diameter (a tolerance class, or Acme without a class from
 * engine 1.2 on), else the basic one (earlier engines recorded no minimum-material diameters).
 */
export function minorDiameterRows(g: Evaluation['geometry'], L: (si: number) => string): KeyValue[] {
  const used = g.minimumMaterial?.minorDiameter ?? g.minorDiameter;
  if (Math.abs(used - g.minorDiameter) <= 1e-12 * g.minorDiameter) {
    return [{ label: 'Minor diameter d_r (the section of the body, column and whirl checks)', value: L(g.minorDiameter) }];
  }
  return [
    { label: 'Basic minor diameter d_r (not used by the checks)', value: L(g.minorDiameter) },
    { label: 'Minimum-material minor diameter d_r,min (the section of the body, column and whirl checks)', value: L(used) },
  ];
}

/** What the report prints for a figure the revision's engine did not compute (a revision keeps its own engine's figures). */
export const notComputedBy = (engineVersion: string): string => `not computed by engine ${engineVersion}`;

export function geometryRows(e: Evaluation, system: UnitSystem, engineVersion: string): KeyValue[] {
  const g = e.geometry;
  const older = notComputedBy(engineVersion);
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
    ...minorDiameterRows(g, L),
    { label: 'Minor-diameter area π d_r² / 4', value: g.minorDiameterArea === undefined ? older : formatQuantity(g.minorDiameterArea, 'area', system) },
    ...(g.tensileStressArea == null
      ? []
      : [{ label: 'Tensile stress area A_s (ISO 898-1 / ASME B1.1), for reference only: no check uses it', value: formatQuantity(g.tensileStressArea, 'area', system) }]),
    { label: "Nut minor diameter D1 (the screw threads' stripping plane)", value: g.nutMinorDiameter === undefined ? older : L(g.nutMinorDiameter) },
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


/**
 * Tolerance classes and minimum-material diameters. A design may name a class; the strength,
 * bearing and stripping checks then use the diameters at which the screw and nut have the least material:
 * the screw's smallest major, pitch and minor diameters, the nut's largest minor and pitch diameters.
 * Without a class the basic profile is used, and the report says the minimum-material figures are lower.
 */
import { ISO_2903_7E_7H } from './tables/iso-2903-7e7h';
import { INCH, MM, type ThreadForm, type ThreadGeometry } from './threads';

/** Classes the engine holds, by thread form. */
export const TOLERANCE_CLASSES: Readonly<Partial<Record<ThreadForm, readonly string[]>>> = {
  trapezoidal: ['7H/7e'],
  acme: ['2G', '3G', '4G'],
};

/** Minimum-material diameters of a screw and nut pair [m]; basic diameters when no class is named. */
export interface MinimumMaterial {
  /** The class as named, or null (basic profile) */
  readonly toleranceClass: string | null;
  /** Screw major diameter, minimum [m] */
  readonly majorDiameter: number;
  /** Screw pitch diameter, minimum [m] */
  readonly pitchDiameter: number;
  /** Screw minor diameter, minimum [m] */
  readonly minorDiameter: number;
  /** Nut minor diameter D1, maximum [m] */
  readonly nutMinorDiameter: number;
  /** Nut pitch diameter D2, maximum [m] */
  readonly nutPitchDiameter: number;
  /** Radial flank engagement at minimum material, (d_min - D1_max) / 2 [m] */
  readonly engagedHeight: number;
  /** Standard and source of the limits */
  readonly basis: string;
}

/**
 * Minimum-material diameters for a tolerance class.
 * ISO 2903 7H/7e: d_min = d - Td, d2_min = d2 + es - Td2, d3_min = d3 - Td3, D1_max = D1 + TD1, D2_max = D2 + TD2.
 * ASME B1.5 2G/3G/4G (formulas from memory): allowance 0.008/0.006/0.004 sqrt(d),
 * PD tolerance 0.006 sqrt(d) + 0.030 sqrt(p) / 0.0028 sqrt(d) + 0.014 sqrt(p) / 0.002 sqrt(d) + 0.010 sqrt(p) (in);
 * major min d - 0.05p; minor max d - p - 0.020 (10 TPI and coarser) or - 0.010, minor min = minor max - 1.5 PD tolerance;
 * nut minor max d - p + max(0.05p, 0.005); nut PD max = basic + PD tolerance (from memory).
 * @param g - basic geometry (threadGeometry)
 * @param toleranceClass - a class of TOLERANCE_CLASSES for the form, or null
 * @returns the minimum-material diameters [m]; throws on a class the form does not hold or an ISO size not tabulated
 * (the contract refuses both first).
 */
export function minimumMaterial(g: ThreadGeometry, toleranceClass: string | null): MinimumMaterial {
  const basicNutMinor = g.nutMinorDiameter;
  if (toleranceClass === null) {
    return {
      toleranceClass: null,
      majorDiameter: g.majorDiameter,
      pitchDiameter: g.meanDiameter,
      minorDiameter: g.minorDiameter,
      nutMinorDiameter: basicNutMinor,
      nutPitchDiameter: g.meanDiameter,
      engagedHeight: g.threadHeight,
      basis: 'basic profile (no tolerance class named): minimum-material diameters are smaller for the screw and larger for the nut',
    };
  }
  if (!(TOLERANCE_CLASSES[g.form] ?? []).includes(toleranceClass)) {
    throw new Error(`no tolerance class "${toleranceClass}" held for ${g.form} threads`);
  }
  let d: number, d2: number, d3: number, D1: number, D2: number, basis: string;
  if (g.form === 'trapezoidal') {
    const row = iso2903Row(g.majorDiameter, g.pitch);
    if (!row) throw new Error('ISO 2903 7H/7e limits are tabulated for the standard sizes Tr 8x1.5 to Tr 120x22 only');
    const [, , es, Td, Td2, Td3, TD1, TD2] = row;
    d = g.majorDiameter - Td * MM;
    d2 = g.meanDiameter + (es - Td2) * MM;
    d3 = g.minorDiameter - Td3 * MM;
    D1 = basicNutMinor + TD1 * MM;
    D2 = g.meanDiameter + TD2 * MM;
    basis = 'ISO 2903 class 7H/7e (limits from the open dataset threadlib design/TR.csv after mdmetric.com, ISO 2903 tables)';
  } else {
    const din = g.majorDiameter / INCH;
    const p = g.pitch / INCH;
    const [allowance, tolerance] = {
      '2G': [0.008 * Math.sqrt(din), 0.006 * Math.sqrt(din) + 0.03 * Math.sqrt(p)],
      '3G': [0.006 * Math.sqrt(din), 0.0028 * Math.sqrt(din) + 0.014 * Math.sqrt(p)],
      '4G': [0.004 * Math.sqrt(din), 0.002 * Math.sqrt(din) + 0.01 * Math.sqrt(p)],
    }[toleranceClass as '2G' | '3G' | '4G'];
    const E = din - p / 2;
    const minorMax = din - p - (p >= 0.1 - 1e-12 ? 0.02 : 0.01);
    d = (din - 0.05 * p) * INCH;
    d2 = (E - allowance - tolerance) * INCH;
    d3 = (minorMax - 1.5 * tolerance) * INCH;
    D1 = (din - p + Math.max(0.05 * p, 0.005)) * INCH;
    D2 = (E + tolerance) * INCH;
    basis = `ASME B1.5 class ${toleranceClass} (allowance and tolerance formulas from memory)`;
  }
  return { toleranceClass, majorDiameter: d, pitchDiameter: d2, minorDiameter: d3, nutMinorDiameter: D1, nutPitchDiameter: D2, engagedHeight: (d - D1) / 2, basis };
}

/** The ISO 2903 7H/7e row of a standard size, or undefined. */
export function iso2903Row(d: number, P: number) {
  return ISO_2903_7E_7H.find(([dd, pp]) => Math.abs(dd * MM - d) < 1e-9 && Math.abs(pp * MM - P) < 1e-9);
}

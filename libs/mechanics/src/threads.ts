/**
 * Thread forms and their basic geometry, plus the standard size tables a design can name.
 * All lengths in metres, angles in degrees at this module's edges.
 */
import { ACME_PREFERRED, STUB_ACME_PREFERRED, UNIFIED_COARSE, type InchSize } from './tables/inch-threads';
import { ISO_METRIC_COARSE } from './tables/iso-metric';
import { ISO_TRAPEZOIDAL_SIZES } from './tables/iso-trapezoidal';

export const THREAD_FORMS = ['square', 'acme', 'stub-acme', 'trapezoidal', 'buttress', 'unified', 'iso-metric'] as const;
export type ThreadForm = (typeof THREAD_FORMS)[number];

const DEG = Math.PI / 180;
const INCH = 0.0254; // exact, NIST SP 811 B.8
const MM = 0.001;

/** Buttress profiles the engine knows, keyed by load-flank angle [deg]. */
export const BUTTRESS_PROFILES = {
  /** ASME B1.9 7/45 buttress (from memory): h = 0.6p engagement, external root height 0.66271p. */
  7: { trailingFlankAngle: 45, engagementHeight: 0.6, externalThreadHeight: 0.66271, standard: 'ASME B1.9 (7/45)' },
  /** DIN 513 / ISO 3/30 buttress (from memory): H1 = 0.75P, h3 = 0.86777P. */
  3: { trailingFlankAngle: 30, engagementHeight: 0.75, externalThreadHeight: 0.86777, standard: 'DIN 513 (3/30)' },
} as const;
export type ButtressLoadFlank = keyof typeof BUTTRESS_PROFILES;

/**
 * Crest clearance a_c of ISO metric trapezoidal threads by pitch band.
 * @param P - pitch [mm]
 * @returns a_c [mm]
 * Source: ISO 2901:2016 Table 1 (pitch bands from memory): 1.5 -> 0.15; 2..5 -> 0.25; 6..12 -> 0.5; 14..44 -> 1.
 */
export function trapezoidalCrestClearance(P: number): number {
  if (P <= 1.5) return 0.15;
  if (P <= 5) return 0.25;
  if (P <= 12) return 0.5;
  return 1;
}

/** Basic geometry of one thread, SI units (m, degrees). */
export interface ThreadGeometry {
  readonly form: ThreadForm;
  readonly majorDiameter: number;
  readonly pitch: number;
  readonly starts: number;
  readonly lead: number;
  readonly meanDiameter: number;
  readonly minorDiameter: number;
  /** Basic engaged flank height used for bearing [m] */
  readonly threadHeight: number;
  /** Load-flank angle alpha measured from the normal to the axis [deg] (half the included angle if symmetric) */
  readonly flankAngle: number;
  /** The other flank's angle [deg] */
  readonly trailingFlankAngle: number;
  /** Major diameter of the nut (internal) thread, at the nut thread's root [m] */
  readonly nutMajorDiameter: number;
  /**
   * Minor diameter of the nut (internal) thread, basic [m]: the cylinder on which the screw's threads strip
   * (d - p square and Acme, d - 0.6p stub Acme, D1 = d - P trapezoidal, d - 2h buttress, D1 = d - 1.082532p 60 deg)
   */
  readonly nutMinorDiameter: number;
  /** Crest clearance (trapezoidal a_c) [m], 0 where the form has none */
  readonly crestClearance: number;
  /** Formula ids behind mean and minor diameters, for the trace */
  readonly meanDiameterFormula: string;
  readonly minorDiameterFormula: string;
  readonly standard: string;
}

export interface ThreadSpec {
  readonly form: ThreadForm;
  readonly majorDiameter: number;
  readonly pitch: number;
  readonly starts: number;
  /** Buttress only: load-flank angle [deg] */
  readonly loadFlankAngle?: number | null;
}

/**
 * Basic thread geometry of a form from major diameter and pitch.
 * @returns diameters [m], flank angles [deg]; lead = starts x pitch (Shigley 10th ed., Sec. 8-2).
 * Conventions: see the engine issue and docs/formulas.md (d - p/2 for square/Acme/Tr; d - 0.3p stub Acme;
 * d - 0.649519p for 60 deg threads; minor d - p, d - 0.6p, d - P - 2ac, d - 1.226869p).
 */
export function threadGeometry(spec: ThreadSpec): ThreadGeometry {
  const { form, majorDiameter: d, pitch: p, starts } = spec;
  // One object literal at the end (no spreads): this runs on every request.
  let dm: number, dr: number, h: number, alpha: number, trailing: number, nutMajor = d, ac = 0, nutMinor: number;
  let dmFormula = 'mean-diameter-half-pitch', drFormula = 'minor-diameter-full-pitch', standard: string;
  switch (form) {
    case 'square':
      [dm, dr, h, alpha, trailing] = [d - p / 2, d - p, p / 2, 0, 0];
      nutMinor = d - p;
      standard = 'square thread (Shigley 10th ed., Fig. 8-3a)';
      break;
    case 'acme':
      [dm, dr, h, alpha, trailing] = [d - p / 2, d - p, p / 2, 14.5, 14.5];
      nutMinor = d - p; // ASME B1.5 internal minor diameter minimum, basic (from memory)
      standard = 'ASME B1.5 general-purpose Acme (29 deg), basic';
      break;
    case 'stub-acme':
      [dm, dr, h, alpha, trailing] = [d - 0.3 * p, d - 0.6 * p, 0.3 * p, 14.5, 14.5];
      nutMinor = d - 0.6 * p;
      dmFormula = 'mean-diameter-stub-acme';
      drFormula = 'minor-diameter-stub-acme';
      standard = 'ASME B1.8 stub Acme (29 deg), basic';
      break;
    case 'trapezoidal':
      ac = trapezoidalCrestClearance(p / MM) * MM;
      [dm, dr, h, alpha, trailing] = [d - p / 2, d - p - 2 * ac, p / 2, 15, 15];
      nutMajor = d + 2 * ac;
      nutMinor = d - p; // ISO 2901 D1 = d - 2 H1 = d - P
      drFormula = 'minor-diameter-trapezoidal';
      standard = 'ISO 2901/2903/2904 metric trapezoidal (30 deg)';
      break;
    case 'buttress': {
      const profile = BUTTRESS_PROFILES[spec.loadFlankAngle as ButtressLoadFlank];
      if (!profile) throw new Error('buttress geometry is tabulated for 3 deg and 7 deg load flanks only');
      h = profile.engagementHeight * p;
      [dm, dr, alpha, trailing] = [d - h, d - 2 * profile.externalThreadHeight * p, spec.loadFlankAngle as number, profile.trailingFlankAngle];
      nutMinor = d - 2 * h; // the engaged height h reaches from the major diameter to the nut's minor diameter
      dmFormula = 'mean-diameter-buttress';
      drFormula = 'minor-diameter-buttress';
      standard = profile.standard;
      break;
    }
    case 'unified':
    case 'iso-metric':
      [dm, dr, h, alpha, trailing] = [d - 0.649519 * p, d - 1.226869 * p, 0.541266 * p, 30, 30];
      nutMinor = d - 1.082532 * p; // ISO 724 / ASME B1.1 D1 = d - (5/8) H x 2
      dmFormula = 'mean-diameter-60deg';
      drFormula = 'minor-diameter-60deg';
      standard = form === 'unified' ? 'ASME B1.1 unified (60 deg), basic' : 'ISO 68-1 metric (60 deg), basic';
      break;
  }
  return {
    form, majorDiameter: d, pitch: p, starts, lead: starts * p, meanDiameter: dm, minorDiameter: dr, threadHeight: h,
    flankAngle: alpha, trailingFlankAngle: trailing, nutMajorDiameter: nutMajor, nutMinorDiameter: nutMinor, crestClearance: ac,
    meanDiameterFormula: dmFormula, minorDiameterFormula: drFormula, standard,
  };
}

/**
 * Thread thickness at a diameter inside the profile, on the straight-flank model.
 * At the pitch line the basic thickness is p/2; it grows by (tan a1 + tan a2) per unit depth.
 * @param depth - radial distance from the pitch line towards the root [m]
 * @returns thickness [m] (Shigley 10th ed., Fig. 8-3 geometry; trigonometry of the basic profile)
 */
export function threadThicknessAtDepth(g: ThreadGeometry, depth: number): number {
  return g.pitch / 2 + depth * (Math.tan(g.flankAngle * DEG) + Math.tan(g.trailingFlankAngle * DEG));
}

/** A named standard size. */
export interface ThreadSize {
  readonly designation: string;
  readonly form: ThreadForm;
  readonly majorDiameter: number;
  readonly pitch: number;
  readonly preferred: boolean;
  readonly standard: string;
}

function inchSizes(list: readonly InchSize[], form: ThreadForm, suffix: string, standard: string): ThreadSize[] {
  return list.map((s) => ({
    designation: `${s.nominal}-${s.tpi} ${suffix}`,
    form,
    majorDiameter: s.d * INCH,
    pitch: INCH / s.tpi,
    preferred: true,
    standard,
  }));
}

/** Every standard size the engine ships, in table order. */
export const THREAD_SIZES: readonly ThreadSize[] = [
  ...ISO_TRAPEZOIDAL_SIZES.map((s) => ({
    designation: `Tr ${s.d}x${s.P}`,
    form: 'trapezoidal' as const,
    majorDiameter: s.d * MM,
    pitch: s.P * MM,
    preferred: s.preferred,
    standard: 'ISO 2902 / ISO 2904',
  })),
  ...inchSizes(ACME_PREFERRED, 'acme', 'ACME', 'ASME B1.5 preferred series'),
  ...inchSizes(STUB_ACME_PREFERRED, 'stub-acme', 'STUB ACME', 'ASME B1.8'),
  ...ISO_METRIC_COARSE.map((s) => ({
    designation: `M${s.d}`,
    form: 'iso-metric' as const,
    majorDiameter: s.d * MM,
    pitch: s.P * MM,
    preferred: true,
    standard: 'ISO 261 coarse series',
  })),
  ...inchSizes(UNIFIED_COARSE, 'unified', 'UNC', 'ASME B1.1 coarse series'),
];

/** Normalizes a designation for lookup: case, spaces, "x"/"X", "1 1/2" vs "1-1/2", "Tr24x5" vs "Tr 24 x 5". */
function sizeKey(text: string): string {
  return text
    .trim()
    .toUpperCase()
    .replace(/(\d)\s+(\d+\/\d+)/g, '$1-$2')
    .replace(/\s*X\s*/g, 'X')
    .replace(/\s+/g, ' ')
    .replace(/^TR\s*/, 'TR ')
    .replace(/^M\s+/, 'M');
}

const SIZE_INDEX = new Map<string, ThreadSize>();
for (const s of THREAD_SIZES) {
  SIZE_INDEX.set(s.designation, s);
  SIZE_INDEX.set(sizeKey(s.designation), s);
  // "M20x2.5" names the coarse pitch explicitly
  if (s.form === 'iso-metric') SIZE_INDEX.set(sizeKey(`${s.designation}x${s.pitch / MM}`), s);
}

/** Finds a standard size by designation ("Tr 24x5", "1-1/2-4 ACME", "M20", "1/2-13 UNC"); undefined if unknown. */
export function findThreadSize(designation: string): ThreadSize | undefined {
  const direct = SIZE_INDEX.get(designation); // exact designations skip normalizing
  return direct ?? SIZE_INDEX.get(sizeKey(designation));
}

export { DEG, INCH, MM };

/**
 * A small library of screw and nut materials. Each value names its source; "from memory" marks values
 * recalled rather than read.
 */

export interface ScrewMaterial {
  readonly id: string;
  readonly name: string;
  /** Minimum yield strength [Pa] */
  readonly yieldStrength: number;
  /** Elastic modulus [Pa] */
  readonly elasticModulus: number;
  /** Mass density [kg/m^3] */
  readonly density: number;
  readonly source: string;
}

const MPA = 1e6;
const GPA = 1e9;
const A5 = "Shigley's Mechanical Engineering Design, Table A-5 (E; density = weight density / 9.80665)";

// Yield strengths are specification minimums where one is held, so a check never leans on a
// typical value; the one typical value left (4140 Q&T) says so and names what overrides it.
const A20 = 'Shigley Table A-20, deterministic ASTM minimum strengths (from memory)';
export const SCREW_MATERIALS: readonly ScrewMaterial[] = [
  { id: 'steel-1018-cd', name: 'AISI 1018 cold drawn', yieldStrength: 370 * MPA, elasticModulus: 207 * GPA, density: 7801, source: `Sy 370 MPa (54 kpsi) minimum, ${A20}; ${A5}` },
  { id: 'steel-1045-cd', name: 'AISI 1045 cold drawn', yieldStrength: 530 * MPA, elasticModulus: 207 * GPA, density: 7801, source: `Sy 530 MPa (77 kpsi) minimum, ${A20}; ${A5}` },
  { id: 'steel-1045-hr', name: 'AISI 1045 hot rolled', yieldStrength: 310 * MPA, elasticModulus: 207 * GPA, density: 7801, source: `Sy 310 MPa (45 kpsi) minimum, ${A20}; ${A5}` },
  {
    id: 'steel-4140-qt650', name: 'AISI 4140 Q&T 650 C', yieldStrength: 655 * MPA, elasticModulus: 207 * GPA, density: 7801,
    source: `Sy 655 MPa, Shigley Table A-21 (from memory): a typical value of the heat treatment, not a specification minimum; give screw.yieldStrength from the mill certificate to replace it; ${A5}`,
  },
  { id: 'stainless-304-annealed', name: 'AISI 304 annealed bar', yieldStrength: 205 * MPA, elasticModulus: 190 * GPA, density: 7750, source: `Sy 205 MPa (30 ksi) minimum, ASTM A276 (from memory); ${A5} (stainless 18-8)` },
];

/**
 * One step of a speed-rated allowable: the allowable mean bearing pressure up to a rubbing speed.
 * Steps run from low to high speed; the allowable never rises with speed.
 */
export interface PressureSpeedPoint {
  /** Highest rubbing speed at the thread mean diameter the step covers [m/s]; null: any higher speed */
  readonly upToRubbingSpeed: number | null;
  /** Allowable mean bearing pressure [Pa]; null where no published value is held for that speed */
  readonly allowablePressure: number | null;
  /** Application class the value belongs to, in the source's words, e.g. "hoisting screw (medium speed)" */
  readonly application: string;
  readonly source: string;
}

export interface NutMaterial {
  readonly id: string;
  readonly name: string;
  /**
   * Safe mean bearing pressure on the flanks at low rubbing speed [Pa] (the first step of pressureBySpeed);
   * null where no published value is held. Kept for listings: checks use pressureBySpeed at the actual speed.
   */
  readonly allowablePressure: number | null;
  readonly allowablePressureSource: string;
  /** Allowable pressure against rubbing speed, low speed first; empty where none is published */
  readonly pressureBySpeed: readonly PressureSpeedPoint[];
  /** pV limit, velocity taken at the thread mean diameter [Pa*m/s]; null where unknown */
  readonly allowablePv: number | null;
  readonly allowablePvSource: string;
  /** Yield strength for the nut-thread stripping check [Pa]; null where unknown */
  readonly yieldStrength: number | null;
  readonly yieldSource: string;
}

const PSI = 6894.757293168361; // 1 psi in Pa, NIST SP 811 B.8
const PV_UNIT = PSI * 0.00508; // 1 psi*ft/min in Pa*m/s
const FT_PER_MIN = 0.00508; // 1 ft/min in m/s, exact (0.3048 m / 60 s)

/**
 * Shigley 9th ed. Table 8-4 after Rothbart (from memory): safe
 * bearing pressure by application and rubbing speed. Each class takes the low end of its printed range (the safe
 * side), and a speed between two classes takes the faster class's value (10-20 and 40-50 ft/min are not printed).
 * The hand-press class (2500-3500 psi, low speed, well lubricated) is not used by default: it assumes an application
 * the engine cannot see; a design that is one gives its own nut.allowablePressure.
 */
const TABLE_8_4 = 'Shigley 9th ed. Table 8-4 after Rothbart (from memory)';
const STEEL_BRONZE_BY_SPEED: readonly PressureSpeedPoint[] = [
  { upToRubbingSpeed: 10 * FT_PER_MIN, allowablePressure: 1600 * PSI, application: 'screw jack (low speed, up to 10 ft/min)', source: `${TABLE_8_4}, steel/bronze, 1600-2500 psi: low end` },
  { upToRubbingSpeed: 40 * FT_PER_MIN, allowablePressure: 800 * PSI, application: 'hoisting screw (medium speed, 20-40 ft/min)', source: `${TABLE_8_4}, steel/bronze, 800-1400 psi: low end (also taken for 10-20 ft/min)` },
  { upToRubbingSpeed: null, allowablePressure: 150 * PSI, application: 'lead screw (high speed, 50 ft/min and over)', source: `${TABLE_8_4}, steel/bronze, 150-240 psi: low end (also taken for 40-50 ft/min)` },
];
const STEEL_CAST_IRON_BY_SPEED: readonly PressureSpeedPoint[] = [
  { upToRubbingSpeed: 8 * FT_PER_MIN, allowablePressure: 1800 * PSI, application: 'screw jack (low speed, up to 8 ft/min)', source: `${TABLE_8_4}, steel/cast iron, 1800-2500 psi: low end` },
  { upToRubbingSpeed: 40 * FT_PER_MIN, allowablePressure: 600 * PSI, application: 'hoisting screw (medium speed, 20-40 ft/min)', source: `${TABLE_8_4}, steel/cast iron, 600-1000 psi: low end (also taken for 8-20 ft/min)` },
  { upToRubbingSpeed: null, allowablePressure: null, application: 'above 40 ft/min', source: `${TABLE_8_4} gives no steel/cast-iron class above 40 ft/min: give nut.allowablePressure from a test or the supplier` },
];

export const NUT_MATERIALS: readonly NutMaterial[] = [
  {
    id: 'bronze',
    name: 'tin bronze (C93200 class) on a steel screw',
    allowablePressure: 1600 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/bronze, low end 1600 psi (from memory)',
    pressureBySpeed: STEEL_BRONZE_BY_SPEED,
    allowablePv: 75000 * PV_UNIT,
    allowablePvSource: 'Mott, Machine Elements in Mechanical Design, Table 16-1, leaded tin bronze 75,000 psi*ft/min',
    yieldStrength: 14000 * PSI,
    yieldSource: 'ASTM B584 C93200 minimum yield 14 ksi (97 MPa; tensile 30 ksi minimum) (from memory)',
  },
  {
    id: 'manganese-bronze',
    name: 'manganese bronze (C86200) on a steel screw',
    allowablePressure: 1600 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/bronze, low end 1600 psi (from memory)',
    pressureBySpeed: STEEL_BRONZE_BY_SPEED,
    allowablePv: 150000 * PV_UNIT,
    allowablePvSource: 'Mott, Table 16-1, manganese bronze C86200 150,000 psi*ft/min',
    yieldStrength: 45000 * PSI,
    yieldSource: 'ASTM B584 C86200 minimum yield 45 ksi (310 MPa; tensile 90 ksi minimum) (from memory)',
  },
  {
    id: 'aluminum-bronze',
    name: 'aluminum bronze (C95400) on a steel screw',
    allowablePressure: 1600 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/bronze, low end 1600 psi (from memory)',
    pressureBySpeed: STEEL_BRONZE_BY_SPEED,
    allowablePv: 125000 * PV_UNIT,
    allowablePvSource: 'Mott, Table 16-1, aluminum bronze C95400 125,000 psi*ft/min',
    yieldStrength: 30000 * PSI,
    yieldSource: 'ASTM B148 C95400 minimum yield 30 ksi (207 MPa; tensile 75 ksi minimum), as cast (from memory)',
  },
  {
    id: 'cast-iron',
    name: 'grey cast iron on a steel screw',
    allowablePressure: 1800 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/cast iron, low end 1800 psi (from memory)',
    pressureBySpeed: STEEL_CAST_IRON_BY_SPEED,
    allowablePv: null,
    allowablePvSource: 'no published pV limit held',
    yieldStrength: null,
    yieldSource: 'grey iron has no yield point; stripping judged on the screw only',
  },
  {
    id: 'nylon',
    name: 'nylon (PA 6/6), unfilled',
    allowablePressure: null,
    allowablePressureSource: 'no published pressure held: give nut.allowablePressure from the supplier',
    pressureBySpeed: [],
    allowablePv: 3000 * PV_UNIT,
    allowablePvSource: 'Mott, Table 16-1, nylon 3,000 psi*ft/min',
    yieldStrength: null,
    yieldSource: 'supplier data required',
  },
  {
    id: 'uhmw-pe',
    name: 'UHMW polyethylene',
    allowablePressure: null,
    allowablePressureSource: 'no published pressure held: give nut.allowablePressure from the supplier',
    pressureBySpeed: [],
    allowablePv: 4000 * PV_UNIT,
    allowablePvSource: 'Mott, Table 16-1, UHMW 4,000 psi*ft/min',
    yieldStrength: null,
    yieldSource: 'supplier data required',
  },
];

/**
 * The allowable mean bearing pressure that applies at a rubbing speed: the first step whose speed range covers it.
 * @param points - steps from low to high speed (PressureSpeedPoint)
 * @param rubbingSpeed - rubbing speed at the mean diameter [m/s]; null when no speed is known (the first, lowest-speed step applies)
 * @returns the step that applies, or null when no step covers the speed
 * Source: step reading of Shigley 9th ed. Table 8-4 classes (from memory); never rises with speed when the steps do not.
 */
export function pressureStepAt(points: readonly PressureSpeedPoint[], rubbingSpeed: number | null): PressureSpeedPoint | null {
  if (points.length === 0) return null;
  if (rubbingSpeed === null) return points[0];
  return points.find((p) => p.upToRubbingSpeed === null || rubbingSpeed <= p.upToRubbingSpeed) ?? null;
}

export function findScrewMaterial(id: string): ScrewMaterial | undefined {
  return SCREW_MATERIALS.find((m) => m.id === id);
}

export function findNutMaterial(id: string): NutMaterial | undefined {
  return NUT_MATERIALS.find((m) => m.id === id);
}

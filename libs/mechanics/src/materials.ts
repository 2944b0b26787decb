/**
 * A small library of screw and nut materials. Each value names its source; "from memory" marks values
 * recalled rather than read (shared/reference/friction-and-materials.md, sections 2-4).
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

export const SCREW_MATERIALS: readonly ScrewMaterial[] = [
  { id: 'steel-1018-cd', name: 'AISI 1018 cold drawn', yieldStrength: 370 * MPA, elasticModulus: 207 * GPA, density: 7801, source: `Shigley Table A-20 (Sy, from memory); ${A5}` },
  { id: 'steel-1045-cd', name: 'AISI 1045 cold drawn', yieldStrength: 530 * MPA, elasticModulus: 207 * GPA, density: 7801, source: `Shigley Table A-20 (Sy, from memory); ${A5}` },
  { id: 'steel-1045-hr', name: 'AISI 1045 hot rolled', yieldStrength: 310 * MPA, elasticModulus: 207 * GPA, density: 7801, source: `Shigley Table A-20 (Sy, from memory); ${A5}` },
  { id: 'steel-4140-qt650', name: 'AISI 4140 Q&T 650 C', yieldStrength: 655 * MPA, elasticModulus: 207 * GPA, density: 7801, source: `Shigley Table A-21 (Sy, from memory); ${A5}` },
  { id: 'stainless-304-annealed', name: 'AISI 304 annealed bar', yieldStrength: 205 * MPA, elasticModulus: 190 * GPA, density: 7750, source: `ASTM A276 minimum Sy (from memory); ${A5} (stainless 18-8)` },
];

export interface NutMaterial {
  readonly id: string;
  readonly name: string;
  /** Safe mean bearing pressure on the flanks [Pa]; null where no published value is held */
  readonly allowablePressure: number | null;
  readonly allowablePressureSource: string;
  /** pV limit, velocity taken at the thread mean diameter [Pa*m/s]; null where unknown */
  readonly allowablePv: number | null;
  readonly allowablePvSource: string;
  /** Yield strength for the nut-thread stripping check [Pa]; null where unknown */
  readonly yieldStrength: number | null;
  readonly yieldSource: string;
}

const PSI = 6894.757293168361; // 1 psi in Pa, NIST SP 811 B.8
const PV_UNIT = PSI * 0.00508; // 1 psi*ft/min in Pa*m/s

export const NUT_MATERIALS: readonly NutMaterial[] = [
  {
    id: 'bronze',
    name: 'tin bronze (C93200 class) on a steel screw',
    allowablePressure: 1600 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/bronze, low end 1600 psi (from memory)',
    allowablePv: 75000 * PV_UNIT,
    allowablePvSource: 'Mott, Machine Elements in Mechanical Design, Table 16-1, leaded tin bronze 75,000 psi*ft/min',
    yieldStrength: 125 * MPA,
    yieldSource: 'ASTM B584 C93200 typical yield (from memory)',
  },
  {
    id: 'manganese-bronze',
    name: 'manganese bronze (C86200) on a steel screw',
    allowablePressure: 1600 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/bronze, low end 1600 psi (from memory)',
    allowablePv: 150000 * PV_UNIT,
    allowablePvSource: 'Mott, Table 16-1, manganese bronze C86200 150,000 psi*ft/min',
    yieldStrength: 324 * MPA,
    yieldSource: 'ASTM B584 C86200 minimum yield 47 ksi (from memory)',
  },
  {
    id: 'aluminum-bronze',
    name: 'aluminum bronze (C95400) on a steel screw',
    allowablePressure: 1600 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/bronze, low end 1600 psi (from memory)',
    allowablePv: 125000 * PV_UNIT,
    allowablePvSource: 'Mott, Table 16-1, aluminum bronze C95400 125,000 psi*ft/min',
    yieldStrength: 207 * MPA,
    yieldSource: 'ASTM B148 C95400 minimum yield 30 ksi (from memory)',
  },
  {
    id: 'cast-iron',
    name: 'grey cast iron on a steel screw',
    allowablePressure: 1800 * PSI,
    allowablePressureSource: 'Shigley Table 8-4, screw jack, steel/cast iron, low end 1800 psi (from memory)',
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
    allowablePv: 4000 * PV_UNIT,
    allowablePvSource: 'Mott, Table 16-1, UHMW 4,000 psi*ft/min',
    yieldStrength: null,
    yieldSource: 'supplier data required',
  },
];

export function findScrewMaterial(id: string): ScrewMaterial | undefined {
  return SCREW_MATERIALS.find((m) => m.id === id);
}

export function findNutMaterial(id: string): NutMaterial | undefined {
  return NUT_MATERIALS.find((m) => m.id === id);
}

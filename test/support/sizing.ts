/**
 * Requirement sets for the screw-selection tests (POST /api/v1/sizing). Library values (friction entries, nut and
 * screw materials) carry their sources in libs/mechanics (friction.ts, materials.ts).
 */
import fc from 'fast-check';

/**
 * A published screw-jack design problem: R. S. Khurmi and J. K. Gupta, A Textbook of Machine Design, 14th ed.
 * (S. Chand, 2005), Ch. 17 "Power Screws", the worked screw-jack design (Example 17.17 as we recall its number):
 * "A screw jack is to lift a load of 80 kN through a height of 400 mm. The elastic strength of the screw material in
 * tension and compression is 200 N/mm^2 ... the nut is phosphor bronze, elastic limit 100 N/mm^2 ... the bearing
 * pressure between the nut and the screw is not to exceed 18 N/mm^2" (from memory). Taken over: the load, the lift
 * as the free column (fixed-free), the screw's 200 MPa, the nut's 100 MPa and 18 MPa. Not in the book, our
 * choices: E 210 GPa and 7850 kg/m^3 (common values for steel), the dry steel/bronze friction range of Shigley 9th
 * ed. Table 8-5, a plain collar of 1.6 d, hand operation at 10 rev/min. The book picks a square thread; the search
 * offers trapezoidal and Acme sizes under Leadline's rule set (lifting factor 3 on yield), so its answer is larger.
 * The book's 18 MPa is one nut value used at any speed (engine 1.1); at 10 rev/min the smallest answer (about 95 mm)
 * rubs at about 9 ft/min, within the screw-jack class of Shigley Table 8-4 anyway; the nut's own threads are checked on
 * the book's 100 MPa. The inputs of the lifting checks of rule set 2026.12-3 are our choices too (invented): a nut body of
 * 1.6 d, 1 mm of wear allowed before the nut is replaced, 10,000 lifts, a screw tensile strength of 400 MPa (twice the
 * book's elastic strength) and a nut fatigue strength of 60 MPa.
 */
export const TEXTBOOK_JACK = {
  load: { axial: '80 kN', sense: 'compression' },
  duty: { kind: 'lifting', speed: '10 rpm', brake: false, cycles: 10000 },
  friction: { thread: { entry: 'thread/steel-bronze/dry' }, collar: { entry: 'collar/soft-steel-cast-iron' } },
  collar: { kind: 'plain', meanDiameterRatio: 1.6 },
  nut: { material: 'bronze', allowablePressure: '18 MPa', yieldStrength: '100 MPa', outsideDiameterRatio: 1.6, allowableWear: '1 mm', fatigueStrength: '80 MPa' },
  screw: { yieldStrength: '200 MPa', tensileStrength: '600 MPa', elasticModulus: '210 GPa', density: '7850 kg/m^3', unsupportedLength: '400 mm', ends: 'fixed-free' },
} as const;

/**
 * An invented positioning lead screw: 1 kN in tension at 600 rev/min over 1.5 m between a fixed and a pinned end,
 * oiled bronze nut, rolling thrust bearing (friction 0.0015-0.005: rolling-bearing friction coefficients of the
 * SKF general catalogue, from memory), 6 N*m motor. At 600 rev/min a bronze nut on a 16-30 mm screw rubs at 30-57
 * m/min, in the lead-screw class of Shigley Table 8-4 (150-240 psi, about 1 MPa; engine 1.1), so the load is one a
 * sliding bronze nut carries at that speed: the 3 kN this set had before engine 1.1 needs a screw of 26 mm or more
 * for the nut pressure alone, and no such screw is driven by 6 N*m.
 */
export const LEAD_SCREW = {
  load: { axial: '1 kN', sense: 'tension' },
  duty: { kind: 'positioning', speed: '600 rpm', brake: false },
  friction: {
    thread: { entry: 'thread/steel-bronze/oil' },
    collar: { min: 0.0015, max: 0.005, source: { kind: 'handbook', reference: 'SKF general catalogue, rolling bearing friction coefficients (from memory)' } },
  },
  collar: { kind: 'rolling', meanDiameterRatio: 1.5 },
  nut: { material: 'bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '1.5 m', ends: 'fixed-pinned' },
  drive: { availableTorque: '6 N*m' },
} as const;

/**
 * An invented clamping press: 25 kN compression at 0.3 m/min, dry steel on steel, a fixed annular collar of
 * 60/30 mm (uniform wear), cast-iron nut, 4140 screw pinned at both ends over 300 mm.
 */
export const PRESS = {
  load: { axial: '25 kN', sense: 'compression' },
  duty: { kind: 'clamping', linearSpeed: '0.3 m/min', brake: false },
  friction: { thread: { entry: 'thread/steel-steel/dry' }, collar: { entry: 'collar/soft-steel-cast-iron' } },
  collar: { kind: 'annular', outerDiameter: '60 mm', innerDiameter: '30 mm', model: 'uniform-wear' },
  nut: { material: 'cast-iron' },
  screw: { material: 'steel-4140-qt650', unsupportedLength: '300 mm', ends: 'pinned-pinned' },
} as const;

/** Impossible on purpose: 2 MN over 6 m with one end free. */
export const IMPOSSIBLE = {
  ...TEXTBOOK_JACK,
  load: { axial: '2 MN', sense: 'compression' },
  screw: { material: 'steel-4140-qt650', unsupportedLength: '6 m', ends: 'fixed-free' },
} as const;

const THREAD_FRICTION = ['thread/steel-bronze/dry', 'thread/steel-bronze/oil', 'thread/steel-steel/dry', 'thread/steel-cast-iron/oil'];
const COLLAR_FRICTION = ['collar/soft-steel-bronze', 'collar/hard-steel-bronze', 'collar/soft-steel-cast-iron'];

/** Random but plausible requirements (invented; for property tests only). */
export const requirementsArbitrary = fc.record({
  load: fc.record({ axial: fc.integer({ min: 1, max: 60 }).map((k) => `${k} kN`), sense: fc.constantFrom('compression', 'tension') }),
  duty: fc.record({
    kind: fc.constantFrom('lifting', 'positioning', 'clamping'),
    speed: fc.integer({ min: 5, max: 600 }).map((n) => `${n} rpm`),
    brake: fc.boolean(),
  }),
  friction: fc.record({ thread: fc.constantFrom(...THREAD_FRICTION).map((entry) => ({ entry })), collar: fc.constantFrom(...COLLAR_FRICTION).map((entry) => ({ entry })) }),
  collar: fc.record({ kind: fc.constantFrom('plain', 'rolling'), meanDiameterRatio: fc.constantFrom(1.3, 1.6, 2) }),
  nut: fc.record({ material: fc.constantFrom('bronze', 'manganese-bronze', 'aluminum-bronze'), outsideDiameterRatio: fc.constantFrom(1.5, 2) }),
  screw: fc.record({
    material: fc.constantFrom('steel-1045-cd', 'steel-4140-qt650', 'steel-1018-cd'),
    unsupportedLength: fc.integer({ min: 100, max: 2000 }).map((mm) => `${mm} mm`),
    ends: fc.constantFrom('fixed-free', 'pinned-pinned', 'fixed-pinned', 'fixed-fixed'),
  }),
});

export const OBJECTIVES = ['smallest-diameter', 'lowest-torque', 'highest-efficiency', 'lightest'] as const;


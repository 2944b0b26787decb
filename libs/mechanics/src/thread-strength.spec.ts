/**
 * Engine 1.1 corrections to the thread checks, each against a published source or the source's own formula
 * evaluated here with published table values (never with the engine's numbers):
 * worse root fillet (item 2), short nuts (item 3), stripping shear planes (item 4), the nut's own threads (item 5),
 * the tensile stress area of 60 deg threads (item 7) and speed-rated nut pressure (item 1).
 */
import { parseDesign, type DesignInput } from '@leadline/contracts';
import fc from 'fast-check';
import { evaluate, type Evaluation } from './evaluate';
import { NUT_MATERIALS, pressureStepAt } from './materials';
import { firstThreadLoad, rootVonMises, rootVonMisesWorseFillet } from './mechanics';
import { expectClose } from './test-support';
import { checkProperty } from '../../../test/support/property';

const MPA = 1e6;
const PSI = 6894.757293168361; // NIST SP 811 B.8, lbf/in^2 exactly
const FT_PER_MIN = 0.00508; // m/s, exact
const SHIGLEY = "Shigley's Mechanical Engineering Design, 10th ed., Ex. 8-1";
const single = (f: number) => ({ min: f, max: f, source: { kind: 'handbook' as const, reference: SHIGLEY } });

function run(input: DesignInput): Evaluation {
  const parsed = parseDesign(input);
  if (!parsed.success) throw new Error(`design rejected: ${JSON.stringify(parsed.issues)}`);
  return evaluate(parsed.design);
}

/** Shigley 10th ed., Ex. 8-1: square thread 32 x 4, double start, F = 6.4 kN, f = f_c = 0.08, collar 40 mm. */
function shigley(sense: 'compression' | 'tension', nutLength = '24 mm', axial = '6.4 kN'): DesignInput {
  return {
    thread: { form: 'square', majorDiameter: '32 mm', pitch: '4 mm', starts: 2 },
    load: { axial, sense },
    friction: { thread: single(0.08), collar: single(0.08) },
    collar: { kind: 'plain', meanDiameter: '40 mm' },
    nut: { length: nutLength, material: 'bronze' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '300 mm', ends: 'fixed-free' },
    duty: { kind: 'lifting', brake: true },
  };
}

describe('item 2: root von Mises at the worse fillet', () => {
  it(`${SHIGLEY}(g): in compression the element is the book's, 48.7 MPa (book prints 0.1 MPa)`, () => {
    expectClose(run(shigley('compression')).stresses.firstThread.vonMises, 48.7 * MPA, { rtol: 0, atol: 0.05 * MPA });
  });

  it(`${SHIGLEY}(g) element in tension: sigma_x = +/-41.5, sigma_y = +10.39, tau = 6.07 MPa gives 48.7 MPa at the worse fillet`, () => {
    // Book components (Ex. 8-1(d), (f)) with the axial sign reversed; worse fillet by hand:
    // sqrt(41.5^2 + 10.39^2 + 41.5 x 10.39 + 3 x 6.07^2) = sqrt(2371.9) = 48.70 MPa (the other fillet gives 38.9 MPa)
    expectClose(rootVonMisesWorseFillet(41.5, 10.39, 6.07), 48.70, { rtol: 0, atol: 0.005 });
    expectClose(run(shigley('tension')).stresses.firstThread.vonMises, 48.7 * MPA, { rtol: 0, atol: 0.05 * MPA });
  });

  it('law (fast-check): root von Mises in tension >= in compression for the same |F| (full evaluation)', () => {
    checkProperty(
      fc.property(fc.double({ min: 0.5, max: 60, noNaN: true }), fc.integer({ min: 6, max: 60 }), (kN, nutMm) => {
        const t = run(shigley('tension', `${nutMm} mm`, `${kN} kN`)).stresses.firstThread.vonMises;
        const c = run(shigley('compression', `${nutMm} mm`, `${kN} kN`)).stresses.firstThread.vonMises;
        return t >= c * (1 - 1e-12);
      }),
      { numRuns: 60 },
    );
  });

  it('law (fast-check): the worse fillet is never below either signed element', () => {
    checkProperty(
      fc.property(fc.double({ min: 0, max: 1e9, noNaN: true }), fc.double({ min: -1e9, max: 1e9, noNaN: true }), fc.double({ min: -1e9, max: 1e9, noNaN: true }), (b, s, tau) => {
        const worse = rootVonMisesWorseFillet(b, s, tau);
        return worse >= rootVonMises(b, s, tau) && worse >= rootVonMises(-b, s, tau);
      }), { numRuns: 100 },
    );
  });
});

describe('item 3: short nuts, first-thread share max(0.38 F, F / n_t)', () => {
  it(`${SHIGLEY}(f) with a nut of 2 threads (8 mm): the first thread carries F/2, so root bending 41.5 x 0.5/0.38 = 54.6 MPa`, () => {
    const e = run(shigley('compression', '8 mm'));
    expectClose(e.stresses.firstThread.load, 3200, { rtol: 1e-12 }); // F / 2, statics
    // Book's 41.5 MPa at 0.38 F scales linearly with the thread load (Eq. (8-10)); 54.6 MPa to the book's rounding
    expectClose(e.stresses.firstThread.rootBending, ((41.5 * 0.5) / 0.38) * MPA, { rtol: 0, atol: 0.07 * MPA });
    // bearing, Eq. (8-9) with F_t = 3.2 kN, d_m = 30 mm, h = 2 mm: 3200 / (pi x 30 x 2) = 16.98 MPa
    expectClose(e.stresses.firstThread.bearing, 16.98 * MPA, { rtol: 0, atol: 0.005 * MPA });
  });

  it(`${SHIGLEY}: with 6 engaged threads the book's 0.38 F stands (2432 N)`, () => {
    expectClose(run(shigley('compression')).stresses.firstThread.load, 0.38 * 6400, { rtol: 1e-12 });
  });

  it('the switch lies at 1/0.38 = 2.63 engaged threads (statics)', () => {
    expectClose(firstThreadLoad(1, 1 / 0.38), 0.38, { rtol: 1e-12 });
    expect(firstThreadLoad(1, 2.5)).toBeCloseTo(0.4, 12);
  });

  it('law (fast-check): the first-thread share is never below F / n_t', () => {
    checkProperty(
      fc.property(fc.double({ min: 1, max: 1e6, noNaN: true }), fc.double({ min: 1, max: 40, noNaN: true }), (F, nt) => firstThreadLoad(F, nt) >= F / nt && firstThreadLoad(F, nt) >= 0.38 * F), { numRuns: 100 },
    );
  });
});

/** A 60 deg or trapezoidal design with a nut of exactly 10 threads, to read the stripping stresses. */
function strippingDesign(thread: DesignInput['thread'], pitchMm: number, axial: string): DesignInput {
  return {
    thread,
    load: { axial, sense: 'tension' },
    friction: { thread: single(0.15) },
    collar: { kind: 'none' },
    nut: { length: `${10 * pitchMm} mm`, yieldStrength: '200 MPa', allowablePressure: '10 MPa' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '300 mm', ends: 'fixed-free' },
    duty: { kind: 'positioning', brake: false },
  };
}

describe("item 4: stripping on the standard shear planes (Machinery's Handbook, 'Strength of screw threads', formula from memory)", () => {
  it('M20 (basic): A_s = pi n L_e D1 [1/(2n) + 0.57735 (E - D1)], A_n = pi n L_e d [1/(2n) + 0.57735 (d - E)], with D1 17.294, E 18.376 mm (threads.md Sec. 4, ISO 724)', () => {
    const e = run(strippingDesign({ form: 'iso-metric', size: 'M20' }, 2.5, '50 kN'));
    const P = 2.5;
    const screwPerThread = Math.PI * 17.294 * (P / 2 + 0.57735 * (18.376 - 17.294)); // mm^2 per thread, handbook form
    const nutPerThread = Math.PI * 20 * (P / 2 + 0.57735 * (20 - 18.376));
    expectClose(e.stresses.stripping.screwArea, 10 * screwPerThread * 1e-6, { rtol: 5e-4 }); // table diameters rounded to 0.001 mm
    expectClose(e.stresses.stripping.nutArea, 10 * nutPerThread * 1e-6, { rtol: 5e-4 });
    expectClose(e.stresses.stripping.screw, 50e3 / (10 * screwPerThread * 1e-6), { rtol: 5e-4 });
    expect(e.geometry.nutMinorDiameter).toBeCloseTo(17.294e-3, 6);
  });

  it('Tr 32x6 (ISO 2901: D1 = 26.000, d2 = 29.000 mm, threads.md Sec. 1.2): screw shears at D1 with t = P/2 + (d2 - D1)/2 x 2 tan 15 deg; nut at d', () => {
    const e = run(strippingDesign({ form: 'trapezoidal', size: 'Tr 32x6' }, 6, '80 kN'));
    const tan15 = Math.tan((15 * Math.PI) / 180);
    const screwPerThread = Math.PI * 26 * (3 + ((29 - 26) / 2) * 2 * tan15);
    const nutPerThread = Math.PI * 32 * (3 + ((32 - 29) / 2) * 2 * tan15);
    expectClose(e.stresses.stripping.screwArea, 10 * screwPerThread * 1e-6, { rtol: 1e-9 });
    expectClose(e.stresses.stripping.nutArea, 10 * nutPerThread * 1e-6, { rtol: 1e-9 });
    // the former planes (screw at d3 = 25, nut at D4 = 33, thickness there) were 2.9 % and 10.4 % larger
    const oldScrew = Math.PI * 25 * (3 + 2 * 2 * tan15);
    const oldNut = Math.PI * 33 * (3 + 2 * 2 * tan15);
    expect(oldScrew / screwPerThread).toBeGreaterThan(1.02);
    expect(oldNut / nutPerThread).toBeGreaterThan(1.09);
  });
});

describe("item 5: the nut's own threads (root bending and shear against the nut's yield)", () => {
  it(`${SHIGLEY}, the nut thread: 6 F_t / (pi d p) with d = 32 mm (Eq. (8-10) at the nut's root diameter) = 36.3 MPa; shear 3 F_t / (pi d p) = 18.1 MPa`, () => {
    const e = run(shigley('compression'));
    // F_t = 0.38 x 6400 = 2432 N: 6 x 2432 / (pi x 32 x 4) = 36.29 MPa; 3 x 2432 / (pi x 32 x 4) = 18.14 MPa (computed)
    expectClose(e.stresses.nutThread.rootBending, 36.29 * MPA, { rtol: 0, atol: 0.005 * MPA });
    expectClose(e.stresses.nutThread.rootShear, 18.14 * MPA, { rtol: 0, atol: 0.005 * MPA });
    // tin bronze, ASTM B584 C93200 minimum yield 14 ksi (from memory): factor = lower of S_y / sigma and 0.577 S_y / tau
    const Sy = 14000 * PSI;
    expectClose(e.safetyFactors.nutThreadRoot ?? NaN, Math.min(Sy / (36.29 * MPA), (0.577 * Sy) / (18.14 * MPA)), { rtol: 2e-4 });
  });

  it('a nut without a yield strength has no factor (null), for the rule to judge', () => {
    const input = shigley('compression');
    const e = run({ ...input, nut: { length: '24 mm', material: 'cast-iron' } });
    expect(e.safetyFactors.nutThreadRoot).toBeNull();
  });
});

describe('item 7: tensile stress area beside the minor-diameter section (60 deg threads)', () => {
  it('M20: A_s = 244.79 mm^2 (ISO 898-1 prints 245 to 3 figures; Bickford, 4th ed., 244.79), minor section pi d3^2/4 = 225.2 mm^2', () => {
    const e = run(strippingDesign({ form: 'iso-metric', size: 'M20' }, 2.5, '50 kN'));
    expectClose((e.geometry.tensileStressArea ?? NaN) * 1e6, 244.79, { rtol: 0, atol: 0.005 });
    expectClose(e.geometry.minorDiameterArea * 1e6, (Math.PI / 4) * 16.933 ** 2, { rtol: 1e-4 }); // d3 16.933 mm, threads.md Sec. 4
  });

  it('1/2-13 UNC: A_s = 0.1419 in^2 (Shigley 10th ed. Table 8-2, from memory; threads.md Sec. 5)', () => {
    const e = run(strippingDesign({ form: 'unified', size: '1/2-13 UNC' }, 25.4 / 13, '20 kN'));
    expectClose((e.geometry.tensileStressArea ?? NaN) / 0.0254 ** 2, 0.1419, { rtol: 0, atol: 0.00005 });
  });

  it('other forms report none', () => {
    expect(run(shigley('compression')).geometry.tensileStressArea).toBeNull();
  });
});

describe('item 1: nut bearing pressure against rubbing speed (Shigley 9th ed. Table 8-4 after Rothbart, from memory)', () => {
  /** The example: two-start Tr 40x14 (P7) at 300 rpm with a bronze nut. */
  const trTwoStart = (speed: string | undefined, nut: DesignInput['nut'] = { length: '42 mm', material: 'bronze' }): DesignInput => ({
    thread: { form: 'trapezoidal', majorDiameter: '40 mm', pitch: '7 mm', starts: 2 },
    load: { axial: '16 kN', sense: 'compression' },
    friction: { thread: single(0.1) },
    collar: { kind: 'none' },
    nut,
    screw: { material: 'steel-1045-cd', unsupportedLength: '500 mm', ends: 'fixed-pinned' },
    duty: { kind: 'positioning', brake: false, ...(speed ? { speed } : {}) },
  });

  it('Tr 40x14 (P7) at 300 rpm rubs at about 35 m/min: the lead-screw class applies, 150 psi (1.03 MPa; the low end of 150-240 psi)', () => {
    const e = run(trTwoStart('300 rpm'));
    // v_s = pi d_m n / cos lambda, d_m = 36.5 mm: pi x 0.0365 x 300 / cos(atan(14 / (36.5 pi))) = 34.7 m/min
    expectClose((e.wear.slidingVelocity ?? NaN) * 60, 34.7, { rtol: 0, atol: 0.05 });
    expectClose(e.wear.allowablePressure ?? NaN, 150 * PSI, { rtol: 1e-12 });
    expect(e.wear.allowablePressureClass).toMatch(/lead screw/);
    expect(e.wear.allowablePressureBasis).toBe('speed-rated');
  });

  it('the same nut turned slowly (10 rpm, about 1.2 m/min = 3.8 ft/min) takes the screw-jack class, 1600 psi', () => {
    const e = run(trTwoStart('10 rpm'));
    expectClose(e.wear.allowablePressure ?? NaN, 1600 * PSI, { rtol: 1e-12 });
    expect(e.wear.allowablePressureClass).toMatch(/screw jack/);
  });

  it('at 70 rpm (about 8.1 m/min = 26.6 ft/min) the hoisting-screw class, 800 psi', () => {
    const e = run(trTwoStart('70 rpm'));
    expect((e.wear.slidingVelocity ?? NaN) / FT_PER_MIN).toBeGreaterThan(20);
    expect((e.wear.slidingVelocity ?? NaN) / FT_PER_MIN).toBeLessThan(40);
    expectClose(e.wear.allowablePressure ?? NaN, 800 * PSI, { rtol: 1e-12 });
    expect(e.wear.allowablePressureClass).toMatch(/hoisting screw/);
  });

  it('without an operating speed the lowest-speed class is assumed, and the class says so', () => {
    const e = run(trTwoStart(undefined));
    expectClose(e.wear.allowablePressure ?? NaN, 1600 * PSI, { rtol: 1e-12 });
    expect(e.wear.allowablePressureClass).toMatch(/no operating speed was given/);
  });

  it("a design's own single allowable is used at any speed, and says so", () => {
    const e = run(trTwoStart('300 rpm', { length: '42 mm', material: 'bronze', allowablePressure: '9 MPa' }));
    expect(e.wear.allowablePressure).toBe(9e6);
    expect(e.wear.allowablePressureBasis).toBe('any-speed');
    expect(e.wear.allowablePressureClass).toMatch(/any rubbing speed/);
  });

  it('steel on cast iron above 40 ft/min: Table 8-4 prints no class, so no allowable (the rule must not pass it silently)', () => {
    const e = run(trTwoStart('300 rpm', { length: '42 mm', material: 'cast-iron' }));
    expect(e.wear.allowablePressure).toBeNull();
    expect(e.wear.pressureRatio).toBeNull();
    expect(e.wear.allowablePressureSource).toMatch(/no steel\/cast-iron class above 40 ft\/min/);
  });

  it("law (fast-check): with a design's own valid steps, the allowable the evaluation applies never increases with speed", () => {
    checkProperty(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 1, max: 60 }), { minLength: 1, maxLength: 4 }),
        fc.array(fc.integer({ min: 1, max: 30 }), { minLength: 5, maxLength: 5 }),
        fc.integer({ min: 1, max: 400 }),
        fc.integer({ min: 1, max: 400 }),
        (speeds, pressures, rpmA, rpmB) => {
          const ups = [...speeds].sort((a, b) => a - b);
          const ps = [...pressures].sort((a, b) => b - a); // non-increasing, as the contract requires
          const steps = [...ups.map((v, i) => ({ upToRubbingSpeed: `${v} m/min`, allowablePressure: `${ps[i]} MPa` })), { allowablePressure: `${ps[ups.length]} MPa` }];
          const at = (rpm: number) => run(trTwoStart(`${rpm} rpm`, { length: '42 mm', material: 'bronze', allowablePressureBySpeed: steps })).wear;
          const [slow, fast] = rpmA <= rpmB ? [at(rpmA), at(rpmB)] : [at(rpmB), at(rpmA)];
          return (fast.allowablePressure ?? 0) <= (slow.allowablePressure ?? 0);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('law (fast-check): for every library nut material the allowable never increases with speed', () => {
    checkProperty(
      fc.property(fc.constantFrom(...NUT_MATERIALS), fc.double({ min: 0, max: 5, noNaN: true }), fc.double({ min: 0, max: 5, noNaN: true }), (mat, a, b) => {
        const [slow, fast] = a <= b ? [a, b] : [b, a];
        const at = (v: number) => pressureStepAt(mat.pressureBySpeed, v)?.allowablePressure ?? 0;
        return at(fast) <= at(slow);
      }), { numRuns: 100 },
    );
  });
});

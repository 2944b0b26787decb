/**
 * Tolerance classes: minimum-material diameters against class limits for several sizes, and the
 * checks using them.
 *  - ISO 2903 7H/7e: published limits, open dataset adrianschlatter/threadlib design/TR.csv (after mdmetric.com's
 *    ISO 2903 tables), read at three preferred sizes and one with the file's
 *    ac anomaly. The engine combines its own ISO 2901 basic profile with the class tolerances.
 *  - ASME B1.5 2G/3G/4G: limits computed from the B1.5
 *    formulas as recalled (from memory; no published table could be read), printed to 4 decimals.
 */
import { parseDesign, type DesignInput } from '@leadline/contracts';
import { evaluate } from './evaluate';
import { expectClose } from './test-support';
import { threadGeometry, findThreadSize } from './threads';
import { minimumMaterial } from './tolerances';

const MM = 1e-3;
const IN = 0.0254;

function geometryOf(designation: string) {
  const s = findThreadSize(designation);
  if (!s) throw new Error(designation);
  return threadGeometry({ form: s.form, majorDiameter: s.majorDiameter, pitch: s.pitch, starts: 1 });
}

describe('ISO 2903 7H/7e minimum-material limits against threadlib design/TR.csv (published limits, mm to 3 decimals)', () => {
  // [size, d min, d2 min, d3 min, D1 max, D2 max] as printed
  const rows: ReadonlyArray<readonly [string, number, number, number, number, number]> = [
    ['Tr 40x7', 39.575, 36.02, 31.431, 33.56, 36.975],
    ['Tr 24x5', 23.665, 21.094, 18.019, 19.45, 21.9],
    ['Tr 100x12', 99.4, 93.3, 86.177, 88.8, 94.71],
    ['Tr 12x3', 11.764, 10.191, 8.135, 9.315, 10.8],
  ];
  it.each(rows)('%s', (size, dMin, d2Min, d3Min, D1Max, D2Max) => {
    const mm = minimumMaterial(geometryOf(size), '7H/7e');
    const at = { rtol: 0, atol: 0.0005 * MM }; // printed to 0.001 mm
    expectClose(mm.majorDiameter, dMin * MM, at);
    expectClose(mm.pitchDiameter, d2Min * MM, at);
    expectClose(mm.minorDiameter, d3Min * MM, at);
    expectClose(mm.nutMinorDiameter, D1Max * MM, at);
    expectClose(mm.nutPitchDiameter, D2Max * MM, at);
  });

  it('Tr 22x8: the file prints d3 min 12.924 with ac = 0.25; with ISO 2901 ac = 0.5 the minimum is 0.5 mm lower, 12.424 (threads.md Sec. 7)', () => {
    expectClose(minimumMaterial(geometryOf('Tr 22x8'), '7H/7e').minorDiameter, 12.424 * MM, { rtol: 0, atol: 0.0005 * MM });
  });
});

describe('ASME B1.5 Acme classes (limits computed in threads.md Secs. 2.2, 2.3 from the recalled formulas; 4 decimals, in)', () => {
  // [size, class, PD min or null, minor min]
  const rows: ReadonlyArray<readonly [string, '2G' | '3G' | '4G', number | null, number]> = [
    ['1-5 ACME', '2G', 0.8726, 0.7509],
    ['2-4 ACME', '2G', 1.8402, 1.6948],
    ['1/2-10 ACME', '3G', null, 0.3704],
    ['3/8-12 ACME', '4G', null, 0.2755],
    ['5/8-8 ACME', '3G', null, 0.4693],
  ];
  it.each(rows)('%s class %s', (size, cls, pdMin, minorMin) => {
    const mm = minimumMaterial(geometryOf(size), cls);
    const at = { rtol: 0, atol: 0.00005 * IN };
    if (pdMin !== null) expectClose(mm.pitchDiameter, pdMin * IN, at);
    expectClose(mm.minorDiameter, minorMin * IN, at);
  });

  it('1-5 2G: major min d - 0.05p = 0.9900 in; nut minor max d - p + 0.05p = 0.8100 in (B1.5 as recalled, threads.md Sec. 2.1)', () => {
    const mm = minimumMaterial(geometryOf('1-5 ACME'), '2G');
    expectClose(mm.majorDiameter, 0.99 * IN, { rtol: 1e-12 });
    expectClose(mm.nutMinorDiameter, 0.81 * IN, { rtol: 1e-12 });
    expectClose(mm.engagedHeight, 0.09 * IN, { rtol: 1e-9 }); // (0.99 - 0.81) / 2
  });

  it('without a class the basic profile is used', () => {
    const g = geometryOf('1-5 ACME');
    const mm = minimumMaterial(g, null);
    expect([mm.minorDiameter, mm.pitchDiameter, mm.engagedHeight]).toEqual([g.minorDiameter, g.meanDiameter, g.threadHeight]);
    expect(mm.basis).toMatch(/minimum-material diameters are smaller/);
  });
});

describe('checks at minimum material', () => {
  const jack = (toleranceClass?: string): DesignInput => ({
    thread: { form: 'trapezoidal', size: 'Tr 40x7', ...(toleranceClass ? { toleranceClass } : {}) },
    load: { axial: '20 kN', sense: 'compression' },
    friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { entry: 'collar/hard-steel-bronze' } },
    collar: { kind: 'plain', meanDiameter: '50 mm' },
    nut: { length: '56 mm', material: 'aluminum-bronze' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '600 mm', ends: 'fixed-free' },
    duty: { kind: 'lifting', speed: '20 rpm', brake: false },
  });
  const run = (input: DesignInput) => {
    const r = parseDesign(input);
    if (!r.success) throw new Error(JSON.stringify(r.issues));
    return evaluate(r.design);
  };

  it('Tr 40x7 7H/7e: the screw strips at D1 max 33.56 mm with t = P/2 + (d2 min - D1 max) tan 15 deg (published limits above)', () => {
    const e = run(jack('7H/7e'));
    const t = 3.5 + (36.02 - 33.56) * Math.tan((15 * Math.PI) / 180);
    expectClose(e.stresses.stripping.screwArea, Math.PI * 33.56 * t * 8 * 1e-6, { rtol: 2e-5 }); // 8 engaged threads
    // bearing on the flank overlap (d min - D1 max)/2 = (39.575 - 33.56)/2 = 3.0075 mm instead of 3.5 mm
    expectClose(e.wear.bearingPressure, 20e3 / (Math.PI * 0.0365 * 0.0030075 * 8), { rtol: 2e-5 });
    expect(e.geometry.minorDiameter).toBeCloseTo(0.032, 12); // the contract's basic minor diameter is kept
    expect(e.geometry.minimumMaterial.toleranceClass).toBe('7H/7e');
  });

  it('every strength and wear figure is worse at minimum material than on the basic profile', () => {
    const basic = run(jack());
    const cls = run(jack('7H/7e'));
    expect(cls.stresses.body.vonMises).toBeGreaterThan(basic.stresses.body.vonMises);
    expect(cls.stresses.firstThread.vonMises).toBeGreaterThan(basic.stresses.firstThread.vonMises);
    expect(cls.stresses.stripping.screw).toBeGreaterThan(basic.stresses.stripping.screw);
    expect(cls.stresses.stripping.nut).toBeGreaterThan(basic.stresses.stripping.nut);
    expect(cls.stresses.nutThread.rootBending).toBeGreaterThan(basic.stresses.nutThread.rootBending);
    expect(cls.wear.bearingPressure).toBeGreaterThan(basic.wear.bearingPressure);
  });

  it('the contract refuses a class the form does not hold and an ISO size without tabulated limits', () => {
    const wrongForm = parseDesign({ ...jack(), thread: { form: 'acme', size: '1-5 ACME', toleranceClass: '7H/7e' } });
    expect(wrongForm.success ? [] : wrongForm.issues).toEqual([{ path: 'thread.toleranceClass', message: expect.stringMatching(/"2G", "3G", "4G"/) }]);
    const notTabulated = parseDesign({ ...jack(), thread: { form: 'trapezoidal', majorDiameter: '41 mm', pitch: '7 mm', toleranceClass: '7H/7e' } });
    expect(notTabulated.success ? [] : notTabulated.issues.map((i) => i.path)).toEqual(['thread.toleranceClass']);
    const square = parseDesign({ ...jack(), thread: { form: 'square', majorDiameter: '40 mm', pitch: '8 mm', toleranceClass: '2G' } });
    expect(square.success ? [] : square.issues[0].message).toMatch(/no tolerance class is held for square/);
  });
});

/**
 * Whirl span and ends separate from the column, and fixed ends taken as only partly fixed.
 * Check values computed from Thomson, Theory of Vibration with Applications, frequency factors (
 * Appendix D / Table 9.5-1): d_r = 32 mm, L = 1500 mm, E = 207 GPa, rho = 7850 kg/m^3: pinned-pinned 1720.8 rev/min,
 * fixed-fixed 3900.8 rev/min, fixed-free 613.0 rev/min (printed to 0.1 rev/min).
 */
import { parseDesign, type DesignInput } from '@leadline/contracts';
import fc from 'fast-check';
import { evaluate } from './evaluate';
import { END_CONDITIONS } from './mechanics';
import { expectClose } from './test-support';
import { checkProperty } from '../../../test/support/property';


/** Square thread d = 36 mm, p = 4 mm: d_r = d - p = 32 mm (Shigley 10th ed., Fig. 8-3). Column 600 mm fixed-free. */
function design(screw: Partial<DesignInput['screw']> = {}, speed?: string): DesignInput {
  return {
    thread: { form: 'square', majorDiameter: '36 mm', pitch: '4 mm' },
    load: { axial: '10 kN', sense: 'compression' },
    friction: { thread: { min: 0.1, max: 0.15, source: { kind: 'assumed', reference: 'test' } } },
    collar: { kind: 'none' },
    nut: { length: '40 mm' },
    screw: {
      yieldStrength: '530 MPa', elasticModulus: '207 GPa', density: '7850 kg/m^3',
      unsupportedLength: '600 mm', ends: 'fixed-free', ...screw,
    },
    duty: { kind: 'positioning', brake: false, ...(speed ? { speed } : {}) },
  };
}

function run(input: DesignInput) {
  const parsed = parseDesign(input);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  return evaluate(parsed.design);
}

describe('whirl span and ends (shared reference columns-and-speed.md 3.3)', () => {
  it('the stated whirl span and ends give the classical fixed-fixed first mode 3900.8 rev/min (0.1 rev/min printed)', () => {
    const e = run(design({ whirlSpan: '1500 mm', whirlEnds: 'fixed-fixed' }));
    expect(e.geometry.minorDiameter).toBeCloseTo(0.032, 12);
    expectClose(e.criticalSpeed.rpm, 3900.8, { rtol: 0, atol: 0.05 });
    expect(e.criticalSpeed.span).toBe(1.5);
    expect(e.criticalSpeed.ends).toBe('fixed-fixed');
    expect(e.buckling.endConditionConstant).toBe(0.25); // the column keeps its own ends (fixed-free)
  });

  it('without whirl fields the column length and ends are used: fixed-free 613.0 rev/min at 1500 mm', () => {
    const e = run(design({ unsupportedLength: '1500 mm' }));
    expectClose(e.criticalSpeed.rpm, 613.0, { rtol: 0, atol: 0.05 });
    expect(e.criticalSpeed.span).toBe(1.5);
    expect(e.criticalSpeed.ends).toBe('fixed-free');
  });

  it('fixed-fixed, partly fixed: simply supported over L / sqrt(1.2) = 1.2 x 1720.8 = 2065.0 rev/min (hand arithmetic on 3.3)', () => {
    const e = run(design({ whirlSpan: '1500 mm', whirlEnds: 'fixed-fixed' }, '1950 rpm'));
    const pf = e.criticalSpeed.partlyFixed;
    expect(pf).not.toBeNull();
    expectClose(pf?.rpm ?? NaN, 1.2 * 1720.8, { rtol: 0, atol: 0.06 }); // 1.2 x the 0.05 rounding of 1720.8
    expect(pf?.endConditionConstant).toBe(1.2); // Shigley 9th ed., Table 4-2, recommended
    // factor pi^2 C / (beta_1 L)^2 with (beta_1 L)^2 = 22.3733 (Thomson, Appendix D): 11.8435 / 22.3733 = 0.52936
    expectClose(pf?.factor ?? NaN, 0.52936, { rtol: 2e-5 });
    expectClose(pf?.ratio ?? NaN, 1950 / 2064.96, { rtol: 1e-4 });
    expectClose(e.criticalSpeed.ratio ?? NaN, 1950 / 3900.8, { rtol: 2e-5 });
  });

  it('fixed-pinned partly fixed factor 11.8435 / 15.4182 = 0.76815 (Thomson Table 9.5-1 (beta_1 L)^2)', () => {
    expectClose(run(design({ whirlEnds: 'fixed-pinned' })).criticalSpeed.partlyFixed?.factor ?? NaN, 0.76815, { rtol: 2e-5 });
  });

  it('no partly fixed figure for pinned-pinned ends or on the theoretical basis', () => {
    expect(run(design({ whirlEnds: 'pinned-pinned' })).criticalSpeed.partlyFixed).toBeNull();
    expect(run(design({ whirlEnds: 'fixed-fixed', endConditionBasis: 'theoretical' })).criticalSpeed.partlyFixed).toBeNull();
  });

  it('property: the partly fixed critical speed never exceeds the classical one', () => {
    const fixedEnds = END_CONDITIONS.filter((x) => x.startsWith('fixed'));
    checkProperty(
      fc.property(fc.constantFrom(...fixedEnds), fc.integer({ min: 100, max: 5000 }), (ends, spanMm) => {
        const cs = run(design({ whirlEnds: ends, whirlSpan: `${spanMm} mm` })).criticalSpeed;
        return cs.partlyFixed !== null && cs.partlyFixed.rpm < cs.rpm;
      }),
      { numRuns: 60 },
    );
  });
});

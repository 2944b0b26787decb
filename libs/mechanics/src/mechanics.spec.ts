/**
 * The formula functions one by one: published column and whirl checks, and the laws that must hold for any
 * input (fast-check, modest run counts so that the whole unit suite stays fast).
 */
import fc from 'fast-check';
import * as m from './mechanics';
import { expectClose } from './test-support';
import { checkProperty } from '../../../test/support/property';

const DEG = Math.PI / 180;
const RUNS = { numRuns: 200 };

/** A real power-screw thread in SI: mean diameter, lead, flank angle, friction. */
const screwThread = fc.record({
  F: fc.double({ min: 10, max: 1e6, noNaN: true }),
  dm: fc.double({ min: 0.004, max: 0.25, noNaN: true }),
  // lead as a fraction of pi d_m: lead angles from about 0.6 to 17 deg
  leadRatio: fc.double({ min: 0.01, max: 0.3, noNaN: true }),
  alphaDeg: fc.constantFrom(0, 3, 7, 14.5, 15, 30),
  // friction as engineers give it, to three decimals (also keeps subnormal coefficients out of the laws)
  f: fc.integer({ min: 0, max: 500 }).map((i) => i / 1000),
});

function threadOf(t: { dm: number; leadRatio: number; alphaDeg: number }) {
  const l = t.leadRatio * Math.PI * t.dm;
  const lambda = m.leadAngle(l, t.dm);
  return { l, lambda, alphaN: m.normalFlankAngle(t.alphaDeg * DEG, lambda) };
}

describe('columns: Euler and J. B. Johnson', () => {
  it('computed: (l/k)_1 = sqrt(2 pi^2 C E / Sy) (Shigley 9th ed., Sec. 4-13, Eq. (4-45)) for E = 207 GPa, Sy = 500 MPa, C = 1 is 90.4', () => {
    // hand arithmetic: sqrt(2 x 9.8696 x 207e9 / 500e6) = sqrt(8171.99) = 90.40; the same figure is recalled from the chapter's
    // column examples (from memory; edition's example number not recorded), so it is marked computed. Tolerance: 0.05
    expectClose(m.transitionSlenderness(1, 207e9, 500e6), 90.4, { rtol: 0, atol: 0.05 });
  });

  describe('computed, shared reference data (columns-and-speed.md §2.1), formula shown: Tr 40x7 root d_r = 32 mm, l = 1500 mm, E = 207 GPa, Sy = 370 MPa', () => {
    // (l/k)_1 = sqrt(2 pi^2 C E / Sy); Euler P/A = C pi^2 E / (l/k)^2; Johnson P/A = Sy - (Sy (l/k) / (2 pi))^2 / (C E).
    // The reference prints (l/k)_1 and P/A to 3 decimals (MPa) and P to 1 N: tolerances are half those units.
    const dr = 0.032;
    const area = (Math.PI * dr * dr) / 4;
    const k = dr / 4;
    const rows: ReadonlyArray<readonly [number, number, number, 'euler' | 'johnson', number, number]> = [
      // C, l [m], (l/k)_1, regime, P_cr/A [MPa], P_cr [N]
      [0.25, 1.5, 52.544, 'euler', 14.528, 11684],
      [1, 1.5, 105.087, 'euler', 58.112, 46737],
      [1.2, 1.5, 115.117, 'euler', 69.735, 56084],
      [2, 1.5, 148.616, 'euler', 116.224, 93473],
      [4, 1.5, 210.174, 'johnson', 222.763, 179157],
      [1, 0.5, 105.087, 'johnson', 304.561, 244943],
    ];
    it.each(rows)('C = %s, l = %s m: (l/k)_1 = %s, %s, P_cr/A = %s MPa, P_cr = %s N', (C, l, transition, regime, stress, load) => {
      const E = 207e9;
      const Sy = 370e6;
      const slenderness = l / k;
      const s1 = m.transitionSlenderness(C, E, Sy);
      expectClose(s1, transition, { rtol: 0, atol: 0.0005 });
      expect(slenderness >= s1 ? 'euler' : 'johnson').toBe(regime);
      const Pcr = regime === 'euler' ? m.eulerCriticalLoad(C, E, area, slenderness) : m.johnsonCriticalLoad(C, E, Sy, area, slenderness);
      expectClose(Pcr / area / 1e6, stress, { rtol: 0, atol: 0.0005 });
      expectClose(Pcr, load, { rtol: 0, atol: 0.5 });
    });
  });

  it('end-condition constants of Shigley 9th ed., Table 4-2 (public source, read: columns-and-speed.md §1)', () => {
    expect(m.END_CONDITION_CONSTANT.theoretical).toEqual({ 'fixed-free': 0.25, 'pinned-pinned': 1, 'fixed-pinned': 2, 'fixed-fixed': 4 });
    expect(m.END_CONDITION_CONSTANT.recommended).toEqual({ 'fixed-free': 0.25, 'pinned-pinned': 1, 'fixed-pinned': 1.2, 'fixed-fixed': 1.2 });
  });

  it('law: Euler and Johnson meet at the transition slenderness, both giving Sy/2 x A, and Johnson lies below Euler short of it', () => {
    checkProperty(
      fc.property(
        fc.constantFrom(0.25, 1, 1.2, 2, 4),
        fc.double({ min: 50e9, max: 250e9, noNaN: true }),
        fc.double({ min: 100e6, max: 1500e6, noNaN: true }),
        fc.double({ min: 1e-5, max: 1e-1, noNaN: true }),
        fc.double({ min: 0.05, max: 0.999, noNaN: true }),
        (C, E, Sy, A, fraction) => {
          const s1 = m.transitionSlenderness(C, E, Sy);
          expectClose(m.eulerCriticalLoad(C, E, A, s1), (Sy / 2) * A, { rtol: 1e-12 });
          expectClose(m.johnsonCriticalLoad(C, E, Sy, A, s1), (Sy / 2) * A, { rtol: 1e-12 });
          const s = fraction * s1;
          expect(m.johnsonCriticalLoad(C, E, Sy, A, s)).toBeLessThan(m.eulerCriticalLoad(C, E, A, s));
        },
      ),
      RUNS,
    );
  });
});

describe('critical (whirl) speed', () => {
  it('frequency factors beta_1 L: Thomson, Theory of Vibration with Applications, App. D and Table 9.5-1 (public source via columns-and-speed.md §3.2)', () => {
    // Thomson prints 4 decimals (1.8751, 4.7300); the reference's computed roots are 6 decimals
    expectClose(m.WHIRL_FREQUENCY_FACTOR['fixed-free'], 1.8751, { rtol: 0, atol: 0.00005 });
    expectClose(m.WHIRL_FREQUENCY_FACTOR['pinned-pinned'], Math.PI, { rtol: 1e-15 });
    expectClose(m.WHIRL_FREQUENCY_FACTOR['fixed-pinned'], 3.926602, { rtol: 0, atol: 0.0000005 });
    expectClose(m.WHIRL_FREQUENCY_FACTOR['fixed-fixed'], 4.73, { rtol: 0, atol: 0.00005 });
  });

  describe('computed, shared reference data (columns-and-speed.md §3.3), formula shown: d_r = 32 mm, L = 1500 mm, E = 207 GPa, rho = 7850 kg/m^3', () => {
    // n_c = (beta_1 L)^2 (60 / (8 pi)) (d_r / L^2) sqrt(E / rho); printed to 0.1 rpm
    it.each([
      ['fixed-free', 613.0],
      ['pinned-pinned', 1720.8],
      ['fixed-pinned', 2688.2],
      ['fixed-fixed', 3900.8],
    ] as const)('%s: n_c = %s rpm', (ends, rpm) => {
      expectClose(m.criticalSpeedRpm(m.WHIRL_FREQUENCY_FACTOR[ends], 0.032, 1.5, 207e9, 7850), rpm, { rtol: 0, atol: 0.05 });
    });
  });

  it.each([
    // computed, shared reference data (columns-and-speed.md §3.1): pinned-pinned constant K in n_c = K d_r / L^2 (d, L in mm), 5 figures
    [207e9, 7850, 1.2099e8],
    [207e9, 7800, 1.2138e8],
    [190e9, 7750, 1.1666e8],
  ])('pinned-pinned constant for E = %s Pa, rho = %s kg/m^3 is %s rpm mm (reference §3.1, computed)', (E, rho, K) => {
    const dMm = 20;
    const LMm = 1000;
    const rpm = m.criticalSpeedRpm(Math.PI, dMm / 1000, LMm / 1000, E, rho);
    expectClose((rpm * LMm ** 2) / dMm, K, { rtol: 0, atol: 0.00005e8 });
  });
});

describe('torque laws (Shigley 10th ed., Eqs. (8-1), (8-2), (8-4); Juvinall & Marshek 5th ed., Eqs. (10.4)-(10.6), numbers from memory)', () => {
  it('law: with zero friction the thread is 100 % efficient (F l / (2 pi T_R) = 1), whatever the flank angle', () => {
    checkProperty(
      fc.property(screwThread, (t) => {
        const { l, alphaN } = threadOf(t);
        expectClose(m.efficiency(t.F, l, m.raiseTorque(t.F, t.dm, l, 0, alphaN)), 1, { rtol: 1e-12 });
        expectClose(m.raiseTorqueSecAlpha(t.F, t.dm, l, 0, t.alphaDeg * DEG), m.raiseTorque(t.F, t.dm, l, 0, alphaN), { rtol: 1e-12 });
      }),
      RUNS,
    );
  });

  it('law: raise torque exceeds lowering torque, and friction only lowers efficiency', () => {
    checkProperty(
      fc.property(screwThread, fc.double({ min: 0.001, max: 0.2, noNaN: true }), (t, df) => {
        const { l, alphaN } = threadOf(t);
        const raise = m.raiseTorque(t.F, t.dm, l, t.f, alphaN);
        expect(raise).toBeGreaterThan(m.lowerTorque(t.F, t.dm, l, t.f, alphaN));
        expect(raise).toBeGreaterThan(0);
        const moreFriction = m.raiseTorque(t.F, t.dm, l, t.f + df, alphaN);
        expect(m.efficiency(t.F, l, moreFriction)).toBeLessThan(m.efficiency(t.F, l, raise));
      }),
      RUNS,
    );
  });

  it('law: the self-locking boundary lies exactly at f = cos(alpha_n) tan(lambda): margin 1 and no lowering torque there; locks just above, not just below', () => {
    checkProperty(
      fc.property(screwThread, (t) => {
        const { l, lambda, alphaN } = threadOf(t);
        const boundary = Math.cos(alphaN) * Math.tan(lambda);
        expectClose(m.selfLockingMargin(boundary, lambda, alphaN), 1, { rtol: 1e-12 });
        // lowering torque vanishes at the boundary, relative to the torque scale F d_m
        expectClose(m.lowerTorque(t.F, t.dm, l, boundary, alphaN), 0, { rtol: 0, atol: 1e-12 * t.F * t.dm });
        const above = boundary * (1 + 1e-6);
        const below = boundary * (1 - 1e-6);
        expect(m.selfLockingMargin(above, lambda, alphaN)).toBeGreaterThan(1);
        expect(m.lowerTorque(t.F, t.dm, l, above, alphaN)).toBeGreaterThan(0); // must be driven down: holds by itself
        expect(m.selfLockingMargin(below, lambda, alphaN)).toBeLessThan(1);
        expect(m.lowerTorque(t.F, t.dm, l, below, alphaN)).toBeLessThan(0); // back-drives
      }),
      RUNS,
    );
  });

  it('law: an Acme (normal-plane) formula with alpha = 0 is the square-thread formula of Shigley 10th ed., Eqs. (8-1) and (8-2)', () => {
    checkProperty(
      fc.property(screwThread, (t) => {
        const l = t.leadRatio * Math.PI * t.dm;
        const lambda = m.leadAngle(l, t.dm);
        const alphaN = m.normalFlankAngle(0, lambda);
        expect(alphaN).toBe(0);
        const { F, dm, f } = t;
        const squareRaise = ((F * dm) / 2) * ((l + Math.PI * f * dm) / (Math.PI * dm - f * l)); // Eq. (8-1)
        const squareLower = ((F * dm) / 2) * ((Math.PI * f * dm - l) / (Math.PI * dm + f * l)); // Eq. (8-2)
        expectClose(m.raiseTorque(F, dm, l, f, alphaN), squareRaise, { rtol: 1e-12 });
        expectClose(m.lowerTorque(F, dm, l, f, alphaN), squareLower, { rtol: 1e-12, atol: 1e-12 * F * dm });
        expectClose(m.raiseTorqueSecAlpha(F, dm, l, f, 0), squareRaise, { rtol: 1e-12 });
        expectClose(m.selfLockingMargin(f, lambda, 0), (f * Math.PI * dm) / l, { rtol: 1e-12, atol: 1e-300 }); // Eq. (8-3): pi f d_m > l
      }),
      RUNS,
    );
  });

  it('law: torques are linear in the load (thread, collar, both collar models)', () => {
    checkProperty(
      fc.property(screwThread, fc.double({ min: 0.01, max: 100, noNaN: true }), (t, k) => {
        const { l, alphaN } = threadOf(t);
        const { F, dm, f } = t;
        expectClose(m.raiseTorque(k * F, dm, l, f, alphaN), k * m.raiseTorque(F, dm, l, f, alphaN), { rtol: 1e-12 });
        expectClose(m.lowerTorque(k * F, dm, l, f, alphaN), k * m.lowerTorque(F, dm, l, f, alphaN), { rtol: 1e-12, atol: 1e-12 * k * F * dm });
        expectClose(m.collarTorqueMeanDiameter(k * F, f, 2 * dm), k * m.collarTorqueMeanDiameter(F, f, 2 * dm), { rtol: 1e-12 });
        expectClose(m.collarTorqueUniformWear(k * F, f, 2 * dm, dm), k * m.collarTorqueUniformWear(F, f, 2 * dm, dm), { rtol: 1e-12 });
        expectClose(m.collarTorqueUniformPressure(k * F, f, 2 * dm, dm), k * m.collarTorqueUniformPressure(F, f, 2 * dm, dm), { rtol: 1e-12 });
      }),
      RUNS,
    );
  });

  it('law: a new collar (uniform pressure) needs more torque than a worn one (uniform wear), Shigley 10th ed., Sec. 16-4; both tend to F f_c d/2 as the annulus narrows', () => {
    checkProperty(
      fc.property(
        fc.double({ min: 10, max: 1e6, noNaN: true }),
        fc.double({ min: 0.01, max: 0.5, noNaN: true }),
        fc.double({ min: 0.01, max: 0.3, noNaN: true }),
        fc.double({ min: 0.05, max: 0.95, noNaN: true }),
        (F, fc_, Do, ratio) => {
          const Di = ratio * Do;
          expect(m.collarTorqueUniformPressure(F, fc_, Do, Di)).toBeGreaterThan(m.collarTorqueUniformWear(F, fc_, Do, Di));
          const narrow = Do * (1 - 1e-6);
          expectClose(m.collarTorqueUniformPressure(F, fc_, Do, narrow), m.collarTorqueMeanDiameter(F, fc_, (Do + narrow) / 2), { rtol: 1e-6 });
        },
      ),
      RUNS,
    );
  });
});

describe('thread-root stresses', () => {
  it('law: the generalized cantilever (arm a, root thickness b) reduces to Shigley 10th ed., Eqs. (8-10) and (8-11) for a square thread (a = p/4, b = p/2)', () => {
    checkProperty(
      fc.property(fc.double({ min: 1, max: 1e6, noNaN: true }), fc.double({ min: 0.005, max: 0.2, noNaN: true }), fc.double({ min: 0.02, max: 0.25, noNaN: true }), (Ft, d, pRatio) => {
        const p = pRatio * d;
        const dr = d - p;
        expectClose(m.threadRootBending(Ft, dr, p / 4, p / 2), (6 * Ft) / (Math.PI * dr * p), { rtol: 1e-12 });
        expectClose(m.threadRootShear(Ft, dr, p / 2), (3 * Ft) / (Math.PI * dr * p), { rtol: 1e-12 });
        expectClose(m.threadBearingStress(Ft, d - p / 2, p / 2), (2 * Ft) / (Math.PI * (d - p / 2) * p), { rtol: 1e-12 }); // Eq. (8-9), n_t = 1
      }),
      RUNS,
    );
  });

  it('root von Mises with no bending is the body von Mises (Shigley 10th ed., Eqs. (5-14), (5-15))', () => {
    expectClose(m.rootVonMises(0, -10e6, 6e6), m.vonMisesAxialTorsion(-10e6, 6e6), { rtol: 1e-15 });
    expectClose(m.vonMisesAxialTorsion(0, 1), Math.sqrt(3), { rtol: 1e-15 });
  });
});

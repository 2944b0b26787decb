/**
 * Brake and back-driving: holding torque with thread friction lost, at minimum friction, and the
 * reverse efficiency, checked against Shigley's worked example and the square-thread closed form; the law that losing
 * friction never lowers the holding torque as a seeded property test.
 */
import { parseDesign, type DesignInput } from '@leadline/contracts';
import fc from 'fast-check';
import { holdingTorqueAtFriction, holdingTorqueNoFriction, reverseEfficiency } from './brake';
import { evaluate } from './evaluate';
import { normalFlankAngle } from './mechanics';
import { expectClose } from './test-support';
import { checkProperty } from '../../../test/support/property';

/** Runs a property with the run's seed (test/support/property.ts prints it with any failure). */
const check = <T>(prop: fc.IProperty<T>, numRuns = 300): void => checkProperty(prop, { numRuns });

const single = (f: number, reference: string) => ({ min: f, max: f, source: { kind: 'handbook' as const, reference } });

describe("Budynas & Nisbett, Shigley's Mechanical Engineering Design, 10th ed., Ex. 8-1 (book values from memory)", () => {
  // Square thread d = 32 mm, p = 4 mm, two starts (l = 8 mm), f = 0.08, F = 6.4 kN; the book's thread lowering
  // torque is T_L = -0.466 N*m (printed to 0.001 N*m), i.e. the load back-drives the screw.
  const SHIGLEY = "Shigley's Mechanical Engineering Design, 10th ed., Ex. 8-1";
  const input: DesignInput = {
    thread: { form: 'square', majorDiameter: '32 mm', pitch: '4 mm', starts: 2 },
    load: { axial: '6.4 kN', sense: 'compression' },
    friction: { thread: single(0.08, SHIGLEY), collar: single(0.08, SHIGLEY) },
    collar: { kind: 'plain', meanDiameter: '40 mm' },
    nut: { length: '24 mm' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '300 mm', ends: 'fixed-free' },
    duty: { kind: 'lifting', brake: true },
  };
  const parsed = parseDesign(input);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  const e = evaluate(parsed.design);

  it('holding torque at minimum friction = -T_L = 0.466 N*m (book prints 0.001 N*m)', () => {
    expectClose(e.brake.holdingTorqueMinFriction, 0.466, { rtol: 0, atol: 0.0005 });
  });

  it('holding torque with friction lost: F l / (2 pi) = 6400 x 0.008 / (2 pi) = 8.149 N*m (computed by hand)', () => {
    expectClose(e.brake.holdingTorqueNoFriction, 8.1487, { rtol: 1e-4 });
    expect(e.brake.requiredTorque).toBe(e.brake.holdingTorqueNoFriction); // brake on the screw by default (wiring)
    expect(e.brake.ratedTorque).toBeNull();
    expect(e.brake.ratio).toBeNull();
  });

  it("reverse efficiency e' = 2 pi x 0.466 / (6400 x 0.008) = 0.0572 from the book's lowering torque (rounding of 0.466 -> 0.11 %)", () => {
    expectClose(e.brake.reverseEfficiency, (2 * Math.PI * 0.466) / (6400 * 0.008), { rtol: 0.0011 });
  });

  it('the trace names the formulas (wiring)', () => {
    expect(e.trace['brake.holdingTorqueNoFriction'].formula).toBe('brake-holding-torque-no-friction');
    expect(e.trace['brake.holdingTorqueMinFriction'].formula).toBe('brake-holding-torque-min-friction');
    expect(e.trace['brake.reverseEfficiency'].formula).toBe('reverse-efficiency');
  });
});

describe('square-thread closed form (from memory): reverse efficiency tan(lambda - phi) / tan(lambda), tan phi = f', () => {
  it.each([
    [0.01, 0.02, 0.05],
    [0.05, 0.03, 0.1],
    [0.1, 0.008, 0.08],
  ])('d_m = %p m, l = %p m, f = %p', (dm, l, f) => {
    const lambda = Math.atan(l / (Math.PI * dm));
    const phi = Math.atan(f);
    expectClose(reverseEfficiency(1000, dm, l, f, 0), Math.tan(lambda - phi) / Math.tan(lambda), { rtol: 1e-12, atol: 1e-15 });
  });

  it('f = 0 gives the ideal screw: e = 1 and -T_L = F l / (2 pi)', () => {
    expectClose(reverseEfficiency(5000, 0.03, 0.006, 0, 0.25), 1, { rtol: 1e-12 });
    expectClose(holdingTorqueAtFriction(5000, 0.03, 0.006, 0, 0.25), (5000 * 0.006) / (2 * Math.PI), { rtol: 1e-12 });
  });

  it('a self-locking thread needs no holding torque at that friction (clamped at 0)', () => {
    // Tr 40x7 (d_m 36.5 mm, l 7 mm) at f = 0.15: lambda = 3.49 deg, far below the friction angle 8.5 deg
    expect(holdingTorqueAtFriction(20000, 0.0365, 0.007, 0.15, 0.26)).toBe(0);
    expect(reverseEfficiency(20000, 0.0365, 0.007, 0.15, 0.26)).toBeLessThan(0);
  });
});

describe('property: brake holding torque at f -> 0 >= at minimum friction', () => {
  it('for any load, geometry, friction and flank angle', () => {
    check(
      fc.property(
        fc.double({ min: 1, max: 1e7, noNaN: true }),
        fc.double({ min: 0.002, max: 0.3, noNaN: true }),
        fc.double({ min: 0.05, max: 2, noNaN: true }), // lead as a fraction of the mean diameter
        fc.double({ min: 0, max: 0.5, noNaN: true }),
        fc.constantFrom(0, 3, 7, 14.5, 15, 29 / 2, 30), // flank angles of square, buttress, Acme, trapezoidal, 60 deg forms
        (F, dm, leadRatio, f, alphaDeg) => {
          const l = leadRatio * dm;
          const alphaN = normalFlankAngle((alphaDeg * Math.PI) / 180, Math.atan(l / (Math.PI * dm)));
          const t0 = holdingTorqueNoFriction(F, l);
          const tf = holdingTorqueAtFriction(F, dm, l, f, alphaN);
          return tf >= 0 && t0 >= tf * (1 - 1e-12);
        },
      ),
    );
  });

  it('through the whole engine, for several thread forms', () => {
    const forms = [
      { form: 'square', majorDiameter: '32 mm', pitch: '4 mm' },
      { form: 'acme', size: '1-1/4-5 ACME' },
      { form: 'trapezoidal', size: 'Tr 40x7' },
      { form: 'iso-metric', size: 'M20' },
    ] as const;
    check(
      fc.property(fc.constantFrom(...forms), fc.integer({ min: 1, max: 4 }), fc.double({ min: 0.01, max: 0.3, noNaN: true }), (thread, starts, fMin) => {
        const parsed = parseDesign({
          thread: { ...thread, starts },
          load: { axial: '10 kN', sense: 'compression' },
          friction: { thread: { min: fMin, max: Math.min(1, fMin * 1.5), source: { kind: 'assumed', reference: 'property test' } } },
          collar: { kind: 'none' },
          nut: { length: '60 mm' },
          screw: { material: 'steel-1045-cd', unsupportedLength: '300 mm', ends: 'pinned-pinned' },
          duty: { kind: 'lifting', brake: true },
        });
        if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
        const b = evaluate(parsed.design).brake;
        return b.holdingTorqueNoFriction >= b.holdingTorqueMinFriction && b.reverseEfficiency <= 1;
      }),
      100,
    );
  });
});

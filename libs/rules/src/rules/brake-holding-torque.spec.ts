/**
 * brake-holding-torque: real engine evaluations of the invented jack and fast axis, at, just above
 * and just below the factor; the missing-torque warning on lifting duty; absent from rule set 2026.12-1.
 * T_0 expected values are computed by hand from F l / (2 pi) (Shigley 10th ed., Eq. (8-4) with e = 1).
 */
import { RULE_SET_2026_12_1, RULE_SET_2026_12_2, RULE_SET_2026_12_3 } from '../rule-set';
import { contextOf, evaluated, FAST_AXIS_INPUT, JACK_INPUT, JUST, withDuty } from '../testing/designs';
import { brakeHoldingTorque } from './brake-holding-torque.rule';

// Fast axis: F = 5 kN, lead 10 mm -> T_0 = 5000 x 0.010 / (2 pi) = 7.9577 N*m (computed by hand)
const T0_FAST = (5000 * 0.01) / (2 * Math.PI);
const FACTOR = 2; // pinned below in this file: the 2026.12-2 default

describe('brake-holding-torque', () => {
  it('rule set 2026.12-2 carries the factor 2 (common practice, basis in rule-set.ts); 2026.12-1 has no brake group', () => {
    expect(RULE_SET_2026_12_2.thresholds.brake?.minHoldingFactor).toBe(FACTOR);
    expect(RULE_SET_2026_12_1.thresholds.brake).toBeUndefined();
  });

  it('a lifting design with a brake but no stated torque warns and names the field and the torque needed', () => {
    const e = evaluated(withDuty(FAST_AXIS_INPUT, { brake: true }));
    const f = brakeHoldingTorque(contextOf(e));
    expect(f?.severity).toBe('warning');
    expect(f?.subject).toBe('design.duty.brakeTorque');
    expect(f?.message).toMatch(/duty\.brakeTorque/);
    expect(f?.message).toMatch(/15\.9 N·m/); // 2 x 7.9577 = 15.92 N*m
  });

  it('the same on positioning duty is information only', () => {
    const e = evaluated(withDuty(FAST_AXIS_INPUT, { brake: true, kind: 'positioning' }));
    expect(brakeHoldingTorque(contextOf(e))?.severity).toBe('info');
  });

  it('no brake fitted: no finding (the self-locking rule speaks)', () => {
    expect(brakeHoldingTorque(contextOf(evaluated(FAST_AXIS_INPUT)))).toBeNull();
  });

  it.each([
    ['just above the factor', JUST.above(FACTOR * T0_FAST), null],
    ['at the factor', FACTOR * T0_FAST * (1 + 1e-9), null],
    ['just below the factor', JUST.below(FACTOR * T0_FAST), 'blocking'],
    ['at T_0 itself', T0_FAST, 'blocking'],
  ])('lifting, rated torque %s: %s', (_label, rated, severity) => {
    const e = evaluated(withDuty(FAST_AXIS_INPUT, { brake: true, brakeTorque: `${rated} N*m` }));
    expect(e.evaluation.brake.requiredTorque).toBeCloseTo(T0_FAST, 9);
    const f = brakeHoldingTorque(contextOf(e));
    expect(f?.severity ?? null).toBe(severity);
    if (f) {
      expect(f.subject).toBe('brake.ratio');
      expect(f.limit).toBe(FACTOR);
      expect(f.measured as number).toBeCloseTo(rated / T0_FAST, 9);
    }
  });

  it('too weak a brake on positioning duty warns instead of blocking', () => {
    const e = evaluated(withDuty(FAST_AXIS_INPUT, { brake: true, kind: 'positioning', brakeTorque: '10 N*m' }));
    expect(brakeHoldingTorque(contextOf(e))?.severity).toBe('warning');
  });

  it('a brake on the motor is checked at the motor: T_0 / i, the gearbox reverse efficiency not credited (engine 1.2)', () => {
    // Jack: F = 20 kN, lead 7 mm -> T_0 = 20000 x 0.007 / (2 pi) = 22.282 N*m (Shigley 10th ed., Eq. (8-4) with e = 1);
    // gearbox i = 10 -> 2.2282 N*m at the motor whatever its reverse efficiency (hand arithmetic)
    const input = withDuty(
      { ...JACK_INPUT, drive: { availableTorque: '20 N*m', gearbox: { ratio: 10, efficiency: 0.9, reverseEfficiency: 0.5 } } },
      { brake: true, brakeTorque: '4 N*m', brakeLocation: 'motor' },
    );
    const e = evaluated(input);
    expect(e.evaluation.brake.requiredTorque).toBeCloseTo((20000 * 0.007) / (2 * Math.PI) / 10, 9);
    const f = brakeHoldingTorque(contextOf(e));
    expect(f?.severity).toBe('blocking'); // 4 / 2.2282 = 1.80 < 2
    expect(f?.message).toMatch(/at the motor shaft/);
    expect(brakeHoldingTorque(contextOf(evaluated(withDuty(input, { brakeTorque: '4.6 N*m' }))))).toBeNull(); // 2.06 >= 2
  });

  it('the recalculation case: 2-start Tr 30x6 lifting 8 kN through 10:1 (reverse efficiency 0.6), 3 N*m motor brake holds 1.96 times: blocked under the default', () => {
    // T_0 = 8000 x 0.012 / (2 pi) = 15.2789 N*m (Shigley 10th ed., Eq. (8-4) with e = 1); at the motor / 10 = 1.52789 N*m;
    // 3 / 1.52789 = 1.9635 (hand arithmetic), below the factor 2 (crediting eta_r = 0.6 gave 3.27 and passed)
    const input = withDuty(
      {
        ...JACK_INPUT, thread: { form: 'trapezoidal', size: 'Tr 30x6', starts: 2 }, load: { axial: '8 kN', sense: 'compression' },
        drive: { availableTorque: '20 N*m', gearbox: { ratio: 10, efficiency: 0.9, reverseEfficiency: 0.6 } },
      },
      { brake: true, brakeTorque: '3 N*m', brakeLocation: 'motor', speed: '100 rpm' },
    );
    for (const rs of [RULE_SET_2026_12_2, RULE_SET_2026_12_3]) {
      const f = brakeHoldingTorque(contextOf(evaluated(input), rs.thresholds));
      expect(f?.severity).toBe('blocking');
      expect(f?.measured as number).toBeCloseTo(1.9635, 4);
    }
  });

  it('is not run under rule set 2026.12-1 (old revisions keep being judged as before)', () => {
    const e = evaluated(withDuty(FAST_AXIS_INPUT, { brake: true }));
    expect(brakeHoldingTorque(contextOf(e, RULE_SET_2026_12_1.thresholds))).toBeNull();
  });
});

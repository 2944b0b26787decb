/**
 * drive-torque-margin judges the peak torque at the motor, not the steady torque.
 * Real engine: the jack of testing/designs.ts (Tr 40x7, 20 kN, 60 rev/min) with a fast start and a gearbox.
 */
import { RULE_SET_2026_12_2 } from '../rule-set';
import { contextOf, evaluated, JACK_INPUT } from '../testing/designs';
import { driveTorqueMargin } from './drive-torque-margin.rule';

describe('drive-torque-margin uses the peak torque', () => {
  const { minMargin } = RULE_SET_2026_12_2.thresholds.drive;

  it('a drive that covers the steady torque by the margin but not the peak blocks, and the message names the peak', () => {
    const steady = evaluated(JACK_INPUT).evaluation.torque.raise.atMaxFriction;
    // 1.5 ms to 60 rev/min: alpha = 2 pi / 0.0015 = 4189 rad/s^2, enough to add more than the 25 % reserve
    const e = evaluated({ ...JACK_INPUT, drive: { availableTorque: `${1.3 * steady} N*m`, accelerationTime: '1.5 ms' } });
    const d = e.evaluation.drive;
    expect(d?.steadyTorque).toBe(steady);
    expect((d?.accelerationTorque ?? 0) / steady).toBeGreaterThan(0.1);
    expect(1.3).toBeGreaterThan(minMargin); // the steady torque alone would pass
    const f = driveTorqueMargin(contextOf(e));
    expect(f?.severity).toBe('blocking');
    expect(f?.measured).toBe(d?.margin);
    expect(f?.message).toMatch(/peak torque .* at the motor/);
    expect(f?.message).toMatch(/acceleration torque/);
  });

  it('through a gearbox the motor torque is compared: 10:1 at 90 % lets a small motor pass', () => {
    const e = evaluated({ ...JACK_INPUT, drive: { availableTorque: '20 N*m', gearbox: { ratio: 10, efficiency: 0.9, reverseEfficiency: 0.5 } } });
    const d = e.evaluation.drive;
    expect(d?.requiredTorque).toBeCloseTo((d?.peakTorque ?? NaN) / 9, 12);
    const expected = 20 / ((d?.peakTorque ?? NaN) / 9);
    expect(d?.margin).toBeCloseTo(expected, 12);
    const f = driveTorqueMargin(contextOf(e));
    if (expected >= RULE_SET_2026_12_2.thresholds.drive.warnMargin) expect(f).toBeNull();
    else expect(f?.message).toMatch(/gearbox/);
  });
});

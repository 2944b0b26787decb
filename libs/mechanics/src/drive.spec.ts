/**
 * Drive sizing: inertia, acceleration torque, peak torque at the motor and holding torque through the
 * gearbox. Expected values are hand arithmetic (python, shown in the comments) on textbook relations that differ in form
 * from the code: solid cylinder J = m r^2 / 2 (Meriam & Kraige, Engineering Mechanics: Dynamics, 7th ed., Table D/4, from
 * memory); an ideal screw (f = 0, no collar) raises with T = F l / (2 pi) (Shigley 10th ed., Eq. (8-4) with e = 1).
 */
import { parseDesign, type DesignInput } from '@leadline/contracts';
import { reflectedLoadInertia, screwInertia, STANDARD_GRAVITY } from './drive';
import { evaluate } from './evaluate';
import { expectClose } from './test-support';

describe('inertia (Meriam & Kraige, Dynamics, 7th ed., Table D/4, from memory)', () => {
  it('solid steel round 40 mm x 1 m: m = 7850 pi 0.02^2 = 9.8646 kg, J = m r^2 / 2 = 1.97292e-3 kg*m^2', () => {
    expectClose(screwInertia(7850, 1, 0.04, 0.04), 1.97292e-3, { rtol: 1e-5 });
  });

  it('100 kg on a 5 mm lead: J_L = 100 (0.005 / (2 pi))^2 = 6.33257e-5 kg*m^2 (energy balance, v = omega l / (2 pi))', () => {
    expectClose(reflectedLoadInertia(100, 0.005), 6.33257e-5, { rtol: 1e-5 });
  });

  it('standard gravity 9.80665 m/s^2 (NIST SP 811, Sec. 8.2)', () => {
    expect(STANDARD_GRAVITY).toBe(9.80665);
  });
});

/** An ideal (frictionless) square-thread lifting screw: d = 36 mm, p = 4 mm (d_r = 32 mm), F = 10 kN, 300 rev/min. */
function ideal(drive: DesignInput['drive'], duty: Partial<DesignInput['duty']> = {}): DesignInput {
  return {
    thread: { form: 'square', majorDiameter: '36 mm', pitch: '4 mm' },
    load: { axial: '10 kN', sense: 'compression' },
    friction: { thread: { min: 0, max: 0, source: { kind: 'assumed', reference: 'ideal screw, a limit case for checking' } } },
    collar: { kind: 'none' },
    nut: { length: '40 mm' },
    screw: { yieldStrength: '530 MPa', elasticModulus: '207 GPa', density: '7850 kg/m^3', unsupportedLength: '1000 mm', ends: 'pinned-pinned' },
    duty: { kind: 'lifting', speed: '300 rpm', brake: false, ...duty },
    ...(drive ? { drive } : {}),
  };
}

function run(input: DesignInput) {
  const parsed = parseDesign(input);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  return evaluate(parsed.design);
}

describe('acceleration, peak and holding torque through a gearbox (hand arithmetic)', () => {
  // T_R = 10000 x 0.004 / (2 pi) = 6.366198 N*m; alpha = 2 pi x 5 rev/s / 0.25 s = 125.6637 rad/s^2;
  // m = 10000 / 9.80665 = 1019.716 kg; J_L = m (0.004 / 2 pi)^2 = 4.132754e-4; J_s = (pi 7850 x 1 / 32)(0.032^4 + 0.036^4)/2
  // = 1.051271e-3 kg*m^2; T_a = (J_s + J_L) alpha = 0.1840403 N*m; T_peak = 6.550238 N*m; at the motor (i = 5, eta 0.9):
  // 1.455608 N*m; holding at the motor T_0 eta_r / i = 6.366198 x 0.6 / 5 = 0.7639437 N*m.
  const e = run(ideal({ availableTorque: '3 N*m', accelerationTime: '0.25 s', gearbox: { ratio: 5, efficiency: 0.9, reverseEfficiency: 0.6 } }));
  const d = e.drive;

  it('steady torque of the ideal screw and the load mass from its weight', () => {
    expectClose(d?.steadyTorque ?? NaN, 6.366198, { rtol: 1e-6 });
    expectClose(d?.loadMass ?? NaN, 1019.716, { rtol: 1e-6 });
    expect(d?.loadMassBasis).toBe('weight');
  });

  it('inertias and angular acceleration', () => {
    expectClose(d?.screwInertia ?? NaN, 1.051271e-3, { rtol: 1e-6 });
    expectClose(d?.loadInertia ?? NaN, 4.132754e-4, { rtol: 1e-6 });
    expectClose(d?.angularAcceleration ?? NaN, 125.6637, { rtol: 1e-6 });
  });

  it('acceleration torque, peak at the screw and at the motor; the drive margin uses the peak at the motor', () => {
    expectClose(d?.accelerationTorque ?? NaN, 0.1840403, { rtol: 1e-6 });
    expectClose(d?.peakTorque ?? NaN, 6.550238, { rtol: 1e-6 });
    expectClose(d?.peakTorqueAtMotor ?? NaN, 1.455608, { rtol: 1e-6 });
    expect(d?.requiredTorque).toBe(d?.peakTorqueAtMotor);
    expectClose(d?.margin ?? NaN, 3 / 1.455608, { rtol: 1e-6 });
  });

  it('holding torque at the motor through the reverse efficiency', () => {
    expectClose(d?.holdingTorqueAtMotor ?? NaN, 0.7639437, { rtol: 1e-6 });
    expectClose(e.brake.holdingTorqueNoFriction, 6.366198, { rtol: 1e-6 });
  });

  it('a linear acceleration of 0.5 m/s^2: alpha = 2 pi 0.5 / 0.004 = 785.398 rad/s^2, T_a = 1.150252 N*m', () => {
    const a = run(ideal({ availableTorque: '10 N*m', acceleration: '0.5 m/s^2' })).drive;
    expectClose(a?.angularAcceleration ?? NaN, 785.398, { rtol: 1e-6 });
    expectClose(a?.accelerationTorque ?? NaN, 1.150252, { rtol: 1e-6 });
    expectClose(a?.peakTorqueAtMotor ?? NaN, 6.366198 + 1.150252, { rtol: 1e-6 }); // no gearbox: the screw is the motor shaft
  });

  it('without acceleration or gearbox the required torque is the steady raise torque, as before', () => {
    const a = run(ideal({ availableTorque: '10 N*m' })).drive;
    expect(a?.accelerationTorque).toBe(0);
    expect(a?.requiredTorque).toBe(a?.steadyTorque);
  });

  it('positioning duty without a load mass leaves the load inertia out and says so', () => {
    const a = run(ideal({ availableTorque: '10 N*m', accelerationTime: '0.25 s' }, { kind: 'positioning' })).drive;
    expect(a?.loadMassBasis).toBe('not-included');
    expect(a?.loadInertia).toBeNull();
    expectClose(a?.accelerationTorque ?? NaN, 1.051271e-3 * 125.6637, { rtol: 1e-6 });
  });

  it('a stated load mass is used as given', () => {
    const a = run(ideal({ availableTorque: '10 N*m', accelerationTime: '0.25 s', loadMass: '500 kg' }, { kind: 'positioning' })).drive;
    expect(a?.loadMassBasis).toBe('stated');
    expectClose(a?.loadInertia ?? NaN, 500 * (0.004 / (2 * Math.PI)) ** 2, { rtol: 1e-12 });
  });
});

describe('drive and brake input validation', () => {
  const issues = (input: DesignInput) => {
    const r = parseDesign(input);
    return r.success ? [] : r.issues.map((i) => i.path);
  };
  it('a time to speed needs an operating speed', () => {
    const input = ideal({ availableTorque: '1 N*m', accelerationTime: '1 s' });
    const { speed: _speed, ...duty } = input.duty;
    expect(issues({ ...input, duty })).toContain('drive.accelerationTime');
  });
  it('time to speed and acceleration are exclusive', () => {
    expect(issues(ideal({ availableTorque: '1 N*m', accelerationTime: '1 s', acceleration: '1 m/s^2' }))).toContain('drive.acceleration');
  });
  it('a brake torque needs a brake', () => {
    expect(issues(ideal(undefined, { brakeTorque: '10 N*m' }))).toContain('duty.brakeTorque');
  });
  it('a mass in a length unit names the field', () => {
    expect(issues(ideal({ availableTorque: '1 N*m', loadMass: '5 mm' }))).toContain('drive.loadMass');
  });
  it('gearbox efficiency above 1 names the field', () => {
    expect(issues(ideal({ availableTorque: '1 N*m', gearbox: { ratio: 5, efficiency: 1.2, reverseEfficiency: 0.5 } }))).toContain('drive.gearbox.efficiency');
  });
  it('a load mass in lb converts to kg', () => {
    const r = parseDesign(ideal({ availableTorque: '1 N*m', loadMass: '500 lb', accelerationTime: '0.5 s' }));
    expect(r.success && r.design.drive?.loadMass).toBeCloseTo(500 * 0.45359237, 9); // NIST SP 811 B.8: 1 lb = 0.45359237 kg
  });
});

/**
 * Every registered rule at, just above and just below its thresholds, one describe block per rule id, in registry
 * order. One suite for all rules on purpose: each Jest suite reloads mathjs (about 1 s) through the engine's units
 * module, so one file per rule would make `jest libs/rules` several times slower.
 * Designs are evaluated by the real engine; values marked SYNTHETIC replace one evaluation field with a spread copy.
 */
import { FRICTION_LIBRARY } from '@leadline/mechanics';
import { RULE_SET_2026_12_2 } from '../rule-set';
import { contextOf, evaluated, FAST_AXIS_INPUT, JACK_INPUT, JUST, withDuty, type Evaluated } from '../testing/designs';
import { liftingSelfLocking } from './lifting-self-locking.rule';
import { screwBodyYield } from './screw-body-yield.rule';
import { threadRootYield } from './thread-root-yield.rule';
import { screwThreadStripping } from './screw-thread-stripping.rule';
import { nutThreadStripping } from './nut-thread-stripping.rule';
import { columnBuckling } from './column-buckling.rule';
import { columnEndFixity } from './column-end-fixity.rule';
import { shaftWhirlSpeed } from './shaft-whirl-speed.rule';
import { nutBearingPressure } from './nut-bearing-pressure.rule';
import { nutPv } from './nut-pv.rule';
import { driveTorqueMargin } from './drive-torque-margin.rule';
import { frictionSourceAssumed } from './friction-source-assumed.rule';
import { threadFrictionRange } from './thread-friction-range.rule';
import { nutEngagedThreads } from './nut-engaged-threads.rule';

describe('lifting-self-locking', () => {
  const MIN = RULE_SET_2026_12_2.thresholds.selfLocking.minMargin;
  const NO_SUBSTITUTE = /no substitute for a brake where a fall can hurt someone/;

  /** SYNTHETIC: the real jack evaluation with the self-locking margin replaced (locks follows the engine's margin > 1). */
  function withMargin(e: Evaluated, margin: number): Evaluated {
    return { ...e, evaluation: { ...e.evaluation, selfLocking: { ...e.evaluation.selfLocking, margin, locks: margin > 1 } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: a lifting screw that does not self-lock and has no brake blocks', () => {
    const fast = evaluated(FAST_AXIS_INPUT);
    expect(fast.evaluation.selfLocking.locks).toBe(false);
    const f = liftingSelfLocking(contextOf(fast));
    expect(f?.severity).toBe('blocking');
    expect(f?.limit).toBe(1);
    expect(f?.message).toMatch(NO_SUBSTITUTE);
    expect(f?.message).toMatch(/N·m/);
  });

  it.each(['positioning', 'clamping'] as const)('real engine: the same non-locking screw on %s duty is information only', (kind) => {
    const f = liftingSelfLocking(contextOf(evaluated(withDuty(FAST_AXIS_INPUT, { kind }))));
    expect(f?.severity).toBe('info');
    expect(f?.message).toMatch(/no substitute for a brake/);
  });

  it('real engine: a well self-locking lifting screw without brake gets the reminder as information', () => {
    expect(jack.evaluation.selfLocking.margin).toBeGreaterThan(MIN);
    const f = liftingSelfLocking(contextOf(jack));
    expect(f?.severity).toBe('info');
    expect(f?.message).toMatch(NO_SUBSTITUTE);
  });

  it.each([
    ['just above the minimum margin', JUST.above(MIN), 'info'],
    ['at the minimum margin', MIN, 'info'],
    ['just below the minimum margin', JUST.below(MIN), 'warning'],
    ['just above the locking boundary 1', JUST.above(1), 'warning'],
    ['at the locking boundary 1 (does not lock)', 1, 'blocking'],
    ['just below the locking boundary 1', JUST.below(1), 'blocking'],
  ])('SYNTHETIC margin %s, no brake: %s', (_, margin, severity) => {
    expect(liftingSelfLocking(contextOf(withMargin(jack, margin)))?.severity).toBe(severity);
  });

  it('real engine: vibration on lifting duty without a brake blocks even when the screw self-locks', () => {
    const f = liftingSelfLocking(contextOf(evaluated(withDuty(JACK_INPUT, { vibration: true }))));
    expect(f?.severity).toBe('blocking');
    expect(f?.subject).toBe('design.duty.vibration');
    expect(f?.message).toMatch(NO_SUBSTITUTE);
  });

  it('real engine: vibration with a brake warns that self-locking cannot be relied on', () => {
    const f = liftingSelfLocking(contextOf(evaluated(withDuty(JACK_INPUT, { vibration: true, brake: true }))));
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/cannot be relied on/);
  });

  it('real engine: a non-locking lifting screw with a brake warns to confirm the brake', () => {
    const f = liftingSelfLocking(contextOf(evaluated(withDuty(FAST_AXIS_INPUT, { brake: true }))));
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/brake/);
  });

  it('with a brake: low margin is information, an ample margin gives no finding', () => {
    const braked = evaluated(withDuty(JACK_INPUT, { brake: true }));
    expect(liftingSelfLocking(contextOf(braked))).toBeNull();
    expect(liftingSelfLocking(contextOf(withMargin(braked, JUST.below(MIN))))?.severity).toBe('info'); // SYNTHETIC margin
  });

  it('positioning duty: a self-locking screw under vibration gives no finding', () => {
    expect(liftingSelfLocking(contextOf(evaluated(withDuty(JACK_INPUT, { kind: 'positioning', vibration: true }))))).toBeNull();
  });

  it('takes its minimum margin from the thresholds', () => {
    const margin = jack.evaluation.selfLocking.margin;
    const stricter = { ...RULE_SET_2026_12_2.thresholds, selfLocking: { minMargin: JUST.above(margin) } };
    const f = liftingSelfLocking(contextOf(jack, stricter));
    expect(f?.severity).toBe('warning');
    expect(f?.limit).toBe(stricter.selfLocking.minMargin);
  });
});

describe('screw-body-yield', () => {
  const MIN = RULE_SET_2026_12_2.thresholds.strength.minSafetyFactor;

  /** SYNTHETIC: the body factor of safety replaced; the stresses stay the engine's. */
  function withFactor(e: Evaluated, bodyVonMises: number): Evaluated {
    return { ...e, evaluation: { ...e.evaluation, safetyFactors: { ...e.evaluation.safetyFactors, bodyVonMises } } };
  }

  const jack = evaluated(JACK_INPUT);
  const positioning = evaluated(withDuty(JACK_INPUT, { kind: 'positioning' }));

  it('real engine: the jack body is far from yield', () => {
    expect(screwBodyYield(contextOf(jack))).toBeNull();
  });

  it('real engine: an AISI 304 screw (S_y 205 MPa, ASTM A276 min, from memory) at 80 kN blocks, message in MPa', () => {
    const weak = evaluated({ ...JACK_INPUT, load: { axial: '80 kN', sense: 'compression' }, screw: { ...JACK_INPUT.screw, material: 'stainless-304-annealed' } });
    const f = screwBodyYield(contextOf(weak));
    expect(f?.severity).toBe('blocking');
    expect(f?.message).toMatch(/MPa/);
    expect(f?.message).toMatch(/205 MPa/);
  });

  it.each([
    ['just above', JUST.above(MIN.lifting), null],
    ['at', MIN.lifting, null],
    ['just below', JUST.below(MIN.lifting), 'blocking'],
  ])('SYNTHETIC lifting factor %s the minimum', (_, factor, severity) => {
    expect(screwBodyYield(contextOf(withFactor(jack, factor)))?.severity ?? null).toBe(severity);
  });

  it.each([
    ['just above', JUST.above(MIN.positioning), null],
    ['at', MIN.positioning, null],
    ['just below', JUST.below(MIN.positioning), 'blocking'],
  ])('SYNTHETIC positioning factor %s the minimum', (_, factor, severity) => {
    expect(screwBodyYield(contextOf(withFactor(positioning, factor)))?.severity ?? null).toBe(severity);
  });

  it('a factor between the positioning and lifting minimums blocks only on lifting duty (SYNTHETIC)', () => {
    const between = (MIN.lifting + MIN.positioning) / 2;
    expect(screwBodyYield(contextOf(withFactor(jack, between)))?.severity).toBe('blocking');
    expect(screwBodyYield(contextOf(withFactor(positioning, between)))).toBeNull();
  });

  it('a factor the engine could not compute blocks (safe side, SYNTHETIC NaN)', () => {
    const f = screwBodyYield(contextOf(withFactor(jack, Number.NaN)));
    expect(f?.severity).toBe('blocking');
    expect(f?.message).not.toMatch(/NaN/);
  });
});

describe('thread-root-yield', () => {
  const MIN = RULE_SET_2026_12_2.thresholds.strength.minSafetyFactor;

  /** SYNTHETIC: the first-thread root factor of safety replaced. */
  function withFactor(e: Evaluated, firstThreadRoot: number): Evaluated {
    return { ...e, evaluation: { ...e.evaluation, safetyFactors: { ...e.evaluation.safetyFactors, firstThreadRoot } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: the jack thread root passes', () => {
    expect(threadRootYield(contextOf(jack))).toBeNull();
  });

  it.each([
    ['just above', JUST.above(MIN.lifting), null],
    ['at', MIN.lifting, null],
    ['just below', JUST.below(MIN.lifting), 'blocking'],
  ])('SYNTHETIC lifting factor %s the minimum', (_, factor, severity) => {
    const f = threadRootYield(contextOf(withFactor(jack, factor)));
    expect(f?.severity ?? null).toBe(severity);
    if (f) {
      expect(f.subject).toBe('safetyFactors.firstThreadRoot');
      expect(f.message).toMatch(/MPa/);
    }
  });

  it('SYNTHETIC clamping factor at 2.5 passes (clamping minimum 2.0) but would block on lifting', () => {
    const clamping = evaluated(withDuty(JACK_INPUT, { kind: 'clamping' }));
    expect(threadRootYield(contextOf(withFactor(clamping, 2.5)))).toBeNull();
    expect(threadRootYield(contextOf(withFactor(jack, 2.5)))?.severity).toBe('blocking');
  });
});

describe('screw-thread-stripping', () => {
  const MIN = RULE_SET_2026_12_2.thresholds.strength.minSafetyFactor.lifting;

  /** SYNTHETIC: the screw stripping factor of safety replaced. */
  function withFactor(e: Evaluated, strippingScrew: number): Evaluated {
    return { ...e, evaluation: { ...e.evaluation, safetyFactors: { ...e.evaluation.safetyFactors, strippingScrew } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: the jack screw threads do not strip', () => {
    expect(screwThreadStripping(contextOf(jack))).toBeNull();
  });

  it.each([
    ['just above', JUST.above(MIN), null],
    ['at', MIN, null],
    ['just below', JUST.below(MIN), 'blocking'],
  ])('SYNTHETIC factor %s the lifting minimum', (_, factor, severity) => {
    const f = screwThreadStripping(contextOf(withFactor(jack, factor)));
    expect(f?.severity ?? null).toBe(severity);
    if (f) expect(f.message).toMatch(/0\.577/);
  });
});

describe('nut-thread-stripping', () => {
  const MIN = RULE_SET_2026_12_2.thresholds.strength.minSafetyFactor.lifting;

  /** SYNTHETIC: the nut stripping factor of safety replaced. */
  function withFactor(e: Evaluated, strippingNut: number): Evaluated {
    return { ...e, evaluation: { ...e.evaluation, safetyFactors: { ...e.evaluation.safetyFactors, strippingNut } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: the aluminium-bronze nut (ASTM B148 C95400 minimum yield 30 ksi, from memory) passes', () => {
    expect(nutThreadStripping(contextOf(jack))).toBeNull();
  });

  it('real engine: a grey cast-iron nut has no yield on record: on lifting duty the check blocks and names the missing value', () => {
    const iron = evaluated({ ...JACK_INPUT, nut: { length: '56 mm', material: 'cast-iron' } });
    expect(iron.evaluation.safetyFactors.strippingNut).toBeNull();
    const f = nutThreadStripping(contextOf(iron));
    expect(f?.severity).toBe('blocking');
    expect(f?.measured).toBeNull();
    expect(f?.message).toMatch(/nut\.yieldStrength is missing/);
  });

  it('real engine: the same cast-iron nut on positioning duty is information only', () => {
    const iron = evaluated(withDuty({ ...JACK_INPUT, nut: { length: '56 mm', material: 'cast-iron' } }, { kind: 'positioning' }));
    const f = nutThreadStripping(contextOf(iron));
    expect(f?.severity).toBe('info');
    expect(f?.message).toMatch(/nut\.yieldStrength/);
  });

  it.each([
    ['just above', JUST.above(MIN), null],
    ['at', MIN, null],
    ['just below', JUST.below(MIN), 'blocking'],
  ])('SYNTHETIC factor %s the lifting minimum', (_, factor, severity) => {
    expect(nutThreadStripping(contextOf(withFactor(jack, factor)))?.severity ?? null).toBe(severity);
  });
});

describe('column-buckling', () => {
  const MIN = RULE_SET_2026_12_2.thresholds.buckling.minSafetyFactor;

  /** SYNTHETIC: the buckling factor replaced; the rest of the column result stays the engine's. */
  function withFactor(e: Evaluated, safetyFactor: number): Evaluated {
    return { ...e, evaluation: { ...e.evaluation, buckling: { ...e.evaluation.buckling, safetyFactor } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: the 600 mm fixed-free jack column passes narrowly (factor about 3.65)', () => {
    expect(jack.evaluation.buckling.safetyFactor).toBeGreaterThan(MIN.lifting);
    expect(columnBuckling(contextOf(jack))).toBeNull();
  });

  it('real engine: the same jack with 900 mm free length blocks', () => {
    const tall = evaluated({ ...JACK_INPUT, screw: { ...JACK_INPUT.screw, unsupportedLength: '900 mm' } });
    const f = columnBuckling(contextOf(tall));
    expect(f?.severity).toBe('blocking');
    expect(f?.message).toMatch(/kN/);
  });

  it('real engine: a screw in tension is not a column', () => {
    const hanging = evaluated({ ...JACK_INPUT, load: { axial: '20 kN', sense: 'tension' }, screw: { ...JACK_INPUT.screw, unsupportedLength: '3000 mm' } });
    expect(hanging.evaluation.buckling.applies).toBe(false);
    expect(columnBuckling(contextOf(hanging))).toBeNull();
  });

  it.each([
    ['just above', JUST.above(MIN.lifting), null],
    ['at', MIN.lifting, null],
    ['just below', JUST.below(MIN.lifting), 'blocking'],
  ])('SYNTHETIC lifting factor %s the minimum', (_, factor, severity) => {
    expect(columnBuckling(contextOf(withFactor(jack, factor)))?.severity ?? null).toBe(severity);
  });

  it.each([
    ['just above', JUST.above(MIN.positioning), null],
    ['at', MIN.positioning, null],
    ['just below', JUST.below(MIN.positioning), 'blocking'],
  ])('SYNTHETIC positioning factor %s the minimum', (_, factor, severity) => {
    const positioning = evaluated(withDuty(JACK_INPUT, { kind: 'positioning' }));
    expect(columnBuckling(contextOf(withFactor(positioning, factor)))?.severity ?? null).toBe(severity);
  });
});

describe('column-end-fixity', () => {
  // No threshold of its own: the limit is Shigley 9th ed. Table 4-2's recommended constant for the end condition.

  it('real engine: fixed-pinned with the theoretical C = 2 warns (recommended 1.2)', () => {
    const e = evaluated({ ...FAST_AXIS_INPUT, screw: { ...FAST_AXIS_INPUT.screw, endConditionBasis: 'theoretical' } });
    const f = columnEndFixity(contextOf(e));
    expect(f?.severity).toBe('warning');
    expect(f?.measured).toBe(2);
    expect(f?.limit).toBe(1.2);
  });

  it('real engine: the recommended basis gives no finding', () => {
    expect(columnEndFixity(contextOf(evaluated(FAST_AXIS_INPUT)))).toBeNull();
  });

  it('real engine: fixed-free, where theoretical and recommended agree (C = 1/4), gives no finding', () => {
    const e = evaluated({ ...JACK_INPUT, screw: { ...JACK_INPUT.screw, endConditionBasis: 'theoretical' } });
    expect(columnEndFixity(contextOf(e))).toBeNull();
  });

  it('real engine: a screw in tension gives no finding', () => {
    const e = evaluated({ ...FAST_AXIS_INPUT, load: { axial: '5 kN', sense: 'tension' }, screw: { ...FAST_AXIS_INPUT.screw, endConditionBasis: 'theoretical' } });
    expect(columnEndFixity(contextOf(e))).toBeNull();
  });
});

describe('shaft-whirl-speed', () => {
  const { maxRatio, warnRatio } = RULE_SET_2026_12_2.thresholds.criticalSpeed;

  /** SYNTHETIC: the operating fraction of critical speed replaced (operating speed made consistent with it). */
  function withRatio(e: Evaluated, ratio: number): Evaluated {
    const cs = e.evaluation.criticalSpeed;
    // partly fixed figure removed, so the classical ratio is the one judged (the lower speed is tested in shaft-whirl-partly-fixed.spec.ts)
    return { ...e, evaluation: { ...e.evaluation, criticalSpeed: { ...cs, ratio, operatingRpm: ratio * cs.rpm, partlyFixed: null } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: 60 rev/min is far below the jack critical speed', () => {
    expect(shaftWhirlSpeed(contextOf(jack))).toBeNull();
  });

  it('real engine: 3500 rev/min on the jack (critical about 3840 rev/min) blocks, message in rev/min', () => {
    const f = shaftWhirlSpeed(contextOf(evaluated(withDuty(JACK_INPUT, { speed: '3500 rpm' }))));
    expect(f?.severity).toBe('blocking');
    expect(f?.message).toMatch(/rev\/min/);
  });

  it('real engine: no operating speed is information', () => {
    const f = shaftWhirlSpeed(contextOf(evaluated(withDuty(JACK_INPUT, { speed: undefined }))));
    expect(f?.severity).toBe('info');
    expect(f?.measured).toBeNull();
  });

  it.each([
    ['just above the limit', JUST.above(maxRatio), 'blocking'],
    ['at the limit', maxRatio, 'warning'],
    ['just below the limit', JUST.below(maxRatio), 'warning'],
    ['just above the warning level', JUST.above(warnRatio), 'warning'],
    ['at the warning level', warnRatio, null],
    ['just below the warning level', JUST.below(warnRatio), null],
  ])('SYNTHETIC ratio %s', (_, ratio, severity) => {
    expect(shaftWhirlSpeed(contextOf(withRatio(jack, ratio)))?.severity ?? null).toBe(severity);
  });
});

describe('nut-bearing-pressure', () => {
  const { maxPressureRatio, warnPressureRatio } = RULE_SET_2026_12_2.thresholds.wear;

  /** SYNTHETIC: the pressure ratio replaced, with the bearing pressure made consistent with it. */
  function withRatio(e: Evaluated, pressureRatio: number): Evaluated {
    const w = e.evaluation.wear;
    const bearingPressure = pressureRatio * (w.allowablePressure as number);
    return { ...e, evaluation: { ...e.evaluation, wear: { ...w, pressureRatio, bearingPressure } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: the jack nut at 6.2 MPa against 11.0 MPa (Shigley Table 8-4 screw jack, from memory) passes', () => {
    expect(nutBearingPressure(contextOf(jack))).toBeNull();
  });

  it('real engine: the jack at 40 kN (about 12.5 MPa) blocks, message in MPa', () => {
    const f = nutBearingPressure(contextOf(evaluated({ ...JACK_INPUT, load: { axial: '40 kN', sense: 'compression' } })));
    expect(f?.severity).toBe('blocking');
    expect(f?.unit).toBe('Pa');
    expect(f?.message).toMatch(/MPa/);
  });

  it('real engine: a nylon nut with no allowable pressure on record asks for supplier data', () => {
    const f = nutBearingPressure(contextOf(evaluated({ ...JACK_INPUT, nut: { length: '56 mm', material: 'nylon' } })));
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/supplier/);
  });

  it.each([
    ['just above the limit', JUST.above(maxPressureRatio), 'blocking'],
    ['at the limit', maxPressureRatio, 'warning'],
    ['just below the limit', JUST.below(maxPressureRatio), 'warning'],
    ['just above the warning level', JUST.above(warnPressureRatio), 'warning'],
    ['at the warning level', warnPressureRatio, null],
    ['just below the warning level', JUST.below(warnPressureRatio), null],
  ])('SYNTHETIC ratio %s', (_, ratio, severity) => {
    expect(nutBearingPressure(contextOf(withRatio(jack, ratio)))?.severity ?? null).toBe(severity);
  });
});

describe('nut-pv', () => {
  const { maxPvRatio, warnPvRatio } = RULE_SET_2026_12_2.thresholds.wear;

  /** SYNTHETIC: the pV ratio replaced, with pV made consistent with it. */
  function withRatio(e: Evaluated, pvRatio: number): Evaluated {
    const w = e.evaluation.wear;
    return { ...e, evaluation: { ...e.evaluation, wear: { ...w, pvRatio, pv: pvRatio * (w.allowablePv as number) } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: the jack at 20 rev/min is well inside the aluminium-bronze pV limit (Mott Table 16-1, 4.38 MPa·m/s)', () => {
    expect(nutPv(contextOf(jack))).toBeNull();
  });

  it('real engine: the jack at 300 rev/min (pV about 3.6 MPa·m/s) blocks', () => {
    // tin bronze, Mott Table 16-1 75,000 psi*ft/min = 2.63 MPa*m/s
    const f = nutPv(contextOf(evaluated(withDuty({ ...JACK_INPUT, nut: { length: '56 mm', material: 'bronze' } }, { speed: '300 rpm' }))));
    expect(f?.severity).toBe('blocking');
    expect(f?.message).toMatch(/MPa·m\/s/);
  });

  it('real engine: a cast-iron nut with no pV limit on record asks for supplier data', () => {
    const f = nutPv(contextOf(evaluated({ ...JACK_INPUT, nut: { length: '56 mm', material: 'cast-iron' } })));
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/supplier/);
  });

  it('real engine: no operating speed is information', () => {
    expect(nutPv(contextOf(evaluated(withDuty(JACK_INPUT, { speed: undefined }))))?.severity).toBe('info');
  });

  it.each([
    ['just above the limit', JUST.above(maxPvRatio), 'blocking'],
    ['at the limit', maxPvRatio, 'warning'],
    ['just below the limit', JUST.below(maxPvRatio), 'warning'],
    ['just above the warning level', JUST.above(warnPvRatio), 'warning'],
    ['at the warning level', warnPvRatio, null],
    ['just below the warning level', JUST.below(warnPvRatio), null],
  ])('SYNTHETIC ratio %s', (_, ratio, severity) => {
    expect(nutPv(contextOf(withRatio(jack, ratio)))?.severity ?? null).toBe(severity);
  });
});

describe('drive-torque-margin', () => {
  const { minMargin, warnMargin } = RULE_SET_2026_12_2.thresholds.drive;

  /** SYNTHETIC: the drive margin replaced, with the available torque made consistent with it. */
  function withMargin(e: Evaluated, margin: number): Evaluated {
    const d = e.evaluation.drive;
    if (d === null) throw new Error('design has no drive');
    return { ...e, evaluation: { ...e.evaluation, drive: { ...d, margin, availableTorque: margin * d.requiredTorque } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: 200 N·m against about 124 N·m raise torque passes', () => {
    expect(driveTorqueMargin(contextOf(jack))).toBeNull();
  });

  it('real engine: a 150 N·m drive (margin about 1.21) blocks, message in N·m', () => {
    const f = driveTorqueMargin(contextOf(evaluated({ ...JACK_INPUT, drive: { availableTorque: '150 N*m' } })));
    expect(f?.severity).toBe('blocking');
    expect(f?.message).toMatch(/N·m/);
  });

  it('real engine: no drive given is information with the torque a drive needs', () => {
    const { drive: _omit, ...noDrive } = JACK_INPUT;
    const f = driveTorqueMargin(contextOf(evaluated(noDrive)));
    expect(f?.severity).toBe('info');
    expect(f?.message).toMatch(/N·m/);
  });

  it.each([
    ['just above the required margin', JUST.above(minMargin), 'warning'],
    ['at the required margin', minMargin, 'warning'],
    ['just below the required margin', JUST.below(minMargin), 'blocking'],
    ['just above the recommended margin', JUST.above(warnMargin), null],
    ['at the recommended margin', warnMargin, null],
    ['just below the recommended margin', JUST.below(warnMargin), 'warning'],
  ])('SYNTHETIC margin %s', (_, margin, severity) => {
    expect(driveTorqueMargin(contextOf(withMargin(jack, margin)))?.severity ?? null).toBe(severity);
  });
});

describe('friction-source-assumed', () => {
  // A flag rule: no numeric threshold. Typed ranges below copy Shigley 9th ed. Table 8-5/8-6 values but label them assumed.
  const assumedThread = { min: 0.1, max: 0.16, source: { kind: 'assumed', reference: 'guess from an old drawing' } } as const;
  const assumedCollar = { min: 0.06, max: 0.08, source: { kind: 'assumed', reference: 'guess' } } as const;

  it('real engine: handbook entries give no finding', () => {
    expect(frictionSourceAssumed(contextOf(evaluated(JACK_INPUT)))).toBeNull();
  });

  it('an assumed thread friction warns', () => {
    const e = evaluated({ ...JACK_INPUT, friction: { ...JACK_INPUT.friction, thread: assumedThread } });
    const f = frictionSourceAssumed(contextOf(e));
    expect(f?.severity).toBe('warning');
    expect(f?.subject).toBe('design.friction.thread.source');
  });

  it('an assumed collar friction warns', () => {
    const e = evaluated({ ...JACK_INPUT, friction: { ...JACK_INPUT.friction, collar: assumedCollar } });
    const f = frictionSourceAssumed(contextOf(e));
    expect(f?.severity).toBe('warning');
    expect(f?.subject).toBe('design.friction.collar.source');
  });

  it('both assumed give one finding naming both', () => {
    const e = evaluated({ ...JACK_INPUT, friction: { thread: assumedThread, collar: assumedCollar } });
    expect(frictionSourceAssumed(contextOf(e))?.message).toMatch(/thread and collar/);
  });

  it('a test-sourced range gives no finding', () => {
    const tested = { min: 0.11, max: 0.15, source: { kind: 'test', reference: 'lab report 2026-114' } } as const;
    expect(frictionSourceAssumed(contextOf(evaluated({ ...JACK_INPUT, friction: { ...JACK_INPUT.friction, thread: tested } })))).toBeNull();
  });
});

describe('thread-friction-range', () => {
  const MIN_SPREAD = RULE_SET_2026_12_2.thresholds.friction.minThreadSpreadRatio;

  /** SYNTHETIC: the design's thread friction range replaced (min 0.125 is exact in binary, so max/min is exact). */
  function withRange(e: Evaluated, min: number, max: number): Evaluated {
    const thread = { ...e.design.friction.thread, min, max };
    return { ...e, design: { ...e.design, friction: { ...e.design.friction, thread } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: a single typed value (min = max) warns', () => {
    const single = { min: 0.12, max: 0.12, source: { kind: 'supplier', reference: 'catalogue p. 12' } } as const;
    const f = threadFrictionRange(contextOf(evaluated({ ...JACK_INPUT, friction: { ...JACK_INPUT.friction, thread: single } })));
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/single value/);
  });

  it.each([
    ['just above', JUST.above(MIN_SPREAD), null],
    ['at', MIN_SPREAD, null],
    ['just below', JUST.below(MIN_SPREAD), 'warning'],
  ])('SYNTHETIC spread max/min %s the minimum', (_, spread, severity) => {
    expect(threadFrictionRange(contextOf(withRange(jack, 0.125, 0.125 * spread)))?.severity ?? null).toBe(severity);
  });

  it('no thread entry of the friction library (Shigley 9th ed. Table 8-5) triggers it', () => {
    for (const entry of FRICTION_LIBRARY.filter((e) => e.surface === 'thread')) {
      expect(threadFrictionRange(contextOf(withRange(jack, entry.min, entry.max)))).toBeNull();
    }
  });
});

describe('nut-engaged-threads', () => {
  const { min, max } = RULE_SET_2026_12_2.thresholds.engagedThreads;

  /** SYNTHETIC: the engaged-thread count replaced. */
  function withThreads(e: Evaluated, engagedThreads: number): Evaluated {
    return { ...e, evaluation: { ...e.evaluation, geometry: { ...e.evaluation.geometry, engagedThreads } } };
  }

  const jack = evaluated(JACK_INPUT);

  it('real engine: 8 threads (56 mm nut, 7 mm pitch) pass', () => {
    expect(nutEngagedThreads(contextOf(jack))).toBeNull();
  });

  it('real engine: a 21 mm nut (3 threads) warns', () => {
    const f = nutEngagedThreads(contextOf(evaluated({ ...JACK_INPUT, nut: { length: '21 mm', material: 'bronze' } })));
    expect(f?.severity).toBe('warning');
    expect(f?.limit).toBe(min);
  });

  it('real engine: an 84 mm nut (12 threads) warns', () => {
    const f = nutEngagedThreads(contextOf(evaluated({ ...JACK_INPUT, nut: { length: '84 mm', material: 'bronze' } })));
    expect(f?.severity).toBe('warning');
    expect(f?.limit).toBe(max);
  });

  it.each([
    ['just above the minimum', JUST.above(min), null],
    ['at the minimum', min, null],
    ['just below the minimum', JUST.below(min), 'warning'],
    ['just above the maximum', JUST.above(max), 'warning'],
    ['at the maximum', max, null],
    ['just below the maximum', JUST.below(max), null],
  ])('SYNTHETIC count %s', (_, n, severity) => {
    expect(nutEngagedThreads(contextOf(withThreads(jack, n)))?.severity ?? null).toBe(severity);
  });
});

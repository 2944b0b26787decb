/**
 * Rules of the corrections of rule set 2026.12-2 through the real engine: the nut's own threads (item 5), a missing value on
 * lifting duty (item 12), nut pressure against rubbing speed (item 1) and the two messages of item 13.
 * Check values are worked by hand from the named equations with the reference jack's numbers (Tr 40x7: d_m 36.5,
 * D4 41 mm, ISO 2901 basic profile).
 */
import { judge } from '../judge';
import { RULE_SET_2026_12_1, DEFAULT_RULE_SET } from '../rule-set';
import { contextOf, evaluated, JACK_INPUT, JUST, withDuty } from '../testing/designs';
import { liftingSelfLocking } from './lifting-self-locking.rule';
import { nutBearingPressure } from './nut-bearing-pressure.rule';
import { nutEngagedThreads } from './nut-engaged-threads.rule';
import { nutThreadRootYield } from './nut-thread-root-yield.rule';
import type { DesignInput } from '@leadline/contracts';

const PSI = 6894.757293168361; // NIST SP 811 B.8
const tinBronzeJack: DesignInput = { ...JACK_INPUT, nut: { length: '56 mm', material: 'bronze' } };

describe("nut-thread-root-yield (the nut's own threads)", () => {
  it('the reference jack with an aluminium-bronze nut (C95400, 30 ksi minimum, from memory) passes', () => {
    expect(nutThreadRootYield(contextOf(evaluated(JACK_INPUT)))).toBeNull();
  });

  it('a tin-bronze nut (C93200, 14 ksi minimum, from memory) on the 20 kN jack: bending 35.97 MPa governs, factor 2.68 < 3 blocks', () => {
    // Shigley 10th ed. Eq. (8-10) on the nut: F_t = 0.38 x 20 kN = 7600 N, a_n = (41 - 36.5)/2 = 2.25 mm,
    // b_n = 3.5 + 2.25 x 2 tan 15 deg = 4.7058 mm: sigma = 6 x 7600 x 2.25 / (pi x 41 x 4.7058^2) = 35.97 MPa;
    // S_y / sigma = 96.53 / 35.97 = 2.684 (shear: 0.577 x 96.53 / 18.81 = 2.96, not governing)
    const f = nutThreadRootYield(contextOf(evaluated(tinBronzeJack)));
    expect(f?.severity).toBe('blocking');
    expect(f?.measured as number).toBeCloseTo((14000 * PSI) / 35.97e6, 2);
    expect(f?.limit).toBe(3);
    expect(f?.message).toMatch(/bending governs/);
  });

  it('rule set 2026.12-1 (no nutThreads group) judges as it always did: the check is not part of it', () => {
    expect(nutThreadRootYield(contextOf(evaluated(tinBronzeJack), RULE_SET_2026_12_1.thresholds))).toBeNull();
  });

  it('the minimum comes from the rule set: just below the measured factor passes, just above blocks', () => {
    const e = evaluated(tinBronzeJack);
    const n = e.evaluation.safetyFactors.nutThreadRoot as number;
    const at = (lifting: number) => ({ ...DEFAULT_RULE_SET.thresholds, nutThreads: { minSafetyFactor: { lifting, positioning: 2, clamping: 2 } } });
    expect(nutThreadRootYield(contextOf(e, at(JUST.below(n))))).toBeNull();
    expect(nutThreadRootYield(contextOf(e, at(JUST.above(n))))?.severity).toBe('blocking');
  });
});

describe('a strength check that cannot be computed', () => {
  const iron: DesignInput = { ...JACK_INPUT, nut: { length: '56 mm', material: 'cast-iron' } };

  it('on lifting duty a nut without a yield strength blocks, naming nut.yieldStrength, in both nut checks', () => {
    const e = evaluated(iron);
    const findings = judge(e.design, e.evaluation).filter((f) => f.ruleId === 'nut-thread-root-yield' || f.ruleId === 'nut-thread-stripping');
    expect(findings.map((f) => f.severity)).toEqual(['blocking', 'blocking']);
    for (const f of findings) expect(f.message).toMatch(/nut\.yieldStrength is missing/);
  });

  it('rule set 2026.12-1 (no missingValues group) keeps its information finding on lifting duty, as before', () => {
    const e = evaluated(iron);
    const findings = judge(e.design, e.evaluation, RULE_SET_2026_12_1).filter((f) => f.ruleId.startsWith('nut-thread-'));
    expect(findings.map((f) => `${f.ruleId}:${f.severity}`)).toEqual(['nut-thread-stripping:info']);
  });

  it('on positioning duty the same nut is information, still naming the value', () => {
    const e = evaluated(withDuty(iron, { kind: 'positioning' }));
    const f = nutThreadRootYield(contextOf(e));
    expect(f?.severity).toBe('info');
    expect(f?.message).toMatch(/nut\.yieldStrength/);
  });
});

describe('nut-bearing-pressure against rubbing speed (Shigley 9th ed. Table 8-4 after Rothbart, from memory)', () => {
  /** The example: two-start Tr 40x14 (P7) at 300 rpm, bronze nut of 12 threads, about 3.3 MPa on the flanks. */
  const leadScrew: DesignInput = {
    ...JACK_INPUT,
    thread: { form: 'trapezoidal', majorDiameter: '40 mm', pitch: '7 mm', starts: 2 },
    load: { axial: '16 kN', sense: 'compression' },
    nut: { length: '84 mm', material: 'bronze' },
    duty: { kind: 'positioning', speed: '300 rpm', brake: false },
  };

  it('Tr 40x14 at 300 rpm (about 35 m/min): 3.3 MPa against the lead-screw class 150 psi = 1.03 MPa blocks and names the class', () => {
    const e = evaluated(leadScrew);
    // p = 16 000 / (pi x 36.5 x 3.5 x 12) = 3.32 MPa (Eq. (8-9) over all threads)
    expect(e.evaluation.wear.bearingPressure / 1e6).toBeCloseTo(3.32, 2);
    const f = nutBearingPressure(contextOf(e));
    expect(f?.severity).toBe('blocking');
    expect(f?.limit as number).toBeCloseTo(150 * PSI, 6);
    expect(f?.message).toMatch(/lead screw \(high speed/);
    expect(f?.message).toMatch(/rubbing speed 34\.7 m\/min/);
  });

  it('the same nut at 10 rpm (about 1.2 m/min) is inside the screw-jack class (1600 psi) and passes', () => {
    expect(nutBearingPressure(contextOf(evaluated(withDuty(leadScrew, { speed: '10 rpm' }))))).toBeNull();
  });

  it("a design's own single allowable is used at any speed, and the message says so", () => {
    const own = { ...leadScrew, nut: { length: '84 mm', material: 'bronze', allowablePressure: '3.5 MPa' } };
    const f = nutBearingPressure(contextOf(evaluated(own)));
    expect(f?.severity).toBe('warning'); // 3.32 / 3.5 = 95 %, above the 80 % warning level
    expect(f?.message).toMatch(/single value, used at any rubbing speed/);
  });

  it('steel on cast iron above 40 ft/min has no published class: a warning asks for the value (never a silent pass)', () => {
    const f = nutBearingPressure(contextOf(evaluated({ ...leadScrew, nut: { length: '84 mm', material: 'cast-iron' } })));
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/no steel\/cast-iron class above 40 ft\/min/);
  });
});

describe('messages', () => {
  it('a long nut that the wear check needs is not advised to be shorter', () => {
    // 40 kN on the jack with an 84 mm nut (12 threads): with 10 threads the pressure would be above 80 % of 11.0 MPa
    const e = evaluated({ ...JACK_INPUT, load: { axial: '40 kN', sense: 'compression' }, nut: { length: '84 mm', material: 'aluminum-bronze' } });
    const f = nutEngagedThreads(contextOf(e));
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/The length is needed for wear/);
    expect(f?.message).not.toMatch(/could be shortened|Shorten the nut/);
  });

  it('a long nut with wear to spare may be shortened', () => {
    const f = nutEngagedThreads(contextOf(evaluated({ ...JACK_INPUT, nut: { length: '84 mm', material: 'aluminum-bronze' } })));
    expect(f?.message).toMatch(/could be shortened/);
  });

  it('the self-locking margin basis does not assume a dry range when the source says machine oil', () => {
    const oiled = liftingSelfLocking(contextOf(evaluated(JACK_INPUT))); // thread/steel-bronze/oil (Shigley Table 8-5, machine oil)
    expect(oiled?.basis).toMatch(/already for a lubricated thread/);
    expect(oiled?.basis).not.toMatch(/dry to oiled/);
    const dry = liftingSelfLocking(contextOf(evaluated({ ...JACK_INPUT, friction: { ...JACK_INPUT.friction, thread: { entry: 'thread/steel-bronze/dry' } } })));
    expect(dry?.basis).toMatch(/dry to oiled/);
  });
});

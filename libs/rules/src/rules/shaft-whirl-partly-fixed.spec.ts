/**
 * shaft-whirl-speed with the partly fixed critical speed: the lower of the two speeds governs.
 * Real engine evaluations; check speeds from Thomson, Theory of Vibration with Applications, Sec. 9.5 frequency factors (d_r = 32 mm, L = 1500 mm,
 * steel): classical fixed-fixed 3900.8 rev/min, partly fixed 1.2 x 1720.8 = 2065 rev/min (hand arithmetic).
 */
import type { DesignInput } from '@leadline/contracts';
import { RULE_SET_2026_12_2 } from '../rule-set';
import { contextOf, evaluated } from '../testing/designs';
import { shaftWhirlSpeed } from './shaft-whirl-speed.rule';

const input = (speed: string, basis: 'recommended' | 'theoretical' = 'recommended'): DesignInput => ({
  thread: { form: 'square', majorDiameter: '36 mm', pitch: '4 mm' },
  load: { axial: '10 kN', sense: 'compression' },
  friction: { thread: { min: 0.1, max: 0.15, source: { kind: 'assumed', reference: 'test' } } },
  collar: { kind: 'none' },
  nut: { length: '40 mm' },
  screw: {
    yieldStrength: '530 MPa', elasticModulus: '207 GPa', density: '7850 kg/m^3', unsupportedLength: '600 mm', ends: 'fixed-free',
    endConditionBasis: basis, whirlSpan: '1500 mm', whirlEnds: 'fixed-fixed',
  },
  duty: { kind: 'positioning', brake: false, speed },
});

describe('shaft-whirl-speed: the lower critical speed governs', () => {
  const { maxRatio, warnRatio } = RULE_SET_2026_12_2.thresholds.criticalSpeed;

  it('1950 rev/min: 50 % of the classical 3900.8 but 94 % of the partly fixed 2065 rev/min -> blocking, on the partly fixed ratio', () => {
    const f = shaftWhirlSpeed(contextOf(evaluated(input('1950 rpm'))));
    expect(f?.severity).toBe('blocking');
    expect(f?.subject).toBe('criticalSpeed.partlyFixed.ratio');
    expect(f?.measured as number).toBeCloseTo(1950 / 2064.96, 3);
    expect(f?.limit).toBe(maxRatio);
    expect(f?.message).toMatch(/partly fixed/);
    expect(f?.basis).toMatch(/Table 4-2/);
  });

  it('the same speed on the theoretical basis has no partly fixed figure: 50 % of 3900.8 is below the warning level', () => {
    expect(0.5).toBeLessThan(warnRatio);
    expect(shaftWhirlSpeed(contextOf(evaluated(input('1950 rpm', 'theoretical'))))).toBeNull();
  });

  it('1400 rev/min: 68 % of the partly fixed speed warns (warning level 60 %)', () => {
    const f = shaftWhirlSpeed(contextOf(evaluated(input('1400 rpm'))));
    expect(f?.severity).toBe('warning');
    expect(f?.measured as number).toBeCloseTo(1400 / 2064.96, 3);
  });
});

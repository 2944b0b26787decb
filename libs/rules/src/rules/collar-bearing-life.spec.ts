/**
 * collar-bearing-life: the rolling thrust bearing's L10 running hours against duty.designLife (rule set 2026.12-4; a life
 * short of it warns, common practice). L10 = (C_a / P_a)^3 million revolutions for a ball bearing (ISO 281:2007, Sec. 6,
 * from memory; Shigley 10th ed. Eq. (11-1)); expected figures by hand arithmetic below.
 */
import type { DesignInput } from '@leadline/contracts';
import fc from 'fast-check';
import { checkProperty } from '../../../../test/support/property';
import { RULE_SET_2026_12_3, RULE_SET_2026_12_4 } from '../rule-set';
import { evaluated, FULL_LIFTING_INPUT } from '../testing/designs';
import { collarBearingLifeRule, COLLAR_BEARING_LIFE_CHECK } from './collar-bearing-life.rule';

const T4 = RULE_SET_2026_12_4.thresholds;
const rolling = (load: string, designLife: string | undefined, element: 'ball' | 'roller' = 'ball'): DesignInput => ({
  ...FULL_LIFTING_INPUT,
  load: { axial: load, sense: 'compression' },
  collar: { kind: 'rolling', meanDiameter: '50 mm', dynamicRating: '60 kN', staticRating: '150 kN', rollingElement: element, ratingSource: 'invented catalogue values for the test' },
  duty: { ...FULL_LIFTING_INPUT.duty, speed: '20 rpm', ...(designLife ? { designLife } : {}) },
});
const judge = (input: DesignInput, thresholds = T4) => {
  const e = evaluated(input);
  return collarBearingLifeRule.check({ design: e.design, evaluation: e.evaluation, thresholds });
};
const ratioOf = (input: DesignInput) => {
  const e = evaluated(input);
  return COLLAR_BEARING_LIFE_CHECK.value({ design: e.design, evaluation: e.evaluation, thresholds: T4 });
};

describe('collar-bearing-life', () => {
  // 20 kN on C_a = 60 kN, ball: L10 = (60 / 20)^3 = 27 million revolutions; at 20 rpm 27e6 / (20 x 60) = 22,500 h
  it('L10 22,500 h against a design life of 20,000 h: 1.125, passes', () => {
    expect(ratioOf(rolling('20 kN', '20000 h'))).toBeCloseTo(22500 / 20000, 9);
    expect(judge(rolling('20 kN', '20000 h'))).toBeNull();
  });

  it('against 25,000 h: 0.9, below the minimum 1, warns (the static check guards the load), naming value and limit', () => {
    const f = judge(rolling('20 kN', '25000 h'));
    expect(f?.severity).toBe('warning');
    expect(f?.measured as number).toBeCloseTo(0.9, 9);
    expect(f?.limit).toBe(1);
    expect(f?.message).toMatch(/0\.900.*1\.00/);
  });

  it('no design life: not checked; rule set 2026.12-3 (no designLife group) does not run it', () => {
    expect(judge(rolling('20 kN', undefined))).toBeNull();
    expect(judge(rolling('20 kN', '25000 h'), RULE_SET_2026_12_3.thresholds)).toBeNull();
  });

  it('without the dynamic rating the life is not known: information naming the rating', () => {
    const input = rolling('20 kN', '25000 h');
    const f = judge({ ...input, collar: { kind: 'rolling', meanDiameter: '50 mm', staticRating: '150 kN', ratingSource: 'invented catalogue values for the test' } });
    expect(f?.severity).toBe('info');
    expect(f?.message).toContain('collar.dynamicRating');
  });

  it('property: the life ratio falls with the cube of the load for a ball bearing, with the 10/3 power for a roller bearing', () => {
    checkProperty(
      fc.property(fc.integer({ min: 2, max: 40 }), fc.integer({ min: 2, max: 40 }), fc.constantFrom('ball' as const, 'roller' as const), (a, b, element) => {
        const ra = ratioOf(rolling(`${a} kN`, '10000 h', element)) as number;
        const rb = ratioOf(rolling(`${b} kN`, '10000 h', element)) as number;
        const p = element === 'ball' ? 3 : 10 / 3;
        return Math.abs(ra / rb / (b / a) ** p - 1) < 1e-9;
      }),
      { numRuns: 30 },
    );
  });
});

/**
 * collar-bearing-static: static safety C_0a / P_0a of at least 1 (ISO 76:2006, from memory; common practice).
 */
import type { DesignInput } from '@leadline/contracts';
import type { Evaluation } from '@leadline/mechanics';
import { RULE_SET_2026_12_3 } from '../rule-set';
import { evaluated, FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { collarBearingStaticRule } from './collar-bearing-static.rule';

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };

const ROLLING: DesignInput = {
  ...FULL_LIFTING_INPUT,
  collar: { kind: 'rolling', meanDiameter: '50 mm', dynamicRating: '60 kN', staticRating: '150 kN', rollingElement: 'ball', ratingSource: 'invented catalogue values for the test' },
};

describe('collar-bearing-static', () => {
  limitCases({
    rule: collarBearingStaticRule,
    input: ROLLING,
    limit: 1,
    kind: 'minimum',
    past: 'blocking',
    group: 'collarBearing',
    withValue: (e, v) => {
      (e as Mutable<Evaluation>).collarBearing!.staticSafetyFactor = v;
      return e;
    },
  });

  it('a static rating below the 20 kN load blocks: C_0a 18 kN gives s_0 = 18 / 20 = 0.9 (hand arithmetic)', () => {
    const e = evaluated({ ...ROLLING, collar: { ...(ROLLING.collar as object), staticRating: '18 kN' } as DesignInput['collar'] });
    const f = collarBearingStaticRule.check({ design: e.design, evaluation: e.evaluation, thresholds: RULE_SET_2026_12_3.thresholds });
    expect(f?.severity).toBe('blocking');
    expect(f?.measured as number).toBeCloseTo(0.9, 9);
  });
});

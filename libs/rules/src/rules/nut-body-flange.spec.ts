/**
 * nut-body-flange: limit 3.0 on lifting (the strength minimum, common practice by analogy with ASME BTH-1, from memory); reads the flange factor with the dynamic factor on lifting duty.
 */
import type { Evaluation } from '@leadline/mechanics';
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutBodyFlangeRule } from './nut-body-flange.rule';

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };

describe('nut-body-flange', () => {
  limitCases({
    rule: nutBodyFlangeRule,
    input: FULL_LIFTING_INPUT,
    limit: 3,
    kind: 'minimum',
    past: 'blocking',
    group: 'nutBody',
    withValue: (e, v) => {
      const m = e as Mutable<Evaluation>;
      m.dynamics!.safetyFactors.nutFlange = v;
      return e;
    },
  });
});

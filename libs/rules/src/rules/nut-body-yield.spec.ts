/**
 * nut-body-yield: limit 3.0 on lifting (the strength minimum of rule set 2026.12-3, common practice by analogy with ASME BTH-1, from memory); on lifting duty it reads the factor with the dynamic factor.
 */
import type { Evaluation } from '@leadline/mechanics';
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutBodyYieldRule } from './nut-body-yield.rule';

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };

describe('nut-body-yield', () => {
  limitCases({
    rule: nutBodyYieldRule,
    input: FULL_LIFTING_INPUT,
    limit: 3,
    kind: 'minimum',
    past: 'blocking',
    group: 'nutBody',
    withValue: (e, v) => {
      const m = e as Mutable<Evaluation>;
      m.dynamics!.safetyFactors.nutBody = v;
      return e;
    },
  });
});

/**
 * nut-worn-thread-stripping: limit 3.0 on lifting (the strength minimum, common practice by analogy with ASME BTH-1, from memory).
 */
import type { Evaluation } from '@leadline/mechanics';
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutWornThreadStrippingRule } from './nut-worn-thread-stripping.rule';

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };

describe('nut-worn-thread-stripping', () => {
  limitCases({
    rule: nutWornThreadStrippingRule,
    input: FULL_LIFTING_INPUT,
    limit: 3,
    kind: 'minimum',
    past: 'blocking',
    group: 'wornThread',
    withValue: (e, v) => {
      const m = e as Mutable<Evaluation>;
      m.wornThread!.strippingNutFactor = v;
      return e;
    },
  });
});

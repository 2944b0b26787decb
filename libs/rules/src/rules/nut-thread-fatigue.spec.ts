/**
 * nut-thread-fatigue: Goodman factor of at least 1.5 (common practice).
 */
import type { Evaluation } from '@leadline/mechanics';
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutThreadFatigueRule } from './nut-thread-fatigue.rule';

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };

describe('nut-thread-fatigue', () => {
  limitCases({
    rule: nutThreadFatigueRule,
    input: FULL_LIFTING_INPUT,
    limit: 1.5,
    kind: 'minimum',
    past: 'blocking',
    group: 'fatigue',
    withValue: (e, v) => {
      const m = e as Mutable<Evaluation>;
      m.fatigue!.nutThread!.safetyFactor = v;
      return e;
    },
  });
});

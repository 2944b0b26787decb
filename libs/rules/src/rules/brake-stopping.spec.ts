/**
 * brake-stopping: the brake torque at the screw must exceed the zero-friction load torque T_0 = F l / (2 pi) (Juvinall & Marshek 5th ed. Eq. (10.5)); at exactly 1 it cannot decelerate (strict).
 */
import type { Evaluation } from '@leadline/mechanics';
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { brakeStoppingRule } from './brake-stopping.rule';

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };

describe('brake-stopping', () => {
  limitCases({
    rule: brakeStoppingRule,
    input: FULL_LIFTING_INPUT,
    limit: 1,
    kind: 'minimum',
    past: 'blocking',
    group: 'stopping',
    withValue: (e, v) => {
      const m = e as Mutable<Evaluation>;
      m.stopping!.brakeTorqueAtScrew = v * m.stopping!.loadTorque;
      return e;
    },
  });
});

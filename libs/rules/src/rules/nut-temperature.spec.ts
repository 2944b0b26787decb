/**
 * nut-temperature: the rise may reach the whole rise to the material limit (margin 0 K, common practice); the value is the share of that rise.
 */
import type { Evaluation } from '@leadline/mechanics';
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutTemperatureRule } from './nut-temperature.rule';

type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };

describe('nut-temperature', () => {
  limitCases({
    rule: nutTemperatureRule,
    input: FULL_LIFTING_INPUT,
    limit: 1,
    kind: 'maximum',
    past: 'blocking',
    group: 'thermal',
    withValue: (e, v) => {
      const m = e as Mutable<Evaluation>;
      m.thermal!.temperatureRise = v * (m.thermal!.maxTemperature! - m.thermal!.ambientTemperature);
      return e;
    },
  });
});

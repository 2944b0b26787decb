/**
 * nut-thread-fatigue: Goodman factor of at least 1.5 (common practice).
 */
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutThreadFatigueRule } from './nut-thread-fatigue.rule';

describe('nut-thread-fatigue', () => {
  limitCases({
    rule: nutThreadFatigueRule,
    input: FULL_LIFTING_INPUT,
    limit: 1.5,
    kind: 'minimum',
    past: 'blocking',
    group: 'fatigue',
    subject: 'fatigue.nutThread.safetyFactor',
  });
});

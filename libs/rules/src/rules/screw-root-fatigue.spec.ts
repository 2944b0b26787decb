/**
 * screw-root-fatigue: Goodman factor of at least 1.5 (common practice).
 */
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { screwRootFatigueRule } from './screw-root-fatigue.rule';

describe('screw-root-fatigue', () => {
  limitCases({
    rule: screwRootFatigueRule,
    input: FULL_LIFTING_INPUT,
    limit: 1.5,
    kind: 'minimum',
    past: 'blocking',
    group: 'fatigue',
    subject: 'fatigue.screwRoot.safetyFactor',
  });
});

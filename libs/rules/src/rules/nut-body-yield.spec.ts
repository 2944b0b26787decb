/**
 * nut-body-yield: limit 3.0 on lifting (the strength minimum of rule set 2026.12-3, common practice by analogy with ASME BTH-1, from memory); on lifting duty it reads the factor with the dynamic factor.
 */
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutBodyYieldRule } from './nut-body-yield.rule';

describe('nut-body-yield', () => {
  limitCases({
    rule: nutBodyYieldRule,
    input: FULL_LIFTING_INPUT,
    limit: 3,
    kind: 'minimum',
    past: 'blocking',
    group: 'nutBody',
    subject: 'dynamics.safetyFactors.nutBody',
  });
});

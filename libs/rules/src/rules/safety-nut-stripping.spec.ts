/**
 * safety-nut-stripping: limit 3.0, the lifting strength minimum (common practice by analogy with ASME BTH-1, from memory).
 */
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { safetyNutStrippingRule } from './safety-nut-stripping.rule';

describe('safety-nut-stripping', () => {
  limitCases({
    rule: safetyNutStrippingRule,
    input: FULL_LIFTING_INPUT,
    limit: 3,
    kind: 'minimum',
    past: 'blocking',
    group: 'safetyNut',
    subject: 'dynamics.safetyFactors.safetyNutStripping',
  });
});

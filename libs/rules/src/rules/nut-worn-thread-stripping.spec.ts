/**
 * nut-worn-thread-stripping: limit 3.0 on lifting (the strength minimum, common practice by analogy with ASME BTH-1, from memory).
 */
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutWornThreadStrippingRule } from './nut-worn-thread-stripping.rule';

describe('nut-worn-thread-stripping', () => {
  limitCases({
    rule: nutWornThreadStrippingRule,
    input: FULL_LIFTING_INPUT,
    limit: 3,
    kind: 'minimum',
    past: 'blocking',
    group: 'wornThread',
    subject: 'wornThread.strippingNutFactor',
  });
});

/**
 * nut-body-flange: limit 3.0 on lifting (the strength minimum, common practice by analogy with ASME BTH-1, from memory); reads the flange factor with the dynamic factor on lifting duty.
 */
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { nutBodyFlangeRule } from './nut-body-flange.rule';

describe('nut-body-flange', () => {
  limitCases({
    rule: nutBodyFlangeRule,
    input: FULL_LIFTING_INPUT,
    limit: 3,
    kind: 'minimum',
    past: 'blocking',
    group: 'nutBody',
    subject: 'dynamics.safetyFactors.nutFlange',
  });
});

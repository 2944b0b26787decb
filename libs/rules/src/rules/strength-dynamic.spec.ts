/**
 * The strength rules under rule set 2026.12-3 on lifting duty read the factors with the dynamic factor: static factor / phi
 * (EN 13001-2 Sec. 4.2.2.2, from memory: the hoisting load is multiplied by phi_2). A stated phi of 1.5 divides the static
 * factor by exactly 1.5 (hand arithmetic); other duty and earlier rule sets read the static factor.
 */
import { assessCheck } from '../check';
import { RULE_SET_2026_12_2, RULE_SET_2026_12_3 } from '../rule-set';
import { evaluated, JACK_INPUT, withDuty } from '../testing/designs';
import { SCREW_BODY_YIELD_CHECK, screwBodyYield } from './screw-body-yield.rule';

describe('strength with the dynamic factor (2026.12-3)', () => {
  const e = evaluated(withDuty(JACK_INPUT, { dynamicFactor: 1.5 }));
  const ctx = (thresholds = RULE_SET_2026_12_3.thresholds) => ({ design: e.design, evaluation: e.evaluation, thresholds });

  it('on lifting duty the body check reads dynamics.safetyFactors: the static factor / 1.5', () => {
    const c = assessCheck(SCREW_BODY_YIELD_CHECK, ctx())!;
    expect(c.subject).toBe('dynamics.safetyFactors.bodyVonMises');
    expect(c.value as number).toBeCloseTo(e.evaluation.safetyFactors.bodyVonMises / 1.5, 12);
  });

  it('rule set 2026.12-2 reads the static factor, as before', () => {
    const c = assessCheck(SCREW_BODY_YIELD_CHECK, ctx(RULE_SET_2026_12_2.thresholds))!;
    expect(c.subject).toBe('safetyFactors.bodyVonMises');
    expect(c.value).toBe(e.evaluation.safetyFactors.bodyVonMises);
  });

  it('positioning duty reads the static factor', () => {
    const p = evaluated(withDuty(JACK_INPUT, { kind: 'positioning', dynamicFactor: 1.5 }));
    expect(assessCheck(SCREW_BODY_YIELD_CHECK, { design: p.design, evaluation: p.evaluation, thresholds: RULE_SET_2026_12_3.thresholds })!.subject).toBe('safetyFactors.bodyVonMises');
  });

  it('an evaluation stored by an engine before 1.2 (no dynamics) blocks on lifting and says to re-evaluate, never passes', () => {
    const { dynamics: _dropped, ...older } = e.evaluation;
    const f = screwBodyYield({ design: e.design, evaluation: older, thresholds: RULE_SET_2026_12_3.thresholds });
    expect(f?.severity).toBe('blocking');
    expect(f?.measured).toBeNull();
    expect(f?.message).toMatch(/re-evaluate/);
  });

  it('a factor with the dynamic factor below 3 blocks and names the dynamic factor (SYNTHETIC static factor 4, phi 1.5: 2.67)', () => {
    const ev = structuredClone(e.evaluation);
    (ev.dynamics as { safetyFactors: { bodyVonMises: number } }).safetyFactors.bodyVonMises = 4 / 1.5;
    const f = screwBodyYield({ design: e.design, evaluation: ev, thresholds: RULE_SET_2026_12_3.thresholds });
    expect(f?.severity).toBe('blocking');
    expect(f?.measured as number).toBeCloseTo(4 / 1.5, 12);
    expect(f?.message).toMatch(/dynamic factor/);
  });
});

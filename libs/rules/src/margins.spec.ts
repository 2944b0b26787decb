/**
 * Governing margin used by the re-check: each numeric check as "times its limit", the smallest governs.
 * Real engine evaluation of the invented jack (testing/designs.ts); the margins are checked against the evaluation's own
 * figures and the rule set's limits, so this is a wiring test of which figure meets which limit, not of the mechanics.
 */
import { checkMargins, governingMargin } from './margins';
import { RULE_SET_2026_12_1, RULE_SET_2026_12_2 } from './rule-set';
import { evaluated, JACK_INPUT, withDuty } from './testing/designs';

describe('governing margin (wiring)', () => {
  const jack = evaluated(JACK_INPUT);
  const t = RULE_SET_2026_12_2.thresholds;

  it('strength factors against the lifting minimum, ratios against their maxima, the smallest governs', () => {
    const all = checkMargins(jack.design, jack.evaluation, t);
    const body = all.find((c) => c.subject === 'safetyFactors.bodyVonMises');
    expect(body).toMatchObject({ kind: 'min', limit: t.strength.minSafetyFactor.lifting, measured: jack.evaluation.safetyFactors.bodyVonMises });
    expect(body?.margin).toBeCloseTo(jack.evaluation.safetyFactors.bodyVonMises / 3, 12);
    const pressure = all.find((c) => c.subject === 'wear.pressureRatio');
    expect(pressure?.margin).toBeCloseTo(t.wear.maxPressureRatio / (jack.evaluation.wear.pressureRatio as number), 12);
    const g = governingMargin(jack.design, jack.evaluation, t);
    expect(g?.margin).toBe(Math.min(...all.flatMap((c) => (c.margin === null ? [] : [c.margin]))));
  });

  it('a value that could not be computed governs (never passed silently)', () => {
    const e = { ...jack.evaluation, safetyFactors: { ...jack.evaluation.safetyFactors, strippingScrew: NaN } };
    expect(governingMargin(jack.design, e, t)?.subject).toBe('safetyFactors.strippingScrew');
  });

  it('an evaluation stored by an earlier engine (no brake, no partly fixed figure) is read with what it has', () => {
    const braked = evaluated(withDuty(JACK_INPUT, { brake: true, brakeTorque: '100 N*m' }));
    expect(checkMargins(braked.design, braked.evaluation, t).some((c) => c.subject === 'brake.ratio')).toBe(true);
    const { brake: _b, ...old } = braked.evaluation;
    const oldEval = { ...old, criticalSpeed: { ...old.criticalSpeed, partlyFixed: undefined } } as unknown as typeof braked.evaluation;
    const subjects = checkMargins(braked.design, oldEval, RULE_SET_2026_12_1.thresholds).map((c) => c.subject);
    expect(subjects).not.toContain('brake.ratio');
    expect(subjects).toContain('criticalSpeed.ratio');
  });
});

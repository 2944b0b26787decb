/**
 * wear-life-design-life: the nut's Archard wear life in running hours against duty.designLife (rule set 2026.12-4; short of
 * it warns, common practice). The wear life itself is tested against hand arithmetic in libs/mechanics (lifting-checks.spec);
 * here the ratio is the engine's running hours over the stated life, and the limit cases use SYNTHETIC hours.
 */
import type { DesignInput } from '@leadline/contracts';
import type { Evaluation } from '@leadline/mechanics';
import { RULE_SET_2026_12_3, RULE_SET_2026_12_4 } from '../rule-set';
import { evaluated, FULL_LIFTING_INPUT, JUST } from '../testing/designs';
import { wearLifeDesignLifeRule } from './wear-life-design-life.rule';

const T4 = RULE_SET_2026_12_4.thresholds;
const WITH_WEAR: DesignInput = {
  ...FULL_LIFTING_INPUT,
  nut: { ...FULL_LIFTING_INPUT.nut, wearCoefficient: { value: '1e-6 mm^3/(N*m)', source: 'pin-on-disc test of an invented laboratory' } },
  duty: { ...FULL_LIFTING_INPUT.duty, designLife: '5000 h' },
};
const e = evaluated(WITH_WEAR);
/** The evaluation with its wear life set to `hours` running hours (SYNTHETIC). */
const atHours = (hours: number): Evaluation => ({ ...e.evaluation, wearLife: { ...e.evaluation.wearLife!, runningHours: hours } });
const judge = (evaluation: Evaluation, thresholds = T4) => wearLifeDesignLifeRule.check({ design: e.design, evaluation, thresholds });

describe('wear-life-design-life', () => {
  it('the design life converts to seconds (5000 h = 1.8e7 s) and the engine gives a wear life in running hours', () => {
    expect(e.design.duty.designLife).toBe(5000 * 3600);
    expect(e.evaluation.wearLife?.runningHours).toBeGreaterThan(0);
  });

  it('just above the design life passes; just below warns (the worn-thread check guards the load), naming the ratio (SYNTHETIC hours)', () => {
    expect(judge(atHours(JUST.above(5000)))).toBeNull();
    const f = judge(atHours(JUST.below(5000)));
    expect(f?.severity).toBe('warning');
    expect(f?.measured as number).toBeCloseTo(1, 5);
    expect(f?.limit).toBe(1);
  });

  it('2,500 running hours against 5,000: 0.5 (hand arithmetic), a warning', () => {
    expect(judge(atHours(2500))?.measured as number).toBeCloseTo(0.5, 12);
  });

  it('no design life, or rule set 2026.12-3: not run', () => {
    const without = evaluated({ ...WITH_WEAR, duty: { ...WITH_WEAR.duty, designLife: undefined } });
    expect(wearLifeDesignLifeRule.check({ design: without.design, evaluation: without.evaluation, thresholds: T4 })).toBeNull();
    expect(judge(atHours(1), RULE_SET_2026_12_3.thresholds)).toBeNull();
  });

  it('without a wear coefficient the wear life is not known: information naming it', () => {
    const plain = evaluated({ ...WITH_WEAR, nut: FULL_LIFTING_INPUT.nut });
    const f = wearLifeDesignLifeRule.check({ design: plain.design, evaluation: plain.evaluation, thresholds: T4 });
    expect(f?.severity).toBe('info');
    expect(f?.message).toContain('nut.wearCoefficient');
  });
});

/**
 * engine-not-computed: every figure the engine could not compute is a finding naming the missing input; blocking on lifting
 * duty under 2026.12-3 (the safe side), information otherwise; the wear life stays information (no design-life input).
 */
import { RULE_SET_2026_12_2, RULE_SET_2026_12_3 } from '../rule-set';
import { evaluated, FULL_LIFTING_INPUT, JACK_INPUT, withDuty } from '../testing/designs';
import { engineNotComputed } from './engine-not-computed.rule';

const T3 = RULE_SET_2026_12_3.thresholds;

describe('engine-not-computed', () => {
  it('the jack without a nut outside diameter, safety nut or cycles blocks on lifting and names each missing input', () => {
    const e = evaluated(JACK_INPUT);
    const f = engineNotComputed({ design: e.design, evaluation: e.evaluation, thresholds: T3 });
    expect(f?.severity).toBe('blocking');
    for (const name of ['nut.outsideDiameter', 'nut.safetyNut', 'duty.cycles']) expect(f?.message).toContain(name);
    expect(f?.measured).toBe(e.evaluation.notComputed?.length);
  });

  it('the same on positioning duty is information', () => {
    const e = evaluated(withDuty(JACK_INPUT, { kind: 'positioning' }));
    expect(engineNotComputed({ design: e.design, evaluation: e.evaluation, thresholds: T3 })?.severity).toBe('info');
  });

  it('only the wear life missing: information even on lifting duty', () => {
    const e = evaluated(FULL_LIFTING_INPUT);
    const only = { ...e.evaluation, notComputed: (e.evaluation.notComputed ?? []).filter((n) => n.subject === 'wearLife') };
    expect(only.notComputed.length).toBe(1);
    expect(engineNotComputed({ design: e.design, evaluation: only, thresholds: T3 })?.severity).toBe('info');
  });

  it('nothing missing: no finding', () => {
    const e = evaluated(FULL_LIFTING_INPUT);
    expect(engineNotComputed({ design: e.design, evaluation: { ...e.evaluation, notComputed: [] }, thresholds: T3 })).toBeNull();
  });

  it('rule set 2026.12-2 does not run it; an evaluation from an engine before 1.2 (no list) gives none, never a throw', () => {
    const e = evaluated(JACK_INPUT);
    expect(engineNotComputed({ design: e.design, evaluation: e.evaluation, thresholds: RULE_SET_2026_12_2.thresholds })).toBeNull();
    const { notComputed: _dropped, ...older } = e.evaluation;
    expect(engineNotComputed({ design: e.design, evaluation: older, thresholds: T3 })).toBeNull();
  });
});

/**
 * engine-not-computed: every figure the engine could not compute is a finding naming the missing input. Under 2026.12-3 on
 * lifting duty an entry critical for lifting safety blocks (nut body, worn thread, fatigue, dynamic factor, brake stopping,
 * a thrust bearing's static rating, the heat of a nut with a temperature limit); every other entry is information
 * ("not computed: give X to check Y"). Common practice on the safe side (DEVELOPERS.md, "Rule set 2026.12-3").
 */
import type { DesignInput } from '@leadline/contracts';
import { RULE_SET_2026_12_2, RULE_SET_2026_12_3 } from '../rule-set';
import { evaluated, FULL_LIFTING_INPUT, JACK_INPUT, withDuty } from '../testing/designs';
import { criticalOnLifting, engineNotComputed, NOT_COMPUTED_CLASSES, notComputedClassOf } from './engine-not-computed.rule';

const T3 = RULE_SET_2026_12_3.thresholds;
const judged = (input: DesignInput) => {
  const e = evaluated(input);
  return { e, f: engineNotComputed({ design: e.design, evaluation: e.evaluation, thresholds: T3 }) };
};
/** The full lifting design with one input taken away (the rest of its engine 1.2 inputs kept). */
const without = (change: (d: DesignInput) => DesignInput) => judged(change(structuredClone(FULL_LIFTING_INPUT)));

describe('engine-not-computed', () => {
  it('the jack without a nut outside diameter, wear limit or cycles blocks on lifting and names each missing input', () => {
    const { e, f } = judged(JACK_INPUT);
    expect(f?.severity).toBe('blocking');
    for (const name of ['nut.outsideDiameter', 'nut.allowableWear or nut.safetyNut', 'duty.cycles']) expect(f?.message).toContain(name);
    expect(f?.measured).toBe(e.evaluation.notComputed?.length);
    expect(f?.subject).toBe('nutBody');
  });

  it('the same on positioning duty is information, each entry as "not computed: give X to check Y"', () => {
    const { e, f } = judged(withDuty(JACK_INPUT, { kind: 'positioning' }));
    expect(f?.severity).toBe('info');
    expect(f?.message).toContain('not computed: give nut.outsideDiameter to check the nut body and flange strength');
    expect(f?.message.match(/not computed: give /g)?.length).toBe(e.evaluation.notComputed?.length);
  });

  it('only the wear life missing: information even on lifting duty', () => {
    const e = evaluated(FULL_LIFTING_INPUT);
    const only = { ...e.evaluation, notComputed: (e.evaluation.notComputed ?? []).filter((n) => n.subject === 'wearLife') };
    expect(only.notComputed.length).toBe(1);
    expect(engineNotComputed({ design: e.design, evaluation: only, thresholds: T3 })?.severity).toBe('info');
  });

  // Each critical input taken from the full lifting design blocks; each non-critical one leaves information only
  it.each<[string, (d: DesignInput) => DesignInput, string]>([
    ['nut.outsideDiameter', (d) => ({ ...d, nut: { ...d.nut, outsideDiameter: undefined, flange: undefined } }), 'nutBody'],
    ['duty.cycles', (d) => ({ ...d, duty: { ...d.duty, cycles: undefined } }), 'fatigue'],
    ['nut.fatigueStrength', (d) => ({ ...d, nut: { ...d.nut, fatigueStrength: undefined } }), 'fatigue.nutThread'],
    ['the speed (dynamic factor and stopping)', (d) => ({ ...d, duty: { ...d.duty, speed: undefined } }), 'dynamics.dynamicFactor'],
    ['nut.safetyNut with no other wear limit', (d) => ({ ...d, nut: { ...d.nut, safetyNut: undefined } }), 'wornThread'],
  ])('without %s it blocks on lifting duty', (_name, change, subject) => {
    const { f } = without(change);
    expect(f?.severity).toBe('blocking');
    expect(f?.subject).toBe(subject);
  });

  it.each<[string, (d: DesignInput) => DesignInput]>([
    ['a safety nut where a wear limit is stated', (d) => ({ ...d, nut: { ...d.nut, safetyNut: undefined, allowableWear: '1 mm' } })],
    ['the brake response time', (d) => ({ ...d, duty: { ...d.duty, brakeResponseTime: undefined } })],
    ['the plain collar allowable', (d) => ({ ...d, collar: { kind: 'annular', outerDiameter: '60 mm', innerDiameter: '42 mm', model: 'uniform-wear' } })],
    ['the duty cycle of a metal nut (no temperature limit)', (d) => ({ ...d, nut: { ...d.nut, maxTemperature: undefined }, duty: { ...d.duty, cyclesPerHour: undefined } })],
  ])('without %s it is information on lifting duty', (_name, change) => {
    const { e, f } = without(change);
    expect(e.evaluation.notComputed?.length).toBeGreaterThan(0);
    expect(f?.severity).toBe('info');
  });

  it('the heat of a nut with a temperature limit (a plastic nut softens and strips) is critical; of a metal nut, not', () => {
    const { e } = without((d) => ({ ...d, duty: { ...d.duty, cyclesPerHour: undefined } }));
    const heat = (e.evaluation.notComputed ?? []).find((n) => n.subject === 'operation.meanPowerLoss');
    expect(heat).toBeDefined();
    expect(criticalOnLifting(e.design, heat!)).toBe(true);
    expect(criticalOnLifting({ ...e.design, nut: { ...e.design.nut, maxTemperature: null } }, heat!)).toBe(false);
  });

  it("a rolling thrust bearing: the static rating missing blocks (load path), the dynamic rating alone is information (life)", () => {
    const { e } = without((d) => ({ ...d, collar: { kind: 'rolling', meanDiameter: '50 mm' } }));
    const entry = (e.evaluation.notComputed ?? []).find((n) => n.subject === 'collarBearing')!;
    expect(criticalOnLifting(e.design, entry)).toBe(true);
    expect(criticalOnLifting(e.design, { ...entry, missing: ['collar.dynamicRating'] })).toBe(false);
  });

  it('a subject without a class is critical (the safe side); every class names what it checks', () => {
    const e = evaluated(FULL_LIFTING_INPUT);
    expect(notComputedClassOf('someNewGroup.figure')).toBeNull();
    expect(criticalOnLifting(e.design, { subject: 'someNewGroup.figure', missing: ['x'], reason: 'y' })).toBe(true);
    for (const c of NOT_COMPUTED_CLASSES) expect(c.checks.length).toBeGreaterThan(0);
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

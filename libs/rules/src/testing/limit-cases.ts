/**
 * Test support only: the cases every rule on one declared check must pass, at, just past and just short of its limit on a
 * SYNTHETIC value set into a real evaluation (hand-set numbers, not the engine's), the earlier rule sets (which do not run
 * it), and an evaluation stored by an engine before 1.2 (the group absent: a finding or nothing, never a throw).
 */
import type { DesignInput } from '@leadline/contracts';
import type { Evaluation } from '@leadline/mechanics';
import type { Rule } from '../rule';
import { RULE_SET_2026_12_1, RULE_SET_2026_12_2, RULE_SET_2026_12_3 } from '../rule-set';
import { evaluated, JUST } from './designs';

export interface LimitCases {
  readonly rule: Rule;
  readonly input: DesignInput;
  /** The rule set's limit as the spec pins it (with its source in the spec) */
  readonly limit: number;
  readonly kind: 'minimum' | 'maximum';
  /** Severity past the limit */
  readonly past: 'blocking' | 'warning';
  /**
   * The evaluation path the check must read (its declared subject on lifting duty), e.g. "dynamics.safetyFactors.nutBody";
   * the value is set there, unless `withValue` sets it where the check derives it from several figures
   */
  readonly subject?: string;
  /** Sets the value the check reads into a copy of the evaluation (for a check whose value is not one figure) */
  readonly withValue?: (e: Evaluation, v: number) => Evaluation;
  /** The engine 1.2 group the check reads, deleted to stand for an older evaluation */
  readonly group: keyof Evaluation;
}

export function limitCases(c: LimitCases): void {
  const e = evaluated(c.input);
  if (!c.withValue && !c.subject) throw new Error(`${c.rule.id}: limitCases needs the subject the check reads, or withValue`);
  const withValue = c.withValue ?? atPath(c.subject as string);

  if (c.subject) {
    it(`reads ${c.subject}`, () => {
      const declarations = c.rule.checks ?? [];
      expect(declarations.map((d) => d.subject({ design: e.design, evaluation: e.evaluation, thresholds: RULE_SET_2026_12_3.thresholds }))).toEqual([c.subject]);
    });
  }
  const judgeAt = (v: number) => c.rule.check({ design: e.design, evaluation: withValue(structuredClone(e.evaluation), v), thresholds: RULE_SET_2026_12_3.thresholds });
  const inside = c.kind === 'minimum' ? JUST.above(c.limit) : JUST.below(c.limit);
  const outside = c.kind === 'minimum' ? JUST.below(c.limit) : JUST.above(c.limit);

  it(`2026.12-3: just inside the limit ${c.limit} passes (SYNTHETIC value)`, () => {
    expect(judgeAt(inside)).toBeNull();
  });

  it(`2026.12-3: just past the limit ${c.limit} is ${c.past}, naming the value and the limit (SYNTHETIC value)`, () => {
    const f = judgeAt(outside);
    expect(f?.severity).toBe(c.past);
    expect(f?.ruleId).toBe(c.rule.id);
    expect(f?.limit).toBe(c.limit);
    expect(f?.measured as number).toBeCloseTo(outside, 9);
  });

  it('2026.12-3: NaN is past the limit (the safe side)', () => {
    expect(judgeAt(Number.NaN)?.severity).toBe(c.past);
  });

  it('rule sets 2026.12-1 and 2026.12-2 do not run it (they judge their revisions as before)', () => {
    for (const rs of [RULE_SET_2026_12_1, RULE_SET_2026_12_2]) {
      expect(c.rule.check({ design: e.design, evaluation: withValue(structuredClone(e.evaluation), outside), thresholds: rs.thresholds })).toBeNull();
    }
  });

  it('an evaluation stored by an engine before 1.2 (no such group) gives a finding or none, never a throw', () => {
    const older = structuredClone(e.evaluation) as unknown as Record<string, unknown>;
    delete older[c.group];
    delete older.dynamics;
    delete older.notComputed;
    const f = c.rule.check({ design: e.design, evaluation: older as unknown as Evaluation, thresholds: RULE_SET_2026_12_3.thresholds });
    if (f !== null) expect(f.measured).toBeNull();
  });
}

/** Sets a value at an evaluation path ("a.b.c") of a copy the caller made. */
function atPath(subject: string): (evaluation: Evaluation, v: number) => Evaluation {
  const path = subject.split('.');
  return (evaluation, v) => {
    let node = evaluation as unknown as Record<string, unknown>;
    for (const key of path.slice(0, -1)) node = node[key] as Record<string, unknown>;
    node[path[path.length - 1]] = v;
    return evaluation;
  };
}

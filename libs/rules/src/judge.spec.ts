/**
 * judge and verdictOf: the behaviour the review workflow relies on, plus properties over a sample of designs
 * evaluated by the real engine (thread sizes ISO 2904 via the engine tables; materials and friction from the
 * engine libraries, sources named there).
 */
import type { Finding } from '@leadline/contracts';
import fc from 'fast-check';
import { judge, verdictOf } from './judge';
import { RULE_REGISTRY } from './registry';
import { DEFAULT_RULE_SET, parseRuleSet, type RuleSet, type Thresholds } from './rule-set';
import { evaluated, FAST_AXIS_INPUT, JACK_INPUT, withDuty } from './testing/designs';
import { designInputArbitrary as designInput } from './testing/arbitrary';
import { checkProperty } from '../../../test/support/property';

const f = (severity: Finding['severity']): Finding => ({
  ruleId: `r-${severity}`, severity, measured: 1, limit: 1, unit: '-', message: 'm', basis: 'common practice', subject: null,
});

const RANK = { clear: 0, 'needs-acknowledgement': 1, blocked: 2 } as const;

describe('verdictOf', () => {
  it.each([
    ['no findings', [], 'clear'],
    ['information only', [f('info')], 'clear'],
    ['a warning', [f('info'), f('warning')], 'needs-acknowledgement'],
    ['a blocking finding among others', [f('warning'), f('blocking'), f('info')], 'blocked'],
  ] as const)('%s -> %s', (_, findings, verdict) => {
    expect(verdictOf(findings)).toBe(verdict);
  });
});

describe('judge', () => {
  it('a lifting screw that does not self-lock and has no brake is blocked', () => {
    const e = evaluated(FAST_AXIS_INPUT);
    const findings = judge(e.design, e.evaluation);
    expect(findings.find((x) => x.ruleId === 'lifting-self-locking')?.severity).toBe('blocking');
    expect(verdictOf(findings)).toBe('blocked');
  });

  it('the same design on positioning duty does not block', () => {
    const e = evaluated(withDuty(FAST_AXIS_INPUT, { kind: 'positioning' }));
    const findings = judge(e.design, e.evaluation);
    expect(findings.filter((x) => x.severity === 'blocking')).toEqual([]);
    expect(findings.find((x) => x.ruleId === 'lifting-self-locking')?.severity).toBe('info');
    expect(verdictOf(findings)).toBe('clear');
  });

  it('the reference jack is clear under the default rule set, with the lifting reminder as information', () => {
    const e = evaluated(JACK_INPUT);
    const findings = judge(e.design, e.evaluation);
    expect(findings.map((x) => `${x.ruleId}:${x.severity}`)).toEqual(['lifting-self-locking:info']);
    expect(verdictOf(findings)).toBe('clear');
  });

  it('reports findings in registry order', () => {
    const e = evaluated({ ...JACK_INPUT, nut: { length: '21 mm', material: 'nylon' }, duty: { ...JACK_INPUT.duty, speed: undefined } });
    const order = RULE_REGISTRY.map((r) => r.id);
    const ids = judge(e.design, e.evaluation).map((x) => x.ruleId);
    expect(ids.length).toBeGreaterThan(3);
    expect([...ids].sort((a, b) => order.indexOf(a) - order.indexOf(b))).toEqual(ids);
  });

  it('a new rule-set version with a stricter buckling factor changes the verdict of a borderline jack', () => {
    // The jack's buckling factor is about 3.65: above the default lifting minimum 3.5, below 4.0.
    const e = evaluated(JACK_INPUT);
    const raw = JSON.parse(JSON.stringify(DEFAULT_RULE_SET)) as RuleSet;
    const next = parseRuleSet({
      ...raw,
      version: '2027.01-1',
      description: 'Lifting column factor raised to 4.0 after a field report of a bent jack screw.',
      thresholds: { ...raw.thresholds, buckling: { minSafetyFactor: { ...raw.thresholds.buckling.minSafetyFactor, lifting: 4.0 } } },
    });
    if (!next.success) throw new Error(JSON.stringify(next.issues));
    const before = judge(e.design, e.evaluation, DEFAULT_RULE_SET);
    const after = judge(e.design, e.evaluation, next.ruleSet);
    expect(verdictOf(before)).toBe('clear');
    expect(verdictOf(after)).toBe('blocked');
    const changed = after.filter((x) => !before.some((y) => JSON.stringify(y) === JSON.stringify(x))).map((x) => x.ruleId);
    expect(changed).toEqual(['column-buckling']);
  });
});

// ---------- properties over a sample of real designs ----------

/** A rule set stricter than the default in every threshold. */
function stricter(t: Thresholds): Thresholds {
  const up = (x: number) => x * 1.2;
  const down = (x: number) => x * 0.8;
  const duty = (d: Thresholds['strength']['minSafetyFactor']) => ({ lifting: up(d.lifting), positioning: up(d.positioning), clamping: up(d.clamping) });
  return {
    selfLocking: { minMargin: up(t.selfLocking.minMargin) },
    strength: { minSafetyFactor: duty(t.strength.minSafetyFactor) },
    buckling: { minSafetyFactor: duty(t.buckling.minSafetyFactor) },
    criticalSpeed: { maxRatio: down(t.criticalSpeed.maxRatio), warnRatio: down(t.criticalSpeed.warnRatio) },
    wear: {
      maxPressureRatio: down(t.wear.maxPressureRatio), warnPressureRatio: down(t.wear.warnPressureRatio),
      maxPvRatio: down(t.wear.maxPvRatio), warnPvRatio: down(t.wear.warnPvRatio),
    },
    drive: { minMargin: up(t.drive.minMargin), warnMargin: up(t.drive.warnMargin) },
    friction: { minThreadSpreadRatio: up(t.friction.minThreadSpreadRatio) },
    engagedThreads: { min: up(t.engagedThreads.min), max: down(t.engagedThreads.max) },
    ...(t.nutThreads ? { nutThreads: { minSafetyFactor: duty(t.nutThreads.minSafetyFactor) } } : {}),
    ...(t.brake ? { brake: { minHoldingFactor: up(t.brake.minHoldingFactor) } } : {}),
    ...(t.missingValues ? { missingValues: t.missingValues } : {}), // a policy, not a number: kept as it is
  };
}

/** A property with the run's seed (test/support/property.ts prints it with any failure). */
const assertSeeded = <T>(prop: fc.IProperty<T>, numRuns: number): void => checkProperty(prop, { numRuns });

describe('judge over a sample of designs (property)', () => {
  const RUNS = 100;
  const ids = new Set(RULE_REGISTRY.map((r) => r.id));

  it('every finding is well formed: registered rule id, once each, non-empty basis, message without NaN', () => {
    assertSeeded(
      fc.property(designInput, (input) => {
        const e = evaluated(input);
        const findings = judge(e.design, e.evaluation);
        const seen = new Set<string>();
        for (const x of findings) {
          expect(ids.has(x.ruleId)).toBe(true);
          expect(seen.has(x.ruleId)).toBe(false);
          seen.add(x.ruleId);
          expect(x.basis.trim().length).toBeGreaterThan(0);
          expect(x.message.trim().length).toBeGreaterThan(0);
          expect(x.message).not.toMatch(/NaN|undefined|null|Infinity/);
          expect(['blocking', 'warning', 'info']).toContain(x.severity);
        }
      }),
      RUNS,
    );
  });

  it('is deterministic, and judges a stored (JSON round-tripped) record the same', () => {
    assertSeeded(
      fc.property(designInput, (input) => {
        const e = evaluated(input);
        const first = judge(e.design, e.evaluation);
        expect(judge(e.design, e.evaluation)).toEqual(first);
        const stored = JSON.parse(JSON.stringify(e)) as typeof e;
        expect(judge(stored.design, stored.evaluation)).toEqual(first);
      }),
      50,
    );
  });

  it('the same design on positioning duty is never judged worse than on lifting duty', () => {
    assertSeeded(
      fc.property(designInput, (input) => {
        const lifting = evaluated(withDuty(input, { kind: 'lifting' }));
        const positioning = evaluated(withDuty(input, { kind: 'positioning' }));
        const vl = verdictOf(judge(lifting.design, lifting.evaluation));
        const vp = verdictOf(judge(positioning.design, positioning.evaluation));
        expect(RANK[vp]).toBeLessThanOrEqual(RANK[vl]);
        const selfLocking = judge(positioning.design, positioning.evaluation).find((x) => x.ruleId === 'lifting-self-locking');
        expect(selfLocking?.severity ?? 'info').toBe('info');
      }),
      RUNS,
    );
  });

  it('a stricter rule set never gives a better verdict (what an impact report relies on)', () => {
    const strict = parseRuleSet({ version: '2027.01-1', description: 'every threshold 20 % stricter', thresholds: stricter(DEFAULT_RULE_SET.thresholds) });
    if (!strict.success) throw new Error(JSON.stringify(strict.issues));
    assertSeeded(
      fc.property(designInput, (input) => {
        const e = evaluated(input);
        const base = verdictOf(judge(e.design, e.evaluation));
        const tightened = verdictOf(judge(e.design, e.evaluation, strict.ruleSet));
        expect(RANK[tightened]).toBeGreaterThanOrEqual(RANK[base]);
      }),
      RUNS,
    );
  });
});

import { BUILT_IN_RULE_SETS, DEFAULT_RULE_SET, RULE_SET_2026_12_1, RULE_SET_2026_12_2, RULE_SET_2026_12_3, nutThreadMinSafetyFactor, parseRuleSet, ruleSetDefinitionSchema } from './rule-set';

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

describe('rule-set definition', () => {
  it('the default rule set is version 2026.12-3 and passes its own schema', () => {
    expect(DEFAULT_RULE_SET.version).toBe('2026.12-3');
    expect(ruleSetDefinitionSchema.parse(RULE_SET_2026_12_3)).toEqual(RULE_SET_2026_12_3);
    expect(ruleSetDefinitionSchema.parse(DEFAULT_RULE_SET)).toEqual(DEFAULT_RULE_SET);
  });

  it('2026.12-1 stays built in and parses to itself, without the groups added in 2026.12-2', () => {
    expect(BUILT_IN_RULE_SETS.map((r) => r.version)).toEqual(['2026.12-1', '2026.12-2', '2026.12-3', '2026.12-4']);
    const stored = clone(RULE_SET_2026_12_1); // as stored in rule_sets.definition (JSON)
    expect(Object.keys(stored.thresholds)).not.toContain('nutThreads');
    expect(Object.keys(stored.thresholds)).not.toContain('missingValues');
    const parsed = parseRuleSet(stored);
    expect(parsed.success).toBe(true);
    if (parsed.success) expect(parsed.ruleSet).toEqual(stored);
  });

  it('2026.12-2 parses to itself without the groups added in 2026.12-3 (it judges its revisions as before)', () => {
    const stored = clone(RULE_SET_2026_12_2);
    for (const group of ['dynamicFactor', 'nutBody', 'safetyNut', 'nutTemperature', 'stopping', 'fatigue', 'collarBearing', 'notComputed']) {
      expect(Object.keys(stored.thresholds)).not.toContain(group);
    }
    const parsed = parseRuleSet(stored);
    expect(parsed.success).toBe(true);
    if (parsed.success) expect(parsed.ruleSet).toEqual(stored);
  });

  it('2026.12-3 keeps every 2026.12-2 threshold', () => {
    for (const [group, values] of Object.entries(RULE_SET_2026_12_2.thresholds)) {
      expect((RULE_SET_2026_12_3.thresholds as Record<string, unknown>)[group]).toEqual(values);
    }
  });

  it('2026.12-2 keeps every 2026.12-1 threshold', () => {
    for (const [group, values] of Object.entries(RULE_SET_2026_12_1.thresholds)) {
      expect((DEFAULT_RULE_SET.thresholds as Record<string, unknown>)[group]).toEqual(values);
    }
  });

  it("nut-thread factors fall back to the screw-thread strength minimum where a version lacks them", () => {
    expect(nutThreadMinSafetyFactor(RULE_SET_2026_12_1.thresholds)).toEqual(RULE_SET_2026_12_1.thresholds.strength.minSafetyFactor);
    expect(nutThreadMinSafetyFactor(DEFAULT_RULE_SET.thresholds)).toEqual(DEFAULT_RULE_SET.thresholds.nutThreads?.minSafetyFactor);
  });

  it('lifting limits are stricter than positioning and clamping limits by default', () => {
    const { strength, buckling } = DEFAULT_RULE_SET.thresholds;
    for (const byDuty of [strength.minSafetyFactor, buckling.minSafetyFactor]) {
      expect(byDuty.lifting).toBeGreaterThan(byDuty.positioning);
      expect(byDuty.lifting).toBeGreaterThan(byDuty.clamping);
    }
  });

  it('rejects unknown keys at the top and inside thresholds (strict)', () => {
    expect(parseRuleSet({ ...DEFAULT_RULE_SET, author: 'x' }).success).toBe(false);
    const nested = clone(DEFAULT_RULE_SET) as unknown as { thresholds: { drive: Record<string, number> } };
    nested.thresholds.drive.maxMargin = 3;
    const r = parseRuleSet(nested);
    expect(r.success).toBe(false);
    if (!r.success) expect(r.issues[0]?.path).toBe('thresholds.drive');
  });

  it('rejects a missing threshold, with its path', () => {
    const missing = clone(DEFAULT_RULE_SET) as unknown as { thresholds: { wear: Record<string, number> } };
    delete missing.thresholds.wear.maxPvRatio;
    const r = parseRuleSet(missing);
    expect(r.success).toBe(false);
    if (!r.success) expect(r.issues.map((i) => i.path)).toContain('thresholds.wear.maxPvRatio');
  });

  it('rejects a warning band beyond its blocking limit', () => {
    const bad = clone(DEFAULT_RULE_SET);
    const t = bad.thresholds as { criticalSpeed: { warnRatio: number; maxRatio: number } };
    t.criticalSpeed.warnRatio = 0.9;
    const r = parseRuleSet(bad);
    expect(r.success).toBe(false);
    if (!r.success) expect(r.issues.map((i) => i.path)).toContain('thresholds.criticalSpeed.warnRatio');
  });

  it('rejects factors of safety below 1 and versions outside our naming', () => {
    const weak = clone(DEFAULT_RULE_SET);
    (weak.thresholds.strength.minSafetyFactor as { lifting: number }).lifting = 0.9;
    expect(parseRuleSet(weak).success).toBe(false);
    expect(parseRuleSet({ ...DEFAULT_RULE_SET, version: 'v2' }).success).toBe(false);
    expect(parseRuleSet({ ...DEFAULT_RULE_SET, version: '2027.13-1' }).success).toBe(false);
    expect(parseRuleSet({ ...DEFAULT_RULE_SET, version: '2027.01-2' }).success).toBe(true);
  });

  it('requires a description of what changed', () => {
    expect(parseRuleSet({ ...DEFAULT_RULE_SET, description: '  ' }).success).toBe(false);
  });
});

/**
 * The default thresholds, pinned as literals with their basis: the rule specs read their limits from
 * the default rule set, so without this test a changed default would pass them silently. Changing a number here is a
 * new rule-set version (never an edit of a stored one) and needs its basis stated in rule-set.ts.
 */
import { BUILT_IN_RULE_SETS, DEFAULT_RULE_SET, RULE_SET_2026_12_1, RULE_SET_2026_12_2, RULE_SET_2026_12_3, RULE_SET_2026_12_4 } from './rule-set';

/** The thresholds of 2026.12-1, each with its basis (rule-set.ts states the same). */
const PINNED_2026_12_1 = {
  // common practice: keeps holding through dry -> oiled (Shigley 9th ed. Table 8-5 steel/bronze 0.15 -> 0.10, ratio 1.5)
  selfLocking: { minMargin: 1.5 },
  // common practice by analogy with ASME BTH-1 design factors 3.00 (Category B) and 2.00 (Category A), from memory
  strength: { minSafetyFactor: { lifting: 3.0, positioning: 2.0, clamping: 2.0 } },
  // common practice: strength factor + 0.5 (end fixity, crookedness, eccentricity; Shigley 9th ed. Table 4-2 note)
  buckling: { minSafetyFactor: { lifting: 3.5, positioning: 2.5, clamping: 2.5 } },
  // common practice: run below 80 % of the first critical speed, warn from 60 % (shared reference columns-and-speed.md 3.4)
  criticalSpeed: { maxRatio: 0.8, warnRatio: 0.6 },
  // handbook allowables are already safe values (Shigley 9th ed. Table 8-4, from memory; Mott Table 16-1): block above
  // them, warn within 20 % (common practice)
  wear: { maxPressureRatio: 1.0, warnPressureRatio: 0.8, maxPvRatio: 1.0, warnPvRatio: 0.8 },
  // common practice: 25 % torque reserve, warn below 50 %
  drive: { minMargin: 1.25, warnMargin: 1.5 },
  // common practice: narrowest Shigley 9th ed. Table 8-5 thread range, steel/brass dry 0.15-0.19 (max/min 1.27)
  friction: { minThreadSpreadRatio: 1.25 },
  // Shigley 10th ed. Sec. 8-2 after Marshek (from memory): first three threads carry 0.38, 0.25, 0.18 of the load
  engagedThreads: { min: 4, max: 10 },
};

describe('default thresholds, pinned with their basis', () => {
  it('2026.12-1 is kept exactly as first published (revisions judged under it keep their meaning)', () => {
    expect(RULE_SET_2026_12_1.version).toBe('2026.12-1');
    expect(RULE_SET_2026_12_1.thresholds).toEqual(PINNED_2026_12_1);
  });

  it('2026.12-2 is kept: every 2026.12-1 threshold, plus the groups it adds', () => {
    expect(RULE_SET_2026_12_2.version).toBe('2026.12-2');
    expect(RULE_SET_2026_12_2.thresholds).toEqual({
      ...PINNED_2026_12_1,
      // engine 1.1: the nut's own threads take the screw threads' factors (common practice, as strength above)
      nutThreads: { minSafetyFactor: { lifting: 3.0, positioning: 2.0, clamping: 2.0 } },
      // engine 1.1: on lifting duty a strength check that cannot be computed blocks (the safe side)
      missingValues: { onLifting: 'blocking' },
      // engine 1.1: brake rated torque at least 2 x F l / (2 pi) at its shaft (common practice)
      brake: { minHoldingFactor: 2 },
    });
  });

  it('2026.12-3 is the start default; it keeps every 2026.12-2 threshold, plus the groups of the engine 1.2 checks', () => {
    expect(DEFAULT_RULE_SET).toBe(RULE_SET_2026_12_3);
    expect(RULE_SET_2026_12_3.thresholds).toEqual({
      ...RULE_SET_2026_12_2.thresholds,
      // strength on lifting duty with the dynamic factor phi_2 (EN 13001-2 Sec. 4.2.2.2, from memory)
      dynamicFactor: { onLifting: true },
      // nut body and flange: the strength factors (common practice, ASME BTH-1 analogy, from memory)
      nutBody: { minSafetyFactor: { lifting: 3.0, positioning: 2.0, clamping: 2.0 } },
      // safety nut: the lifting minimum 3.0 whatever the duty; worn main nut: the strength factors (common practice)
      safetyNut: { minSafetyFactor: 3.0, minWornSafetyFactor: { lifting: 3.0, positioning: 2.0, clamping: 2.0 } },
      // nut temperature at or below the material limit (common practice)
      nutTemperature: { minTemperatureMargin: 0 },
      // a brake must stop a descending load (common practice)
      stopping: { mustStop: true },
      // Goodman factor 1.5 (common practice)
      fatigue: { minSafetyFactor: 1.5 },
      // collar pressure within its allowable; rolling thrust bearing s_0 >= 1 (ISO 76, from memory; common practice)
      collarBearing: { maxPressureRatio: 1, minStaticSafetyFactor: 1 },
      // a figure the engine could not compute blocks on lifting duty (the safe side)
      notComputed: { onLifting: 'blocking' },
    });
  });

  it('2026.12-4 keeps every 2026.12-3 threshold, plus the design-life group', () => {
    expect(RULE_SET_2026_12_4.version).toBe('2026.12-4');
    expect(RULE_SET_2026_12_4.thresholds).toEqual({
      ...RULE_SET_2026_12_3.thresholds,
      // wear life and bearing L10 life at least the design life, else a warning (common practice)
      designLife: { minLifeRatio: 1 },
    });
  });

  it('the service stores every built-in version, oldest first', () => {
    expect(BUILT_IN_RULE_SETS.map((r) => r.version)).toEqual(['2026.12-1', '2026.12-2', '2026.12-3', '2026.12-4']);
  });
});

/**
 * One source for every check (libs/rules/src/check.ts): over generated designs of every thread form and duty, the
 * report's governing check and lowest strength factor, the screw search's candidates and judge()'s blocking
 * findings all agree with the evaluation's `checks`. Properties of the wiring (the figures themselves are the
 * engine's, tested against published examples in libs/mechanics); seeded by test/support/property.ts.
 */
import { parseDesign } from '@leadline/contracts';
import { evaluate } from '@leadline/mechanics';
import { judgeWithChecks, RULE_SET_2026_12_1, RULE_SET_2026_12_2, verdictOf, type Check, type RuleSet } from '@leadline/rules';
import { parseSizingRequest, searchScrews } from '@leadline/sizing';
import fc from 'fast-check';
import { designInputArbitrary } from '../../../../libs/rules/src/testing/arbitrary';
import { checkProperty } from '../../../../test/support/property';
import { requirementsArbitrary } from '../../../../test/support/sizing';
import { harrowgateReportInput } from './fixtures/harrowgate.fixture';
import { formatQuantity } from '@leadline/presentation';
import { buildReportView } from './report-model';

/**
 * The oracle, written from the contract's words and independent of the code under test: the governing check is the
 * one furthest past its limit when any fails (a failing check without a value first), else the one nearest to its
 * limit; checks without a value that do not fail never govern.
 */
function expectedGoverning(checks: readonly Check[]): Check | null {
  const times = (c: Check) => (c.value === null || Number.isNaN(c.value) ? -Infinity : c.limitKind === 'minimum' ? c.value / c.limit : c.limit / c.value);
  const failing = checks.filter((c) => c.status === 'fail');
  const pool = failing.length > 0 ? failing : checks.filter((c) => c.value !== null);
  let best: Check | null = null;
  for (const c of pool) if (best === null || times(c) < times(best)) best = c;
  return best;
}

/** The lowest factor over the strength checks with a value (group 'strength'). */
function expectedLowestStrength(checks: readonly Check[]): Check | null {
  let best: Check | null = null;
  for (const c of checks) if (c.group === 'strength' && c.value !== null && (best === null || c.value < (best.value as number))) best = c;
  return best;
}

const RULE_SETS: readonly RuleSet[] = [RULE_SET_2026_12_1, RULE_SET_2026_12_2];
const summaryRow = (rows: readonly { label: string; value: string; note?: string }[], label: string) => rows.find((r) => r.label === label);

describe('every view of a check derives from the declarations (property, seeded)', () => {
  it('report summary, factor table and judge() agree with the checks over 200+ generated designs', () => {
    const base = harrowgateReportInput();
    let judged = 0;
    let withFailure = 0;
    checkProperty(
      fc.property(designInputArbitrary, fc.constantFrom(...RULE_SETS), (input, ruleSet) => {
        const parsed = parseDesign(input);
        if (!parsed.success) return; // the generator's rare out-of-range combination: nothing to judge
        const evaluation = evaluate(parsed.design);
        const { findings, checks, governing } = judgeWithChecks(parsed.design, evaluation, ruleSet);
        judged++;
        if (checks.some((c) => c.status === 'fail')) withFailure++;

        // judge()'s blocking findings are exactly the checks past their limits (numeric checks; the rest of the rules'
        // blocking findings, such as vibration without a brake, are declared failures of a check too)
        const blocking = new Set(findings.filter((f) => f.severity === 'blocking').map((f) => f.ruleId));
        const failing = new Set(checks.filter((c) => c.status === 'fail').map((c) => c.ruleId));
        expect([...blocking].sort()).toEqual([...failing].sort());
        // a check past its warning level has a finding of its rule (never silently passed)
        for (const c of checks.filter((x) => x.status === 'warning')) expect(findings.some((f) => f.ruleId === c.ruleId)).toBe(true);
        expect(governing).toEqual(expectedGoverning(checks));

        // the report of this design: the summary's governing check and lowest strength factor, and its factor table
        const system = parsed.design.unitSystem === 'US' ? 'US' : 'SI';
        const view = buildReportView({
          ...base,
          revision: { ...base.revision, input, normalized: parsed.design, evaluation: { ...evaluation, findings }, findings, verdict: verdictOf(findings), ruleSetVersion: ruleSet.version },
          checks,
        });
        expect(view.safetyFactors.map((r) => [r.key, r.value, r.limit])).toEqual(checks.map((c) => [c.id, c.value, c.limit]));
        const g = expectedGoverning(checks);
        const gRow = summaryRow(view.summary, 'Governing check');
        if (g === null) expect(gRow).toBeUndefined();
        else expect(gRow?.note?.startsWith(`${g.label}:`)).toBe(true);
        const lowest = expectedLowestStrength(checks);
        const lRow = summaryRow(view.summary, 'Lowest strength safety factor');
        if (lowest === null) expect(lRow).toBeUndefined();
        else {
          expect(lRow?.value).toBe(formatQuantity(lowest.value as number, 'ratio', system));
          expect(lRow?.note?.startsWith(lowest.label)).toBe(true);
        }
      }),
      { numRuns: 240 },
    );
    // the sample is what the property claims: at least 200 judged designs, passing and failing ones
    expect(judged).toBeGreaterThanOrEqual(200);
    expect(withFailure).toBeGreaterThan(20);
    expect(withFailure).toBeLessThan(judged);
  });

  it('a search candidate shows the checks, governing check and lowest strength factor its design is answered with', () => {
    let compared = 0;
    checkProperty(
      fc.property(requirementsArbitrary, (requirements) => {
        const p = parseSizingRequest({ requirements, search: { forms: ['trapezoidal'], starts: [1], majorDiameter: { min: '20 mm', max: '40 mm' }, limit: 3 } });
        if (!p.success) return;
        const result = searchScrews(p.plan, RULE_SET_2026_12_2);
        for (const c of result.candidates) {
          const parsed = parseDesign(c.design);
          if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
          // what POST /api/v1/evaluations answers for the candidate's design (AssessmentService: judgeWithChecks)
          const answered = judgeWithChecks(parsed.design, evaluate(parsed.design), RULE_SET_2026_12_2);
          expect(c.checks).toEqual(answered.checks);
          expect(c.governing?.id).toBe(answered.governing?.id);
          expect(c.governing?.value).toBe(answered.governing?.value);
          const lowest = expectedLowestStrength(answered.checks);
          expect(c.figures.lowestStrengthSafetyFactor).toBe(lowest?.value);
          expect(c.figures.lowestStrengthCheck).toBe(lowest?.label);
          compared++;
        }
      }),
      { numRuns: 30 },
    );
    expect(compared).toBeGreaterThan(10);
  });
});

/**
 * The pure search: its pruning claim, its counts and its request validation. The end-to-end checks against
 * POST /api/v1/evaluations live in test/sizing/sizing.e2e-spec.ts.
 */
import fc from 'fast-check';
import { parseDesign } from '@leadline/contracts';
import { evaluate, THREAD_SIZES } from '@leadline/mechanics';
import { DEFAULT_RULE_SET, judge, NUT_INDEPENDENT_RULES } from '@leadline/rules';
import { IMPOSSIBLE, LEAD_SCREW, requirementsArbitrary, TEXTBOOK_JACK } from '../../../test/support/sizing';
import { firstBlockingRule } from './checks';
import { candidateInput, parseSizingRequest, type SizingPlan } from './request';
import { floorSignificant, searchScrews } from './search';
import { checkProperty } from '../../../test/support/property';

function plan(raw: unknown): SizingPlan {
  const p = parseSizingRequest(raw);
  if (!p.success) throw new Error(JSON.stringify(p.issues));
  return p.plan;
}

describe('pruning', () => {
  it('rules treated as nut-independent give the same findings at every nut length (property, seeded)', () => {
    const sizes = THREAD_SIZES.filter((s) => s.form === 'trapezoidal' || s.form === 'acme');
    checkProperty(
      fc.property(requirementsArbitrary, fc.constantFrom(...sizes), fc.integer({ min: 1, max: 4 }), (requirements, size, starts) => {
        const p = plan({ requirements });
        const seen = [1, 1.5, 2.5, 4].map((ratio) => {
          const parsed = parseDesign(candidateInput(p, size, starts, ratio));
          if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
          const findings = judge(parsed.design, evaluate(parsed.design), DEFAULT_RULE_SET);
          return JSON.stringify(findings.filter((f) => NUT_INDEPENDENT_RULES.has(f.ruleId)).map((f) => [f.ruleId, f.severity, f.measured]));
        });
        expect(new Set(seen).size).toBe(1);
      }),
      { numRuns: 150 },
    );
  });

  it('the pruned search counts every candidate exactly as evaluating each one would', () => {
    const p = plan({ requirements: TEXTBOOK_JACK, search: { majorDiameter: { max: '60 mm' } } });
    const r = searchScrews(p, DEFAULT_RULE_SET);
    const exhaustive: Record<string, number> = {};
    let passed = 0;
    for (const size of p.sizes) {
      for (const starts of p.starts) {
        for (const ratio of p.nutLengthRatios) {
          const parsed = parseDesign(candidateInput(p, size, starts, ratio));
          if (!parsed.success) throw new Error('invalid');
          const rule = firstBlockingRule(judge(parsed.design, evaluate(parsed.design), DEFAULT_RULE_SET));
          if (rule === null) passed++;
          else exhaustive[rule] = (exhaustive[rule] ?? 0) + 1;
        }
      }
    }
    expect(r.rejected).toEqual(exhaustive);
    expect(r.passed).toBe(passed);
    expect(r.searched).toBe(p.sizes.length * p.starts.length * p.nutLengthRatios.length);
    expect(r.pruned).toBeGreaterThan(0);
    expect(r.evaluations + r.pruned).toBe(r.searched);
  });

  it('impossible requirements are answered with no candidates, every one counted in rejected', () => {
    const r = searchScrews(plan({ requirements: IMPOSSIBLE }), DEFAULT_RULE_SET);
    expect(r.candidates).toEqual([]);
    expect(Object.values(r.rejected).reduce((a, b) => a + b, 0)).toBe(r.searched);
    expect(r.headroom).toEqual([]);
  });
});

describe('headroom', () => {
  it('passes at the headroom load and blocks at 1 % more (property over random requirements, seeded)', () => {
    checkProperty(
      fc.property(requirementsArbitrary, (requirements) => {
        const p = plan({ requirements, search: { majorDiameter: { max: '50 mm' } } });
        const r = searchScrews(p, DEFAULT_RULE_SET);
        expect(r.headroom).toHaveLength(Math.min(3, r.candidates.length));
        for (const h of r.headroom) {
          const c = r.candidates[h.rank - 1];
          const at = (load: number) => {
            const parsed = parseDesign({ ...c.design, load: { ...c.design.load, axial: `${load} N` } });
            if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
            return judge(parsed.design, evaluate(parsed.design), DEFAULT_RULE_SET);
          };
          const F = parseFloat(h.axialLoad as string);
          expect(at(F).some((f) => f.severity === 'blocking')).toBe(false);
          expect(at(F * 1.01).filter((f) => f.severity === 'blocking').map((f) => f.ruleId)).toContain(h.blockedBy);
        }
      }),
      { numRuns: 25 },
    );
  });
});

describe('request validation', () => {
  it('names the leaf field inside a choice and in the search', () => {
    const p = parseSizingRequest({ requirements: { ...LEAD_SCREW, collar: { kind: 'rolling', meanDiameterRatio: 0.4 } } });
    expect(p.success).toBe(false);
    if (!p.success) expect(p.issues.map((i) => i.path)).toEqual(['requirements.collar.meanDiameterRatio']);
    const q = parseSizingRequest({ requirements: { ...LEAD_SCREW, load: { axial: '3 kg', sense: 'tension' } }, search: { majorDiameter: { min: '50 mm', max: '20 mm' } } });
    expect(q.success).toBe(false);
    if (!q.success) expect(q.issues.map((i) => i.path).sort()).toEqual(['requirements.load.axial', 'search.majorDiameter.min']);
  });

  it('applies the defaults: trapezoidal and Acme, 1 to 4 starts, four nut lengths', () => {
    const p = plan({ requirements: LEAD_SCREW });
    expect(new Set(p.sizes.map((s) => s.form))).toEqual(new Set(['trapezoidal', 'acme']));
    expect(p.starts).toEqual([1, 2, 3, 4]);
    expect(p.nutLengthRatios).toEqual([1.5, 2, 2.5, 3]);
    expect(p.objective).toBe('smallest-diameter');
  });
});

describe('floorSignificant', () => {
  it('rounds down to 5 significant figures and never up', () => {
    expect(floorSignificant(87684.99, 5)).toBe(87684);
    expect(floorSignificant(1234567, 5)).toBe(1234500);
    checkProperty(fc.property(fc.double({ min: 1, max: 1e9, noNaN: true }), (x) => floorSignificant(x, 5) <= x && floorSignificant(x, 5) >= x * (1 - 1e-4)), { numRuns: 100 });
  });
});

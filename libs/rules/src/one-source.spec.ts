/**
 * Which checks exist, their limits, when they apply and which governs is stated once, by the rules
 * (check.ts and each rule's declarations; STYLE.md "One source for each piece of knowledge"). This test reads the
 * sources outside libs/rules and fails on a second copy: a rule id written as a literal, a rule-id constant imported
 * to build a list, or a threshold of the rule set looked up directly.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { FORMULAS } from '@leadline/mechanics';
import { RULE_REGISTRY } from './registry';

const ROOT = join(__dirname, '../../..');
const SCANNED = ['apps', 'libs/sizing', 'libs/contracts', 'libs/mechanics', 'templates', 'bench'];

/**
 * Files that hold rule ids as data, not as knowledge of the checks: a revision as it was recorded by an earlier engine
 * (seed/recorded-history.ts) and test fixtures that acknowledge findings by rule id (reports/fixtures/).
 */
const DATA_FILES = [/^apps\/api\/src\/seed\/recorded-history\.ts$/, /^apps\/api\/src\/reports\/fixtures\//];

function sources(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) sources(path, out);
    else if (/\.(ts|js|hbs)$/.test(name) && !/\.spec\.ts$/.test(name)) out.push(path);
  }
  return out;
}

const files = SCANNED.flatMap((d) => sources(join(ROOT, d)))
  .map((path) => ({ path: relative(ROOT, path), text: readFileSync(path, 'utf8') }))
  .filter((f) => !DATA_FILES.some((re) => re.test(f.path)));

describe('checks are declared once, by the rules', () => {
  it('scans the sources it claims to (sanity)', () => {
    expect(files.length).toBeGreaterThan(50);
    expect(files.some((f) => f.path === 'apps/api/src/reports/report-model.ts')).toBe(true);
  });

  it('no rule id is written as a literal outside libs/rules (formula ids of the same name excepted)', () => {
    const found: string[] = [];
    for (const rule of RULE_REGISTRY) {
      const literal = new RegExp(`['"\`]${rule.id}['"\`]`, 'g');
      for (const f of files) {
        for (const m of f.text.matchAll(literal)) {
          // A formula registered under the same name (e.g. nut-bearing-pressure) is a formula id, not a rule id
          const line = f.text.slice(f.text.lastIndexOf('\n', m.index) + 1, f.text.indexOf('\n', m.index));
          const formulaUse = rule.id in FORMULAS && /entry\(|\bid: |^\s*'[a-z-]+': \{ result/.test(line);
          if (!formulaUse) found.push(`${f.path}: ${line.trim()}`);
        }
      }
    }
    expect(found).toEqual([]);
  });

  it('no list of checks is built from rule-id constants outside libs/rules', () => {
    const constant = /\b[A-Z][A-Z_]*_ID\b/g;
    const ids = new Set(
      Object.entries(require('./index') as Record<string, unknown>)
        .filter(([k, v]) => k.endsWith('_ID') && typeof v === 'string')
        .map(([k]) => k),
    );
    expect(ids.size).toBe(RULE_REGISTRY.length);
    const found = files.flatMap((f) => [...f.text.matchAll(constant)].filter((m) => ids.has(m[0])).map((m) => `${f.path}: ${m[0]}`));
    expect(found).toEqual([]);
  });

  it('no threshold of the rule set is looked up outside libs/rules', () => {
    const lookup = /\bthresholds\.[a-zA-Z]|\b(minSafetyFactor|maxPressureRatio|warnPressureRatio|maxPvRatio|warnPvRatio|minHoldingFactor|minMargin|warnMargin|maxRatio|warnRatio)\b|nutThreadMinSafetyFactor|brakeMinHoldingFactor/g;
    const found = files.flatMap((f) => [...f.text.matchAll(lookup)].map((m) => `${f.path}: ${m[0]}`));
    expect(found).toEqual([]);
  });
});

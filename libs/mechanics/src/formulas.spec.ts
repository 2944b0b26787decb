/**
 * The formula registry: every formula is data with an equation and a named source (STYLE.md, "A formula is also
 * data"), and docs/formulas.md documents every registered id.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { formula, FORMULAS } from './formulas';

const entries = Object.entries(FORMULAS);

describe('formula registry', () => {
  it('is not empty and is keyed by each formula id', () => {
    expect(entries.length).toBeGreaterThan(40);
    for (const [key, f] of entries) expect(f.id).toBe(key);
  });

  it.each(entries.map(([id, f]) => [id, f] as const))('%s has a symbol, an equation and a named source', (_id, f) => {
    expect(f.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
    expect(f.symbol.trim()).not.toBe('');
    expect(f.equation.trim()).not.toBe('');
    expect(f.source.trim()).not.toBe('');
    // a source names a book, a standard, a textbook section, or says plainly that it is common practice
    expect(f.source).toMatch(/ed\.|ISO|ASME|DIN|Thomson|Mott|Sec\.|Eq\.|common practice/);
  });

  it('lookup returns the registered formula and throws on an unknown id', () => {
    expect(formula('thread-raise-torque')).toBe(FORMULAS['thread-raise-torque']);
    expect(() => formula('no-such-formula')).toThrow(/no formula registered as "no-such-formula"/);
  });

  it('docs/formulas.md lists every registered formula id with its equation', () => {
    const doc = readFileSync(join(__dirname, '../../../docs/formulas.md'), 'utf8');
    const missing = entries.filter(([id, f]) => !doc.includes(`\`${id}\``) || !doc.includes(f.equation.replace(/\|/g, '\\|'))).map(([id]) => id);
    expect(missing).toEqual([]);
  });
});

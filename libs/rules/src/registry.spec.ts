import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { RULE_REGISTRY, RULES, findRule } from './registry';

describe('rule registry', () => {
  it('rule ids are unique kebab-case names', () => {
    const ids = RULE_REGISTRY.map((r) => r.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[a-z]+(-[a-z]+)+$/);
  });

  it('every rule lives in its own file rules/<rule-id>.rule.ts', () => {
    for (const { id } of RULE_REGISTRY) expect(existsSync(join(__dirname, 'rules', `${id}.rule.ts`))).toBe(true);
  });

  it('every rule has a title, a description and a non-empty basis', () => {
    for (const r of RULE_REGISTRY) {
      expect(r.title.trim()).not.toBe('');
      expect(r.description.trim()).not.toBe('');
      expect(r.basis.trim().length).toBeGreaterThan(10);
    }
  });

  it('RULES lists id, title, basis and description of every rule, in registry order, without the check', () => {
    expect(RULES.map((r) => r.id)).toEqual(RULE_REGISTRY.map((r) => r.id));
    for (const r of RULES) expect(Object.keys(r).sort()).toEqual(['basis', 'description', 'id', 'title']);
  });

  it('findRule finds by id', () => {
    expect(findRule('lifting-self-locking')?.title).toMatch(/lifting/i);
    expect(findRule('no-such-rule')).toBeUndefined();
  });
});

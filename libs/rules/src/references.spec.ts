/**
 * Code, comments and texts a user reads cite published sources and the repository's own docs (STYLE.md "One source for
 * each piece of knowledge"), never a planning item's number or a file outside the repository. This test reads every
 * source, template, test and doc of the repository and fails on either.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

const ROOT = join(__dirname, '../../..');
const SCANNED = ['apps', 'libs', 'templates', 'test', 'docs', 'migrations', 'bench', 'docker', 'README.md', 'DEVELOPERS.md'];

function files(path: string, out: string[] = []): string[] {
  if (statSync(path).isDirectory()) {
    for (const name of readdirSync(path)) if (name !== 'node_modules') files(join(path, name), out);
  } else if (/\.(ts|js|hbs|md|sql|css|json|yml|sh)$/.test(path)) out.push(path);
  return out;
}

const texts = SCANNED.flatMap((p) => files(join(ROOT, p))).map((path) => ({ path: relative(ROOT, path), text: readFileSync(path, 'utf8') }));
// This file names the patterns it looks for
const scanned = texts.filter((f) => f.path !== 'libs/rules/src/references.spec.ts');

function hits(pattern: RegExp): string[] {
  const found: string[] = [];
  for (const f of scanned) {
    for (const m of f.text.matchAll(pattern)) {
      const line = f.text.slice(f.text.lastIndexOf('\n', m.index) + 1, f.text.indexOf('\n', m.index));
      found.push(`${f.path}: ${line.trim().slice(0, 160)}`);
    }
  }
  return found;
}

describe('references in the repository', () => {
  it('scans what it claims to (sanity)', () => {
    expect(scanned.some((f) => f.path === 'DEVELOPERS.md')).toBe(true);
    expect(scanned.some((f) => f.path.startsWith('test/'))).toBe(true);
    expect(scanned.length).toBeGreaterThan(200);
  });

  it('no text refers to a planning item by number', () => {
    expect(hits(/\bissues? ?#?\d+|\bissue-\d+\b/gi)).toEqual([]);
  });

  it('no source or user text names a file outside the repository (shared reference notes are cited by their published sources)', () => {
    expect(hits(/shared\/reference|\/work\//g)).toEqual([]);
  });
});

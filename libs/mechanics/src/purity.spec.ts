/**
 * The engine and the contracts are pure (STYLE.md: "no I/O, no clock, no randomness"): no framework, database,
 * file-system or network module, and no clock or random source, in any non-spec file of libs/mechanics/src or
 * libs/contracts/src, and the rules in libs/rules/src.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

const ROOTS = [join(__dirname), join(__dirname, '../../contracts/src'), join(__dirname, '../../rules/src')];
const FORBIDDEN_MODULES = /^(@nestjs\/.*|typeorm|pg|fs|fs\/promises|http|https|net|node:.*)$/;
const FORBIDDEN_CALLS = /\bDate\.now\b|\bMath\.random\b|\bnew Date\s*\(|\bperformance\.now\b|\bprocess\.env\b/;
const MODULE_REFERENCE = /(?:\bfrom\s*|\bimport\s*\(\s*|\brequire\s*\(\s*|^\s*import\s+)['"]([^'"]+)['"]/gm;

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return sourceFiles(path);
    return name.endsWith('.ts') && !name.endsWith('.spec.ts') ? [path] : [];
  });
}

/** Everything impure in one file's text, as readable findings. */
function impurities(text: string): string[] {
  const found: string[] = [];
  for (const match of text.matchAll(MODULE_REFERENCE)) if (FORBIDDEN_MODULES.test(match[1])) found.push(`imports ${match[1]}`);
  const call = FORBIDDEN_CALLS.exec(text);
  if (call) found.push(`uses ${call[0]}`);
  return found;
}

describe('purity of libs/mechanics, libs/contracts and libs/rules', () => {
  it('the detector catches each kind of impurity (so the scan below can fail)', () => {
    expect(impurities("import { Injectable } from '@nestjs/common';")).toEqual(['imports @nestjs/common']);
    expect(impurities("import { readFileSync } from 'node:fs';")).toEqual(['imports node:fs']);
    expect(impurities("import * as fs from 'fs';")).toEqual(['imports fs']);
    expect(impurities("const { Pool } = require('pg');")).toEqual(['imports pg']);
    expect(impurities("import { DataSource } from 'typeorm';")).toEqual(['imports typeorm']);
    expect(impurities("import 'http';")).toEqual(['imports http']);
    expect(impurities("const net = await import('net');")).toEqual(['imports net']);
    expect(impurities('const t = Date.now();')).toEqual(['uses Date.now']);
    expect(impurities('const r = Math.random();')).toEqual(['uses Math.random']);
    expect(impurities("import { z } from 'zod';\nimport { all } from 'mathjs';")).toEqual([]);
  });

  it('no non-spec source file imports @nestjs, typeorm, pg, fs, http, net or node: modules, or reads the clock or a random source', () => {
    const files = ROOTS.flatMap(sourceFiles);
    const names = files.map((f) => relative(join(__dirname, '../..'), f));
    expect(names).toEqual(expect.arrayContaining(['mechanics/src/evaluate.ts', 'mechanics/src/tables/iso-trapezoidal.ts', 'contracts/src/design-input.ts', 'rules/src/judge.ts']));
    const findings = files.flatMap((file, i) => impurities(readFileSync(file, 'utf8')).map((what) => `${names[i]}: ${what}`));
    expect(findings).toEqual([]);
  });
});

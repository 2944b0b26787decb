/**
 * The HTTP fuzz suite's generators and its target (fast-check, seeded by test/support/property.ts): structure-aware
 * mutations of valid bodies, and a service on PostgreSQL that checks the properties common to every route, for
 * every generated input:
 *  - no 5xx;
 *  - every 4xx is problem+json naming at least one field path (a field, or "(body)" for the body as a whole);
 *  - a rejected input writes no row in any table (every table of the schema is counted before and after).
 * One file per route (test/fuzz/*.e2e-spec.ts), so the routes run in parallel and none depends on another.
 * Shrinking replays many requests: off by default; FUZZ_SHRINK=true with LEADLINE_SEED=<printed seed> shrinks.
 */
import fc from 'fast-check';
import { checkAsyncProperty, FULL_RUN, runs } from '../support/property';
import { clearDesign } from '../support/designs';
import { startTestApp, type StartOptions, type TestApp } from '../support/harness';

export type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

// ---------------------------------------------------------------------------------------------------------------
// Value generators

/** Unit strings of every dimension the contract knows, plus units of no accepted dimension and malformed ones. */
const UNITS = [
  'mm', 'm', 'cm', 'in', 'ft', 'um', // length
  'N', 'kN', 'lbf', 'kip', // force
  'Pa', 'kPa', 'MPa', 'GPa', 'psi', 'ksi', // stress
  'N*m', 'kN*m', 'lbf*in', 'lbf*ft', // torque
  'kg/m^3', 'lb/in^3', // density
  'rpm', 'rev/s', 'Hz', // rotational speed
  'm/s', 'm/min', 'in/min', 'ft/min', // linear speed
  'deg', 'rad', // angle
  'MPa*m/s', 'psi*ft/min', // pv
  'kg', 's', 'K', 'J', 'W', 'mol', '', 'mm mm', 'm/', '*', 'furlong', 'MPA', 'Mpa', 'mm)', 'N*m*m*m*m',
];
const NUMBER_TEXTS = [
  '24', '0', '-0', '-5', '1e308', '-1e308', '1e309', '1e400', '1e-320', '5e-324', '1.7976931348623157e308', 'NaN', 'Infinity',
  '-Infinity', '0x10', '1_000', '1,5', '.5', '5.', '+3', '1e', '--1', '٣', '２４',
];
const quantityText = fc.oneof(
  fc.tuple(fc.constantFrom(...NUMBER_TEXTS), fc.constantFrom(...UNITS)).map(([n, u]) => `${n} ${u}`),
  fc.tuple(fc.double(), fc.constantFrom(...UNITS)).map(([n, u]) => `${n} ${u}`),
  fc.tuple(fc.constantFrom(...NUMBER_TEXTS), fc.constantFrom(...UNITS)).map(([n, u]) => `${n}${u}`),
);

/** Unicode edge cases: NUL, lone surrogates, RTL overrides, combining marks, emoji, BOM, separators. */
const UNICODE = [
  '\u0000', 'a\u0000b', '\ud800', 'x\udc00', '\udbff\udbff', '\u202eevil\u202c', '\u05e9\u05dc\u05d5\u05dd', 'e\u0301\u0301\u0301\u0301',
  '\ud83d\udc4d\ud83c\udffd', '\ud83d\udc68\u200d\ud83d\udc69\u200d\ud83d\udc67', '\ufeff', '\u2028\u2029', '\u0085', '\u00a0',
  '\\u0000', '${7*7}', '{{this}}', "'; DROP TABLE revisions; --", '<script>alert(1)</script>', ' ', '',
];
const unicodeText = fc.oneof(
  fc.constantFrom(...UNICODE),
  fc.tuple(fc.constantFrom(...UNICODE), fc.string(), fc.constantFrom(...UNICODE)).map(([a, b, c]) => a + b + c),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.string({ unit: 'grapheme', maxLength: 40 }),
);
/** Very long strings, around and beyond the fields' limits, and beyond the body limit (256 KiB) now and then. */
const longText = fc.tuple(fc.constantFrom(41, 65, 201, 501, 4001, 8001, 20000, 100000, 300000), fc.constantFrom('x', 'é', '\ud83d\ude00', '\u0301', '\u0000'))
  .map(([n, c]) => c.repeat(n));
const deep = fc.tuple(fc.integer({ min: 10, max: 1000 }), fc.boolean()).map(([depth, arrays]) => {
  let v: Json = 'leaf';
  for (let i = 0; i < depth; i++) v = arrays ? [v] : { a: v };
  return v;
});
const longArray = fc.tuple(fc.integer({ min: 50, max: 20000 }), fc.constantFrom<Json>(0, 'x', null, {}, [])).map(([n, v]) => Array.from({ length: n }, () => v));
const numbers = fc.oneof(
  fc.constantFrom(0, -0, -1, 1, 0.5, 1e308, -1e308, 5e-324, Number.MAX_SAFE_INTEGER + 2, 2 ** 31, 13, 1.0000001),
  fc.double(), // NaN and ±Infinity serialise as null
  fc.integer(),
);
const wrongType = fc.constantFrom<Json>(null, true, false, [], {}, [1], { value: 24, unit: 'mm' }, '24', 'true');

const value: fc.Arbitrary<Json> = fc.oneof(
  { weight: 3, arbitrary: quantityText },
  { weight: 3, arbitrary: unicodeText },
  { weight: 1, arbitrary: longText },
  { weight: 2, arbitrary: numbers },
  { weight: 2, arbitrary: wrongType },
  { weight: 1, arbitrary: deep },
  { weight: 1, arbitrary: longArray },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }) as fc.Arbitrary<Json> },
);
const key = fc.oneof(
  fc.constantFrom('extra', '__proto__', 'constructor', 'prototype', 'toString', '', ' ', '\u0000', '\ud800', 'thread', 'design', 'a.b', '$where'),
  fc.string({ maxLength: 12 }),
);

// ---------------------------------------------------------------------------------------------------------------
// Structure-aware mutation of a valid body

type Op =
  | { op: 'delete'; pick: number }
  | { op: 'set'; pick: number; value: Json }
  | { op: 'add'; pick: number; key: string; value: Json }
  | { op: 'wrap'; pick: number; depth: number }
  | { op: 'repeat'; pick: number; times: number };

const op: fc.Arbitrary<Op> = fc.oneof(
  fc.record({ op: fc.constant('delete' as const), pick: fc.nat() }),
  fc.record({ op: fc.constant('set' as const), pick: fc.nat(), value }),
  fc.record({ op: fc.constant('add' as const), pick: fc.nat(), key, value }),
  fc.record({ op: fc.constant('wrap' as const), pick: fc.nat(), depth: fc.integer({ min: 1, max: 200 }) }),
  fc.record({ op: fc.constant('repeat' as const), pick: fc.nat(), times: fc.integer({ min: 2, max: 5000 }) }),
);
export const mutations = fc.array(op, { minLength: 1, maxLength: 3 });

/** Every path of a JSON tree (the root is []), down to a depth that the mutations need. */
function paths(v: Json, at: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(at);
  if (at.length >= 12) return out;
  if (Array.isArray(v)) v.forEach((x, i) => paths(x, [...at, i], out));
  else if (v !== null && typeof v === 'object') for (const k of Object.keys(v)) paths(v[k], [...at, k], out);
  return out;
}

/** Largest body a mutation may build: a little over the service's body limit (256 KiB), so 413 is exercised too. */
export const MAX_BODY = 320_000;

/**
 * An upper bound of the JSON text length of a value, walked only until it passes `limit` (a stringify of every
 * intermediate body cost most of this suite's time). Strings count as their UTF-16 length plus quotes, escapes aside.
 */
function jsonSizeUpTo(v: Json, limit: number): number {
  let size = 0;
  const stack: Json[] = [v];
  while (stack.length > 0 && size <= limit) {
    const x = stack.pop() as Json;
    if (x === null || typeof x === 'boolean') size += 5;
    else if (typeof x === 'number') size += 24;
    else if (typeof x === 'string') size += x.length * 6 + 2; // worst case: every character escaped (\uXXXX)
    else if (Array.isArray(x)) {
      size += 2 + x.length;
      for (let i = 0; i < x.length && size <= limit; i++) stack.push(x[i]);
    } else {
      for (const k of Object.keys(x)) {
        size += k.length * 6 + 4;
        stack.push(x[k]);
      }
      size += 2;
    }
  }
  return size;
}

function within(v: Json): boolean {
  return jsonSizeUpTo(v, MAX_BODY) <= MAX_BODY;
}

export function mutate(base: Json, ops: Op[]): Json {
  let root: Json = structuredClone(base);
  for (const m of ops) {
    const kept = structuredClone(root);
    apply(m);
    // bounded: an op that makes the body far larger than the limit is dropped (one input must cost milliseconds)
    if (!within(root)) root = kept;
  }
  return root;

  function apply(m: Op): void {
    const all = paths(root);
    const path = all[m.pick % all.length];
    const parent = path.length ? (path.slice(0, -1).reduce<Json>((n, k) => (n as Record<string, Json>)[k as string], root) as Record<string, Json> | Json[]) : null;
    const last = path[path.length - 1];
    const current: Json = parent ? (parent as Record<string, Json>)[last as string] : root;
    const put = (v: Json) => {
      if (parent) (parent as Record<string, Json>)[last as string] = v;
      else root = v;
    };
    switch (m.op) {
      case 'delete':
        if (Array.isArray(parent)) parent.splice(last as number, 1);
        else if (parent) delete parent[last as string];
        else root = null;
        break;
      case 'set':
        put(m.value);
        break;
      case 'add':
        if (current !== null && typeof current === 'object' && !Array.isArray(current)) {
          // defineProperty, so that "__proto__" becomes an own key and reaches the wire
          Object.defineProperty(current, m.key, { value: m.value, enumerable: true, writable: true, configurable: true });
        } else if (Array.isArray(current)) current.push(m.value);
        else put({ [m.key]: m.value, value: current });
        break;
      case 'wrap': {
        let v = current;
        for (let i = 0; i < m.depth; i++) v = [v];
        put(v);
        break;
      }
      case 'repeat': {
        const size = JSON.stringify(current ?? null).length;
        put(Array.from({ length: Math.min(m.times, Math.ceil(MAX_BODY / Math.max(size, 1))) }, () => structuredClone(current)));
        break;
      }
    }
  }
}

// ---------------------------------------------------------------------------------------------------------------
// The target

export interface FuzzTarget {
  readonly t: TestApp;
  readonly productId: string;
  readonly calculationId: string;
  /** Inputs sent so far */
  readonly sent: () => number;
  /** Forget the counts taken after the last rejected input (something else wrote since) */
  forget(): void;
  /** Sends one generated input and checks the properties common to every route */
  check(method: string, url: string, body: Json, options?: { as?: 'author' | 'reviewer'; headers?: Record<string, string> }): ReturnType<TestApp['call']>;
  close(): Promise<void>;
}

export async function startFuzzTarget(code: string, env: Record<string, string> = {}, options: StartOptions = {}): Promise<FuzzTarget> {
  const t = await startTestApp('postgres', env, undefined, options);
  const tables = await t.db.query<{ table_name: string }>(
    `SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`,
  );
  expect(tables.map((x) => x.table_name)).toEqual(expect.arrayContaining(['products', 'calculations', 'revisions', 'events', 'revision_closures', 'idempotency_keys']));
  const countSql = `SELECT ${tables.map((x) => `(SELECT count(*) FROM "${x.table_name}") AS "${x.table_name}"`).join(', ')},
                (SELECT coalesce(sum(seq), 0) FROM chain_heads) AS chain_head_seq_sum`;
  /** Rows of every table of the schema, and the chain heads' positions (a refused request moves none). */
  const snapshot = async (): Promise<Record<string, number>> => {
    const [row] = await t.db.query<Record<string, string>>(countSql);
    return Object.fromEntries(Object.entries(row).map(([k, v]) => [k, Number(v)]));
  };
  const p = await t.call('POST', '/api/v1/products', { code, name: `Fuzzwell ${code} test rig (invented)` });
  expect(p.status).toBe(201);
  const c = await t.call('POST', `/api/v1/products/${p.body.id}/calculations`, { title: 'fuzz target', design: clearDesign });
  expect(c.status).toBe(201);
  let sent = 0;
  /** Counts taken right after the last rejected input (null: take them afresh) */
  let known: Record<string, number> | null = null;
  return {
    t,
    productId: p.body.id,
    calculationId: c.body.calculationId,
    sent: () => sent,
    forget: () => void (known = null),
    async check(method, url, body, options = {}) {
      sent++;
      const before = known ?? (await snapshot());
      known = null;
      // always JSON on the wire (the harness would send a bare string as text)
      const res = await t.call(method, url, JSON.stringify(body), { ...options, headers: { 'content-type': 'application/json', ...options.headers } });
      const where = `${method} ${url} -> ${res.status} ${res.text.slice(0, 400)}`;
      if (res.status >= 500) throw new Error(`5xx: ${where}`);
      if (res.status >= 400) {
        if (!String(res.headers['content-type']).startsWith('application/problem+json')) throw new Error(`4xx not problem+json: ${where}`);
        const errors = res.body?.errors;
        if (!Array.isArray(errors) || errors.length === 0) throw new Error(`4xx without field paths: ${where}`);
        for (const e of errors) {
          if (typeof e?.path !== 'string' || e.path.length === 0 || typeof e?.message !== 'string') throw new Error(`4xx error entry without a path: ${where}`);
        }
        const after = await snapshot();
        known = after; // the next input starts from here, unless something else writes in between
        if (JSON.stringify(after) !== JSON.stringify(before)) throw new Error(`rows written for a rejected input: ${where}\nbefore ${JSON.stringify(before)}\nafter  ${JSON.stringify(after)}`);
      } else if (res.status < 200 || res.status >= 300) {
        throw new Error(`unexpected status: ${where}`);
      }
      return res;
    },
    close: () => t.close(),
  };
}

/** Time a fuzz test may take: its inputs cost milliseconds each, and the full run sends five times as many. */
export const FUZZ_TIMEOUT_MS = FULL_RUN ? 3_600_000 : 600_000;

/** Checks a fuzz property over `numRuns` inputs in the default run (5x in the full run), and that each was sent. */
export async function fuzz(target: FuzzTarget, property: fc.IAsyncProperty<never>, numRuns: number): Promise<void> {
  const before = target.sent();
  await checkAsyncProperty(property, { numRuns, endOnFailure: process.env.FUZZ_SHRINK !== 'true' });
  expect(target.sent() - before).toBeGreaterThanOrEqual(runs(numRuns));
}

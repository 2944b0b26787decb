/**
 * The evaluation route on its worker threads (apps/api/src/evaluations/evaluation-pool.ts) against the same route
 * assessing in the request's thread (LEADLINE_EVALUATION_THREADS=0), through HTTP on two services: the answers are the
 * same bytes for generated designs of every form and duty with and without the trace, concurrent requests each get
 * their own design's answer, a refused design is the same 422 naming the field, and a rule set adopted while the
 * threads run is the one they judge by; a thread that dies is replaced. (A property of the wiring: the figures are the engine's, tested against
 * published sources in libs/mechanics.)
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { parseDesign } from '@leadline/contracts';
import { designInputArbitrary } from '../../libs/rules/src/testing/arbitrary';
import { sampleWithSeed } from '../support/property';
import { startTestApp, type TestApp } from '../support/harness';
import { EvaluationPool } from '../../apps/api/src/evaluations/evaluation-pool';

const jack = JSON.parse(readFileSync(join(__dirname, '../fixtures/ok/trapezoidal-jack.json'), 'utf8'));
const designs = [jack, ...sampleWithSeed(designInputArbitrary, 60).filter((d) => parseDesign(d).success)];

let threaded: TestApp;
let inRequest: TestApp;

beforeAll(async () => {
  threaded = await startTestApp('postgres', { LEADLINE_EVALUATION_THREADS: '1' });
  inRequest = await startTestApp('postgres', { LEADLINE_EVALUATION_THREADS: '0' });
});
afterAll(async () => {
  await threaded?.close();
  await inRequest?.close();
});

const evaluate = (t: TestApp, design: unknown, trace = false) => t.call('POST', `/api/v1/evaluations${trace ? '?trace=true' : ''}`, design);

it('answers the same bytes on the worker thread as in the request, for generated designs with and without the trace [POST /api/v1/evaluations]', async () => {
  expect(designs.length).toBeGreaterThan(40);
  for (const [i, design] of designs.entries()) {
    const trace = i % 3 === 0;
    const [a, b] = [await evaluate(threaded, design, trace), await evaluate(inRequest, design, trace)];
    expect(a.status).toBe(200);
    expect(a.headers['content-type']).toBe('application/json; charset=utf-8');
    expect(a.text).toBe(b.text);
    expect('trace' in a.body).toBe(trace);
    expect(a.body.checks.length).toBeGreaterThan(0);
  }
});

it('gives each of 48 concurrent requests the answer of its own design', async () => {
  const batch = designs.slice(0, 48);
  const expected = await Promise.all(batch.map(async (d) => (await evaluate(inRequest, d)).text));
  const answered = await Promise.all(batch.map((d) => evaluate(threaded, d)));
  expect(answered.map((r) => r.status)).toEqual(batch.map(() => 200));
  expect(answered.map((r) => r.text)).toEqual(expected);
  // The designs differ, so a mix-up would show: the answers are not all one
  expect(new Set(expected).size).toBeGreaterThan(40);
});

it('refuses a design on the thread with the same 422 naming the field as in the request', async () => {
  const cases = [
    { ...jack, screw: { ...jack.screw, unsupportedLength: '1.9345105578188634e+229 mm' } },
    { ...jack, friction: { ...jack.friction, collar: { min: 'NaN', max: 0.1, source: jack.friction.collar.source } } },
    { ...jack, load: undefined },
    { nonsense: true },
  ];
  for (const bad of cases) {
    const [a, b] = [await evaluate(threaded, bad), await evaluate(inRequest, bad)];
    expect(a.status).toBe(422);
    expect(a.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(a.body.errors.length).toBeGreaterThan(0);
    expect(a.body.errors).toEqual(b.body.errors);
  }
  expect((await evaluate(threaded, cases[0])).body.errors[0].path).toBe('screw.unsupportedLength');
});

it('replaces a thread that dies: the evaluations after it are answered', async () => {
  expect((await evaluate(threaded, jack)).status).toBe(200); // the threads start with the first evaluation
  const pool = (threaded.app.get(EvaluationPool) as unknown as { pool: { threads: { threadId: number; terminate(): Promise<number> }[] } | null }).pool;
  expect(pool?.threads.length).toBe(1);
  const first = pool!.threads[0].threadId;
  await pool!.threads[0].terminate();
  const after = await evaluate(threaded, jack);
  expect(after.status).toBe(200);
  expect(after.text).toBe((await evaluate(inRequest, jack)).text);
  expect(pool!.threads.map((w) => w.threadId)).not.toContain(first);
});

// Last in the file: it changes the adopted rule set of both services.
it('judges by a rule set adopted while the threads run (the threads are sent the new set)', async () => {
  const before = await evaluate(threaded, jack);
  expect(before.body.ruleSetVersion).toBe(DEFAULT_RULE_SET.version);
  const strict = {
    version: '2026.12-8',
    description: 'Test only: lifting strength factor 40 instead of 3',
    thresholds: { ...DEFAULT_RULE_SET.thresholds, strength: { minSafetyFactor: { ...DEFAULT_RULE_SET.thresholds.strength.minSafetyFactor, lifting: 40 } } },
  };
  for (const t of [threaded, inRequest]) {
    expect((await t.call('POST', '/api/v1/rule-sets', strict, { as: 'admin' })).status).toBe(201);
    expect((await t.call('POST', '/api/v1/rule-sets/2026.12-8/adopt', { note: 'threads test' }, { as: 'admin' })).status).toBe(200);
  }
  const [a, b] = [await evaluate(threaded, jack), await evaluate(inRequest, jack)];
  expect(a.body.ruleSetVersion).toBe('2026.12-8');
  expect(a.text).toBe(b.text);
  // The strength checks take their limit from the adopted set: 40 now, where the default set says 3
  const limits = (body: { checks: { limit: number }[] }) => body.checks.map((c) => c.limit);
  expect(limits(before.body)).not.toContain(40);
  expect(limits(a.body)).toContain(40);
});

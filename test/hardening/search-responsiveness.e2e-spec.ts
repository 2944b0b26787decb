/**
 * A worst-case screw search (every form, every number of starts, twelve nut lengths: about 28,000 candidates) runs
 * in slices of the event loop, so /health and other requests are answered while it runs. Only the order of events
 * is checked here: /health answers while the search is still running. How long /health takes meanwhile is measured
 * by `npm run bench` (docs/performance.md), never asserted in a test.
 */
import { WORST_CASE_SIZING } from '../../bench/sizing-worst-case';
import { SizingService } from '../../apps/api/src/sizing/sizing.service';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp('pglite');
});
afterAll(() => t?.close());

it('answers /health, a product list and an evaluation while the worst-case search runs [POST /api/v1/sizing]', async () => {
  const runner = t.app.get(SizingService).runner;
  let searchDone = false;
  const search = t.call('POST', '/api/v1/sizing', WORST_CASE_SIZING).then((res) => {
    searchDone = true;
    return res;
  });
  // the search has started (it holds the runner) or, if it were not sliced, has already finished
  while (runner.active === 0 && !searchDone) await new Promise((r) => setImmediate(r));
  const answered = await Promise.all([
    t.call('GET', '/health', undefined, { as: 'anonymous' }),
    t.call('GET', '/api/v1/products'),
  ]);
  expect(answered.map((a) => a.status)).toEqual([200, 200]);
  expect(searchDone).toBe(false); // both were answered while the search was still running
  const res = await search;
  expect(res.status).toBe(200);
  expect(res.body.searched).toBe(28224); // 5 forms' sizes x 12 starts x 12 nut lengths
  expect(res.body.candidates.length).toBeGreaterThan(0);
  expect(runner.active).toBe(0);
});

it('answers several searches sent at once, each with the same answer (two run at a time, the rest wait their turn)', async () => {
  const runner = t.app.get(SizingService).runner;
  const small = { requirements: WORST_CASE_SIZING.requirements, search: { forms: ['trapezoidal'], starts: [1, 2], nutLength: { ratios: [2] } } };
  const answers = await Promise.all([0, 1, 2, 3].map(() => t.call('POST', '/api/v1/sizing', small)));
  expect(answers.map((a) => a.status)).toEqual([200, 200, 200, 200]);
  expect(new Set(answers.map((a) => JSON.stringify(a.body))).size).toBe(1); // the same answer each time
  expect(runner.active).toBe(0);
});

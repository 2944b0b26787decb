/**
 * Screw-selection benchmark: the full default search (every trapezoidal and Acme size, starts 1 to 4, the
 * default nut lengths) in-process against its floor, the same number of engine evaluations (evaluate + judge of
 * candidate designs already built), measured side by side in alternating rounds; then POST /api/v1/sizing over HTTP,
 * one request at a time, p50 and p95. Goals: search <= 1.2 x floor; HTTP p50 < 150 ms.
 */
import { evaluate } from '@leadline/mechanics';
import { DEFAULT_RULE_SET, judge } from '@leadline/rules';
import { candidateDesign, parseSizingRequest, screwBlockingRule, searchScrews, type SizingPlan } from '@leadline/sizing';
import { execFile } from 'node:child_process';
import { join } from 'node:path';
import { createApp } from '../apps/api/src/app.factory';
import { WORST_CASE_SIZING } from './sizing-worst-case';
import { BENCH_UNLIMITED } from './limits';

/** An invented 20 kN jack over 800 mm at 30 rev/min, the collar at 1.6 d: the default search space. */
const REQUEST = {
  requirements: {
    load: { axial: '20 kN', sense: 'compression' },
    duty: { kind: 'lifting', speed: '30 rpm', brake: false },
    friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { entry: 'collar/hard-steel-bronze' } },
    collar: { kind: 'plain', meanDiameterRatio: 1.6 },
    nut: { material: 'bronze' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '800 mm', ends: 'fixed-free' },
    drive: { availableTorque: '200 N*m' },
  },
};

const median = (xs: readonly number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};
const quantile = (xs: readonly number[], q: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(q * xs.length))];
const ms = (t0: bigint) => Number(process.hrtime.bigint() - t0) / 1e6;
const round = (x: number, d = 2) => Math.round(x * 10 ** d) / 10 ** d;

function plan(): SizingPlan {
  const p = parseSizingRequest(REQUEST);
  if (!p.success) throw new Error(JSON.stringify(p.issues));
  return p.plan;
}

/** The designs the search evaluates, in its order: each screw at its first nut length, the rest unless pruned. */
function evaluatedDesigns(p: SizingPlan) {
  const out = [];
  for (const size of p.sizes) {
    for (const starts of p.starts) {
      for (let k = 0; k < p.nutLengthRatios.length; k++) {
        const d = candidateDesign(p, size, starts, p.nutLengthRatios[k]);
        out.push(d);
        const findings = judge(d, evaluate(d), DEFAULT_RULE_SET);
        if (k === 0 && screwBlockingRule(findings) !== null) break;
      }
    }
  }
  return out;
}

export async function benchSizing(rounds = Number(process.env.BENCH_ROUNDS ?? 3)) {
  const p = plan();
  const first = searchScrews(p, DEFAULT_RULE_SET);
  const designs = evaluatedDesigns(p);
  if (designs.length !== first.evaluations) throw new Error(`floor replays ${designs.length} evaluations, the search ran ${first.evaluations}`);

  // Many short pairs, the order alternating, so the shared machine's load hits both sides alike; the answer is the
  // median of the per-pair ratios (and the ratio of the total times beside it).
  const search: number[] = [];
  const floor: number[] = [];
  const runFloor = () => {
    const t0 = process.hrtime.bigint();
    for (const d of designs) judge(d, evaluate(d), DEFAULT_RULE_SET);
    floor.push(ms(t0));
  };
  const runSearch = () => {
    const t0 = process.hrtime.bigint();
    searchScrews(p, DEFAULT_RULE_SET);
    search.push(ms(t0));
  };
  for (let i = 0; i < 20; i++) {
    runFloor();
    runSearch();
  }
  search.length = 0;
  floor.length = 0;
  for (let r = 0; r < rounds * 100; r++) {
    if (r % 2) {
      runFloor();
      runSearch();
    } else {
      runSearch();
      runFloor();
    }
  }
  const pairRatios = search.map((x, i) => x / floor[i]);
  const total = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
  const searchMs = Math.min(...search);
  const floorMs = Math.min(...floor);
  const inProcess = {
    name: 'sizing: full default search in-process vs its evaluations alone',
    searched: first.searched,
    evaluations: first.evaluations,
    pruned: first.pruned,
    passed: first.passed,
    listed: first.candidates.length,
    searchMs: round(searchMs),
    floorMs: round(floorMs),
    perEvaluationUs: round((floorMs * 1000) / first.evaluations, 1),
    pairs: pairRatios.length,
    ratio: round(median(pairRatios), 3),
    totalTimeRatio: round(total(search) / total(floor), 3),
    goal: '<= 1.2',
  };
  console.log(JSON.stringify(inProcess));

  const admin = `ll_bench_admin_${process.pid}_${'y'.repeat(16)}`;
  const { app } = await createApp({ env: { LOG_LEVEL: 'warn', LEADLINE_DEMO_SEED: 'false', LEADLINE_ADMIN_TOKEN: admin, LEADLINE_DATA_DIR: 'memory://', ...BENCH_UNLIMITED } });
  try {
    await app.listen({ port: 0, host: '127.0.0.1' });
    const base = `http://127.0.0.1:${(app.getHttpServer().address() as { port: number }).port}`;
    const body = JSON.stringify(REQUEST);
    const headers = { authorization: `Bearer ${admin}`, 'content-type': 'application/json' };
    const call = async () => {
      const t0 = process.hrtime.bigint();
      const r = await fetch(`${base}/api/v1/sizing`, { method: 'POST', headers, body });
      await r.arrayBuffer();
      if (r.status !== 200) throw new Error(`sizing answered ${r.status}`);
      return ms(t0);
    };
    for (let i = 0; i < 5; i++) await call();
    const times: number[] = [];
    for (let i = 0; i < 20 * rounds; i++) times.push(await call());
    const httpResult = { name: 'sizing: POST /api/v1/sizing, full default search, one at a time', requests: times.length, p50Ms: round(median(times)), p95Ms: round(quantile(times, 0.95)), goal: 'p50 < 150 ms' };
    console.log(JSON.stringify(httpResult));
    const health = await healthDuringSearch(base, headers);
    return { inProcess, http: httpResult, health };
  } finally {
    await app.close();
  }
}

interface Probe {
  requests: number;
  p50Ms: number;
  p99Ms: number;
  maxMs: number;
}

/** GET /health one after another from a process of its own for `seconds`. */
function probeHealth(base: string, seconds: number): Promise<Probe> {
  return new Promise((resolve, reject) => {
    execFile(process.execPath, [join(__dirname, 'health-probe.js'), JSON.stringify({ url: `${base}/health`, seconds })], (err, stdout) =>
      err ? reject(err) : resolve(JSON.parse(stdout.trim().split('\n').pop() as string) as Probe));
  });
}

/**
 * /health latency while the worst-case search (bench/sizing-worst-case.ts) runs: idle; with `clients` clients each
 * sending one worst-case search after another over HTTP (sliced, as the service runs it); and, as the before
 * figure, the same search run whole on the server's event loop (what the route did before it was sliced).
 */
async function healthDuringSearch(base: string, headers: Record<string, string>, seconds = Number(process.env.BENCH_SECONDS ?? 5)) {
  const parsed = parseSizingRequest(WORST_CASE_SIZING);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  const body = JSON.stringify(WORST_CASE_SIZING);
  const t0 = process.hrtime.bigint();
  const once = searchScrews(parsed.plan, DEFAULT_RULE_SET);
  const searchMs = round(ms(t0));
  const rows: Record<string, unknown>[] = [];
  const idle = await probeHealth(base, seconds);
  rows.push({ name: 'health while idle', ...idle });
  for (const clients of [1, 8]) {
    let stop = false;
    let searches = 0;
    const loops = Array.from({ length: clients }, async () => {
      while (!stop) {
        const r = await fetch(`${base}/api/v1/sizing`, { method: 'POST', headers, body });
        await r.arrayBuffer();
        if (r.status !== 200) throw new Error(`sizing answered ${r.status}`);
        searches++;
      }
    });
    const probe = await probeHealth(base, seconds);
    stop = true;
    await Promise.all(loops);
    rows.push({ name: `health during worst-case searches, sliced (${clients} client${clients > 1 ? 's' : ''})`, searches, ...probe });
  }
  {
    // before: the search run whole on the event loop, one after another, as the route ran it unsliced
    let stop = false;
    let searches = 0;
    const loop = (async () => {
      while (!stop) {
        searchScrews(parsed.plan, DEFAULT_RULE_SET);
        searches++;
        await new Promise((r) => setImmediate(r));
      }
    })();
    const probe = await probeHealth(base, seconds);
    stop = true;
    await loop;
    rows.push({ name: 'health during worst-case searches run whole on the event loop (before slicing; 1 at a time)', searches, ...probe });
  }
  const result = { name: 'sizing: /health latency while the worst-case search runs', candidates: once.searched, evaluations: once.evaluations, oneSearchInProcessMs: searchMs, rows, goal: 'health < 100 ms' };
  console.log(JSON.stringify(result));
  return result;
}

if (require.main === module) {
  benchSizing().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}

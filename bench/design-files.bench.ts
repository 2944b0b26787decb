/**
 * Design files rendered by queue workers: throughput with LEADLINE_WORKERS = 1, 2 and 4 on one instance (files a
 * second, and as a ratio to one worker), and the evaluation route's latency while design files render against the
 * same route at rest, side by side in alternating rounds. Each design file is of its own product (a file of an
 * unchanged record would be reused, not rendered). The machine's load average is printed with the figures: these
 * machines are shared, compare the ratios, not the milliseconds.
 */
import { loadavg, cpus } from 'node:os';
import { Client } from 'pg';
import { createApp } from '../apps/api/src/app.factory';
import { BENCH_UNLIMITED } from './limits';

interface Run {
  rps: number;
  p50: number;
  p99: number;
  errors: number;
}

export interface DesignFileBenchOptions {
  url: string;
  design: unknown;
  seconds: number;
  rounds: number;
  /** Load on a URL from a separate process (bench/run.ts `load`) */
  load(url: string, method: 'GET' | 'POST', body: string | undefined, as: string, duration?: number): Promise<Run>;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const CALCULATIONS_PER_PRODUCT = 3;

async function service(url: string, workers: number) {
  const admin = `ll_bench_df_admin_${process.pid}_${'x'.repeat(16)}`;
  const { app } = await createApp({
    env: { LOG_LEVEL: 'warn', LEADLINE_DEMO_SEED: 'false', LEADLINE_ADMIN_TOKEN: admin, DATABASE_URL: url, LEADLINE_WORKERS: String(workers), LEADLINE_QUEUE_POLL_MS: '200', ...BENCH_UNLIMITED },
  });
  await app.listen({ port: 0, host: '127.0.0.1' });
  const base = `http://127.0.0.1:${(app.getHttpServer().address() as { port: number }).port}`;
  const asAdmin = { authorization: `Bearer ${admin}`, 'content-type': 'application/json' };
  const user = await (await fetch(`${base}/api/v1/users`, { method: 'POST', headers: asAdmin, body: JSON.stringify({ name: `Benchmark author ${workers}`, roles: ['author'] }) })).json();
  const token = (await (await fetch(`${base}/api/v1/users/${user.id}/tokens`, { method: 'POST', headers: asAdmin, body: '{}' })).json()).token as string;
  const call = async (method: string, path: string, body?: unknown) => {
    const r = await fetch(base + path, { method, headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
    return { status: r.status, body: (await r.json()) as any };
  };
  return { app, base, token, call };
}

type Service = Awaited<ReturnType<typeof service>>;

let productSeq = 0;
async function products(svc: Service, n: number, design: unknown): Promise<string[]> {
  const ids: string[] = [];
  for (let i = 0; i < n; i++) {
    const p = await svc.call('POST', '/api/v1/products', { code: `DFB-${process.pid % 1000}-${++productSeq}`, name: 'Design-file bench rig (invented)' });
    if (p.status !== 201) throw new Error(`product: ${p.status} ${JSON.stringify(p.body)}`);
    for (let c = 0; c < CALCULATIONS_PER_PRODUCT; c++) {
      const opened = await svc.call('POST', `/api/v1/products/${p.body.id}/calculations`, { title: `screw ${c + 1}`, design });
      if (opened.status !== 201) throw new Error(`calculation: ${opened.status} ${JSON.stringify(opened.body)}`);
    }
    ids.push(p.body.id);
  }
  return ids;
}

async function enqueue(svc: Service, productIds: string[]): Promise<string[]> {
  const jobs: string[] = [];
  for (const id of productIds) {
    const r = await svc.call('POST', `/api/v1/products/${id}/design-files`, {});
    if (r.status !== 202) throw new Error(`design-files: ${r.status} ${JSON.stringify(r.body)}`);
    jobs.push(r.body.jobId);
  }
  return jobs;
}

async function pending(db: Client, jobs: string[]): Promise<number> {
  const { rows } = await db.query(`SELECT count(*)::int AS n FROM queue.jobs WHERE id = ANY($1::uuid[]) AND state NOT IN ('done', 'failed')`, [jobs]);
  return rows[0].n;
}

async function settle(db: Client, jobs: string[], timeoutMs = 300_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while ((await pending(db, jobs)) > 0) {
    if (Date.now() > deadline) throw new Error('design-file jobs did not finish in time');
    await sleep(50);
  }
  const { rows } = await db.query(`SELECT count(*)::int AS n FROM queue.jobs WHERE id = ANY($1::uuid[]) AND state = 'failed'`, [jobs]);
  if (rows[0].n > 0) throw new Error(`${rows[0].n} design-file jobs failed`);
}

export async function benchDesignFiles(o: DesignFileBenchOptions): Promise<Record<string, unknown>[]> {
  const db = new Client({ connectionString: o.url });
  db.on('error', () => undefined);
  await db.connect();
  const results: Record<string, unknown>[] = [];
  const loadBefore = loadavg()[0];
  try {
    // 1. throughput by worker count: the same number of files each time, each of its own product
    const FILES = 12;
    const throughput: Record<number, number> = {};
    for (const workers of [1, 2, 4]) {
      const svc = await service(o.url, workers);
      try {
        await settle(db, await enqueue(svc, await products(svc, 1, o.design))); // warm: browser launched, templates compiled
        const rates: number[] = [];
        for (let r = 0; r < o.rounds; r++) {
          const ids = await products(svc, FILES, o.design);
          const t0 = performance.now();
          await settle(db, await enqueue(svc, ids));
          rates.push(FILES / ((performance.now() - t0) / 1000));
        }
        throughput[workers] = rates.reduce((a, b) => a + b, 0) / rates.length;
      } finally {
        await svc.app.close();
      }
    }
    const row = {
      name: `design files rendered by queue workers (${FILES} files of ${CALCULATIONS_PER_PRODUCT} calculations each, one instance)`,
      filesPerSecond1: +throughput[1].toFixed(2), filesPerSecond2: +throughput[2].toFixed(2), filesPerSecond4: +throughput[4].toFixed(2),
      ratio2to1: +(throughput[2] / throughput[1]).toFixed(2), ratio4to1: +(throughput[4] / throughput[1]).toFixed(2),
      cores: cpus().length, loadAverage1mBefore: +loadBefore.toFixed(2), loadAverage1mAfter: +loadavg()[0].toFixed(2),
    };
    console.log(JSON.stringify(row));
    results.push(row);

    // 2. the evaluation route at rest and while design files render (2 workers), alternating rounds
    const svc = await service(o.url, 2);
    try {
      const url = `${svc.base}/api/v1/evaluations`;
      const body = JSON.stringify(o.design);
      await o.load(url, 'POST', body, svc.token, 1);
      await settle(db, await enqueue(svc, await products(svc, 1, o.design)));
      const rest: Run[] = [];
      const busy: Run[] = [];
      let busyThroughout = true;
      const BUSY_FILES = Math.max(8, Math.ceil(o.seconds * Math.max(1, throughput[2]) * 1.5));
      for (let r = 0; r < o.rounds; r++) {
        rest.push(await o.load(url, 'POST', body, svc.token));
        const ids = await products(svc, BUSY_FILES, o.design);
        const jobs = await enqueue(svc, ids);
        busy.push(await o.load(url, 'POST', body, svc.token));
        if ((await pending(db, jobs)) === 0) busyThroughout = false;
        await settle(db, jobs);
      }
      const mean = (xs: Run[], k: keyof Run) => xs.reduce((a, x) => a + x[k], 0) / xs.length;
      const row2 = {
        name: 'POST /api/v1/evaluations at rest vs while design files render (2 workers, same instance)',
        restRps: Math.round(mean(rest, 'rps')), busyRps: Math.round(mean(busy, 'rps')), rpsRatio: +(mean(busy, 'rps') / mean(rest, 'rps')).toFixed(3),
        restP50ms: +mean(rest, 'p50').toFixed(1), busyP50ms: +mean(busy, 'p50').toFixed(1),
        restP99ms: +mean(rest, 'p99').toFixed(1), busyP99ms: +mean(busy, 'p99').toFixed(1), p99Ratio: +(mean(busy, 'p99') / mean(rest, 'p99')).toFixed(2),
        rounds: busy.map((x, i) => +(x.p99 / rest[i].p99).toFixed(2)), filesQueuedPerRound: BUSY_FILES, renderingThroughout: busyThroughout,
        errors: [...rest, ...busy].reduce((a, x) => a + x.errors, 0), loadAverage1mAfter: +loadavg()[0].toFixed(2),
      };
      console.log(JSON.stringify(row2));
      results.push(row2);
    } finally {
      await svc.app.close();
    }
  } finally {
    await db.end();
  }
  return results;
}

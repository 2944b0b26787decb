/**
 * Growth: what reads and writes cost when one product's chain is long. On PostgreSQL (a scratch database):
 *   - one product is grown stage by stage to BENCH_GROWTH_MAX revisions (default 100k; each revision is two chain
 *     links: the revision and its submission event). Seeding goes through the service's chain writer
 *     (RecordStore.appendRevision, the record function every submission calls) with the benchmark's stored bytes;
 *   - at each stage: durable submission p50/p99 and throughput on that product's calculation (autocannon, 50
 *     connections), GET /products/:id/verify time and server memory, the audit trail's first page and a deep cursor
 *     page (p50/p99 of sequential requests), and the revision list's first and last page;
 *   - at the end: the full CSV download (time, bytes, server memory), the review queue with 10k revisions awaiting
 *     (10 products × 1k calculations, opened through CalculationsService.open), and start-up time of a new app
 *     instance on that database (in this process, so module loading is not included).
 * Server memory is this process's RSS and heap (the app runs in this process; the load generator does not).
 */
import { randomUUID } from 'node:crypto';
import { Client } from 'pg';
import type { NestFastifyApplication } from '@nestjs/platform-fastify';
import { createApp } from '../apps/api/src/app.factory';
import { Database } from '../apps/api/src/infra/database/database.service';
import { prepareSubmission, RecordStore, type RevisionSubmission } from '../apps/api/src/records/record-store';
import { CalculationsService } from '../apps/api/src/calculations/calculations.service';
import { BENCH_UNLIMITED } from './limits';

export interface GrowthOptions {
  url: string;
  design: unknown;
  submission: RevisionSubmission;
  stages: number[];
  seconds: number;
  load: (url: string | string[], method: 'GET' | 'POST', body: string | undefined, token: string) => Promise<{ rps: number; p50: number; p99: number; errors: number }>;
}

const pct = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return +s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))].toFixed(2);
};

/** RSS and heap growth while `work` runs, sampled every 10 ms (a blocked event loop also blocks the sampler). */
async function withMemory<T>(work: () => Promise<T>): Promise<{ result: T; ms: number; rssMB: number; heapMB: number }> {
  global.gc?.();
  const before = process.memoryUsage();
  let rss = before.rss;
  let heap = before.heapUsed;
  const timer = setInterval(() => {
    const m = process.memoryUsage();
    rss = Math.max(rss, m.rss);
    heap = Math.max(heap, m.heapUsed);
  }, 10);
  const t0 = performance.now();
  try {
    const result = await work();
    const ms = performance.now() - t0;
    const m = process.memoryUsage();
    rss = Math.max(rss, m.rss);
    heap = Math.max(heap, m.heapUsed);
    return { result, ms: +ms.toFixed(1), rssMB: +((rss - before.rss) / 2 ** 20).toFixed(1), heapMB: +((heap - before.heapUsed) / 2 ** 20).toFixed(1) };
  } finally {
    clearInterval(timer);
  }
}

async function startApp(url: string, admin: string) {
  const t0 = performance.now();
  const { app } = await createApp({ env: { LOG_LEVEL: 'warn', LEADLINE_DEMO_SEED: 'false', LEADLINE_ADMIN_TOKEN: admin, DATABASE_URL: url, ...BENCH_UNLIMITED } });
  await app.listen({ port: 0, host: '127.0.0.1' });
  const startMs = performance.now() - t0;
  const base = `http://127.0.0.1:${(app.getHttpServer().address() as { port: number }).port}`;
  return { app, base, startMs };
}

export async function benchGrowth(o: GrowthOptions) {
  const admin = `ll_bench_admin_${process.pid}_${'g'.repeat(16)}`;
  let { app, base } = await startApp(o.url, admin);
  const asAdmin = { authorization: `Bearer ${admin}`, 'content-type': 'application/json' };
  const user = await (await fetch(`${base}/api/v1/users`, { method: 'POST', headers: asAdmin, body: JSON.stringify({ name: 'Growth author', roles: ['author'] }) })).json();
  const token = (await (await fetch(`${base}/api/v1/users/${user.id}/tokens`, { method: 'POST', headers: asAdmin, body: '{}' })).json()).token as string;
  const auth = { authorization: `Bearer ${token}`, 'content-type': 'application/json' };
  const post = async (path: string, body: unknown) => (await fetch(base + path, { method: 'POST', headers: auth, body: JSON.stringify(body) })).json();
  const timed = async (path: string, n: number) => {
    const ms: number[] = [];
    for (let i = 0; i < n; i++) {
      const t0 = performance.now();
      const r = await fetch(base + path, { headers: auth });
      await r.arrayBuffer();
      if (!r.ok) throw new Error(`${path}: ${r.status}`);
      ms.push(performance.now() - t0);
    }
    return { p50: pct(ms, 50), p99: pct(ms, 99) };
  };

  const product = await post('/api/v1/products', { code: `GROWTH-${process.pid}`, name: 'growth product' });
  const calc = await post(`/api/v1/products/${product.id}/calculations`, { title: 'growth', design: o.design });
  const acting = { id: user.id as string, name: 'Growth author' };
  const prepared = prepareSubmission(o.submission);
  const revisionBody = numberedRevisionBody(o.design as never, 'growth');

  const count = async () => Number((await app.get(Database).query<{ n: string }>(`SELECT count(*) AS n FROM revisions WHERE product_id = $1`, [product.id]))[0].n);
  /**
   * Appends through the service's chain writer (RecordStore.appendRevision: head lock, numbering, both link hashes and
   * MACs, the record function that checks and inserts), 250 per transaction; the stored bytes are the prepared
   * submission's. The service credential acts for the growth author (the owner of the calculation).
   */
  const grow = async (target: number) => {
    const db = app.get(Database);
    const records = app.get(RecordStore);
    const t0 = performance.now();
    let done = 0;
    for (let left = target - (await count()); left > 0; left -= 250) {
      const n = Math.min(250, left);
      await db.transaction(async (q) => {
        const cursor = (await records.lockHead(q, product.id))!;
        for (let i = 0; i < n; i++) await records.appendRevision(q, product.id, calc.calculationId, prepared, acting, cursor);
      });
      done += n;
    }
    return { appended: done, perS: done ? Math.round(done / ((performance.now() - t0) / 1000)) : 0 };
  };

  /**
   * What autovacuum does on a server within a minute of a bulk load (its threshold: 10 % + 50 rows changed); the
   * seed outruns it, and without current statistics the planner keeps an empty table's estimates.
   */
  const analyze = async () => {
    const c = new Client({ connectionString: o.url });
    c.on('error', () => undefined);
    await c.connect();
    try {
      for (const t of ['revisions', 'events', 'calculations', 'revision_closures']) await c.query(`ANALYZE ${t}`);
    } finally {
      await c.end();
    }
  };

  const stages: Record<string, unknown>[] = [];
  for (const target of o.stages) {
    const seeded = await grow(target);
    await analyze();
    const revisions = await count();
    const [{ seq }] = await app.get(Database).query<{ seq: string }>(`SELECT seq FROM chain_heads WHERE product_id = $1`, [product.id]);
    const links = Number(seq);
    const verify = await withMemory(async () => {
      const r = await fetch(`${base}/api/v1/products/${product.id}/verify`, { headers: auth });
      return r.json();
    });
    if (!verify.result.valid) throw new Error(`chain invalid at ${links} links: ${JSON.stringify(verify.result.firstBrokenLink)}`);
    const auditFirst = await timed(`/api/v1/products/${product.id}/audit?limit=100`, 30);
    const auditDeep = await timed(`/api/v1/products/${product.id}/audit?limit=100&after=${Math.max(0, links - 150)}`, 30);
    const auditMiddle = await timed(`/api/v1/products/${product.id}/audit?limit=100&after=${Math.floor(links / 2)}`, 30);
    const revFirst = await timed(`/api/v1/calculations/${calc.calculationId}/revisions?limit=100&view=summary`, 20);
    const revLast = await timed(`/api/v1/calculations/${calc.calculationId}/revisions?limit=100&view=summary&after=${Math.max(0, revisions - 100)}`, 20);
    const submit = await o.load(`${base}/api/v1/calculations/${calc.calculationId}/revisions`, 'POST', revisionBody, token);
    const row = {
      revisions, links, seedPerS: seeded.perS,
      submitRps: Math.round(submit.rps), submitP50ms: submit.p50, submitP99ms: submit.p99, submitErrors: submit.errors,
      verifyMs: verify.ms, verifyRssMB: verify.rssMB, verifyHeapMB: verify.heapMB,
      auditFirstP50ms: auditFirst.p50, auditFirstP99ms: auditFirst.p99, auditDeepP50ms: auditDeep.p50, auditDeepP99ms: auditDeep.p99,
      auditMiddleP50ms: auditMiddle.p50, revisionsFirstPageP50ms: revFirst.p50, revisionsLastPageP50ms: revLast.p50,
    };
    console.log(JSON.stringify({ name: 'growth stage', ...row }));
    stages.push(row);
  }

  // The full CSV download of the grown product, read as a client would
  const csv = await withMemory(async () => {
    const r = await fetch(`${base}/api/v1/products/${product.id}/audit?format=csv`, { headers: auth });
    let bytes = 0;
    let lines = 0;
    for await (const chunk of r.body as unknown as AsyncIterable<Uint8Array>) {
      bytes += chunk.length;
      for (const b of chunk) if (b === 10) lines++;
    }
    return { bytes, lines };
  });
  const download = { name: 'full CSV download', entries: csv.result.lines - 1, MB: +(csv.result.bytes / 2 ** 20).toFixed(1), ms: csv.ms, rssMB: csv.rssMB, heapMB: csv.heapMB };
  console.log(JSON.stringify(download));

  // The review queue with 10k revisions awaiting: 10 products × 1k calculations, opened through the service
  const queueSize = Math.min(10_000, Math.max(...o.stages) / 10);
  const calculations = app.get(CalculationsService);
  const t0 = performance.now();
  const queueProducts: string[] = [];
  for (let p = 0; p < 10; p++) queueProducts.push((await post('/api/v1/products', { code: `QUEUE-${p}-${randomUUID().slice(0, 6)}`, name: 'queue product' })).id);
  await Promise.all(queueProducts.map(async (p) => {
    for (let i = 0; i < queueSize / 10; i++) await calculations.open(p, { title: `awaiting ${i}`, design: o.design }, acting as never);
  }));
  const queueSeedS = +((performance.now() - t0) / 1000).toFixed(1);
  await analyze();
  const queueAll = await timed('/api/v1/reviews/queue?limit=50', 30);
  const queueProduct = await timed(`/api/v1/reviews/queue?limit=50&productId=${queueProducts[0]}`, 30);
  const queueGrown = await timed(`/api/v1/reviews/queue?productId=${product.id}`, 30);
  const queue = {
    name: 'review queue', awaiting: queueSize + 1, seedS: queueSeedS, allP50ms: queueAll.p50, allP99ms: queueAll.p99,
    oneProductP50ms: queueProduct.p50, grownProductP50ms: queueGrown.p50, grownProductSuperseded: (await count()) - 1,
  };
  console.log(JSON.stringify(queue));

  // Start-up of a fresh process on this database (migrations checked, rule sets loaded, listening)
  await app.close();
  const restarted = await startApp(o.url, admin);
  app = restarted.app;
  base = restarted.base;
  const health = await fetch(`${base}/health`);
  const startup = { name: 'start-up with the grown database', revisions: await count(), startMs: Math.round(restarted.startMs), healthStatus: health.status };
  console.log(JSON.stringify(startup));
  await app.close();
  return { stages, download, queue, startup };
}

export type { NestFastifyApplication };

/** A revision body whose design differs per request ("{{n}}" numbered by bench/load.ts): an unchanged design is refused. */
function numberedRevisionBody(design: { friction: { thread: { source: { reference: string } } } }, note: string): string {
  const thread = design.friction.thread;
  return JSON.stringify({ design: { ...design, friction: { ...design.friction, thread: { ...thread, source: { ...thread.source, reference: `${thread.source.reference} ({{n}})` } } } }, note });
}

/**
 * `npm run bench`: performance as ratios against baselines measured side by side in the same run.
 *   1. POST /api/v1/evaluations vs GET /bench/hello (same app, same Fastify adapter)      goal >= 0.8x
 *   2. durable submission (POST /api/v1/calculations/:id/revisions) vs bare INSERT route   goal >= 0.5x, p99 reported
 *   3. engine alone: one evaluation (parse + evaluate + judge) in microseconds
 *   4. PDF report render with a warm browser vs bare page.pdf of the same HTML             goal <= 1.5x
 * Rounds alternate baseline and subject so machine noise hits both alike. Requires PostgreSQL for (2):
 * DATABASE_URL (default postgres://postgres@127.0.0.1:5432/postgres); a scratch database is created and dropped.
 */
import 'reflect-metadata';
import autocannon from 'autocannon';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Client } from 'pg';
import { parseDesign } from '@leadline/contracts';
import { evaluate } from '@leadline/mechanics';
import { judge, DEFAULT_RULE_SET } from '@leadline/rules';
import { createApp } from '../apps/api/src/app.factory';
import { Database } from '../apps/api/src/infra/database/database.service';
import { BaselineModule } from './baseline.module';

const root = join(__dirname, '../..');
const design = readFileSync(join(root, 'test/fixtures/ok/trapezoidal-jack.json'), 'utf8');
const seconds = Number(process.env.BENCH_SECONDS ?? 6);
const rounds = Number(process.env.BENCH_ROUNDS ?? 3);
const connections = 50;

interface Run {
  rps: number;
  p99: number;
  errors: number;
}

async function load(url: string, method: 'GET' | 'POST', body?: string): Promise<Run> {
  const r = await autocannon({
    url,
    method,
    body,
    headers: body ? { 'content-type': 'application/json' } : undefined,
    connections,
    duration: seconds,
  });
  return { rps: r.requests.average, p99: r.latency.p99, errors: r.errors + r.non2xx };
}

async function sideBySide(name: string, baseline: () => Promise<Run>, subject: () => Promise<Run>) {
  const b: Run[] = [];
  const s: Run[] = [];
  for (let i = 0; i < rounds; i++) {
    b.push(await baseline());
    s.push(await subject());
  }
  const mean = (xs: Run[], k: keyof Run) => xs.reduce((a, x) => a + x[k], 0) / xs.length;
  const result = {
    name,
    baselineRps: Math.round(mean(b, 'rps')),
    subjectRps: Math.round(mean(s, 'rps')),
    ratio: +(mean(s, 'rps') / mean(b, 'rps')).toFixed(3),
    baselineP99ms: +mean(b, 'p99').toFixed(1),
    subjectP99ms: +mean(s, 'p99').toFixed(1),
    errors: s.reduce((a, x) => a + x.errors, 0) + b.reduce((a, x) => a + x.errors, 0),
    rounds: s.map((x, i) => +(x.rps / b[i].rps).toFixed(3)),
  };
  console.log(JSON.stringify(result));
  return result;
}

function engineMicros(): { perEvaluationUs: number } {
  const raw = JSON.parse(design);
  const once = () => {
    const p = parseDesign(raw);
    if (!p.success) throw new Error('fixture invalid');
    judge(p.design, evaluate(p.design), DEFAULT_RULE_SET);
  };
  const n = 20000;
  for (let i = 0; i < 2000; i++) once(); // warm-up
  const t0 = process.hrtime.bigint();
  for (let i = 0; i < n; i++) once();
  const us = Number(process.hrtime.bigint() - t0) / 1000 / n;
  console.log(JSON.stringify({ name: 'engine: parse + evaluate + judge', perEvaluationUs: +us.toFixed(1) }));
  return { perEvaluationUs: us };
}

async function http(env: Record<string, string>) {
  const { app } = await createApp({ env: { LOG_LEVEL: 'warn', LEADLINE_DEMO_SEED: 'false', ...env }, extraModules: [BaselineModule] });
  await app.listen({ port: 0, host: '127.0.0.1' });
  const address = app.getHttpServer().address() as { port: number };
  return { app, base: `http://127.0.0.1:${address.port}` };
}

async function main() {
  const only = process.argv[2];
  const results: unknown[] = [];
  if (!only || only === 'engine') results.push(engineMicros());

  if (!only || only === 'http') {
    const serverUrl = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';
    const name = `leadline_bench_${process.pid}`;
    const admin = new Client({ connectionString: serverUrl });
    await admin.connect();
    await admin.query(`CREATE DATABASE ${name}`);
    const u = new URL(serverUrl);
    u.pathname = `/${name}`;
    try {
      const { app, base } = await http({ DATABASE_URL: u.toString() });
      const db = app.get(Database);
      await db.query(`CREATE TABLE bench_rows (id bigserial PRIMARY KEY, body jsonb NOT NULL, created_at timestamptz NOT NULL DEFAULT now())`);
      results.push(await sideBySide('POST /api/v1/evaluations vs hello-world', () => load(`${base}/bench/hello`, 'GET'), () => load(`${base}/api/v1/evaluations`, 'POST', design)));
      const product = await (await fetch(`${base}/api/v1/products`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ code: 'BENCH-1', name: 'bench product' }) })).json();
      const calc = await (await fetch(`${base}/api/v1/products/${product.id}/calculations`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ title: 'bench', design: JSON.parse(design) }) })).json();
      const revisionBody = JSON.stringify({ design: JSON.parse(design), note: 'bench' });
      results.push(await sideBySide('durable submission vs bare INSERT', () => load(`${base}/bench/insert`, 'POST', '{}'), () => load(`${base}/api/v1/calculations/${calc.calculationId}/revisions`, 'POST', revisionBody)));
      await new Promise((r) => setTimeout(r, 1500)); // let requests still queued at the end drain
      const verify = await (await fetch(`${base}/api/v1/products/${product.id}/verify`)).json();
      console.log(JSON.stringify({ name: 'chain after the benchmark', valid: verify.valid, links: verify.links, firstBrokenLink: verify.firstBrokenLink }));
      await app.close();
    } finally {
      await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await admin.end();
    }
  }

  if (!only || only === 'pdf') {
    try {
      const { benchPdf } = await import('./pdf.bench');
      const r = await benchPdf();
      console.log(JSON.stringify({ name: 'PDF report vs bare page.pdf (warm browser)', ...r }));
      results.push(r);
    } catch (err) {
      console.log(JSON.stringify({ name: 'PDF benchmark', error: (err as Error).message }));
    }
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});

/**
 * The audit download's server memory with the server in a process of its own (bench/growth.ts reads the download
 * in the server's process, so its peaks mix client, server and uncollected garbage). Starts the built service
 * (dist/apps/api/src/main.js) on a scratch PostgreSQL database, grows one product with SQL generate_series through
 * the real append function, and at each size downloads the CSV from this process while sampling the server's RSS
 * from /proc every 20 ms. Run: `npm run build && node dist/bench/csv-memory.js` (BENCH_CSV_SIZES=10000,100000
 * revisions; BENCH_PORT=3261; BENCH_SERVER_HEAP_MB caps the server's heap).
 */
import { spawn } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Client } from 'pg';
import { DataSource } from 'typeorm';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { loadConfig } from '../apps/api/src/infra/config';
import { Database } from '../apps/api/src/infra/database/database.service';
import { prepareSubmission, RecordStore } from '../apps/api/src/records/record-store';
import { ServiceKeys } from '../apps/api/src/records/service-keys';
import { BENCH_UNLIMITED } from './limits';
import { withScratchDatabase } from './scratch';

const root = join(__dirname, '../..');
const sizes = (process.env.BENCH_CSV_SIZES ?? '10000,100000').split(',').map(Number);
const port = Number(process.env.BENCH_PORT ?? 3261);

const rssMB = (pid: number) => Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))![1]) / 1024;

async function main() {
  await withScratchDatabase('csv', run);
}

/** The run on a scratch database of its own (`url`), dropped afterwards by withScratchDatabase. */
async function run(url: string) {
  const adminToken = `ll_bench_admin_${process.pid}_${'c'.repeat(16)}`;
  // BENCH_SERVER_HEAP_MB caps the server's V8 old space: a download that finishes under a cap smaller than the file
  // holds a bounded live set, whatever the RSS peaks (which include garbage V8 has not collected yet)
  const heapFlags = process.env.BENCH_SERVER_HEAP_MB ? [`--max-old-space-size=${process.env.BENCH_SERVER_HEAP_MB}`] : [];
  const server = spawn(process.execPath, [...heapFlags, join(root, 'dist/apps/api/src/main.js')], {
    env: { ...process.env, DATABASE_URL: url, PORT: String(port), LEADLINE_ADMIN_TOKEN: adminToken, LEADLINE_DEMO_SEED: 'false', LOG_LEVEL: 'error', ...BENCH_UNLIMITED },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  const db = new Client({ connectionString: url });
  db.on('error', () => undefined);
  let stopSeeder: () => Promise<unknown> = async () => undefined;
  const base = `http://127.0.0.1:${port}`;
  try {
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${base}/health`)).ok) break;
      } catch {
        /* not listening yet */
      }
      if (i > 200) throw new Error('service did not start');
      await new Promise((r) => setTimeout(r, 100));
    }
    const asAdmin = { authorization: `Bearer ${adminToken}`, 'content-type': 'application/json' };
    const user = await (await fetch(`${base}/api/v1/users`, { method: 'POST', headers: asAdmin, body: JSON.stringify({ name: 'CSV author', roles: ['author'] }) })).json();
    const token = (await (await fetch(`${base}/api/v1/users/${user.id}/tokens`, { method: 'POST', headers: asAdmin, body: '{}' })).json()).token;
    const auth = { authorization: `Bearer ${token}`, 'content-type': 'application/json' };
    const design = JSON.parse(readFileSync(join(root, 'test/fixtures/ok/trapezoidal-jack.json'), 'utf8'));
    const product = await (await fetch(`${base}/api/v1/products`, { method: 'POST', headers: auth, body: JSON.stringify({ code: 'CSV-MEM', name: 'csv memory' }) })).json();
    const calc = await (await fetch(`${base}/api/v1/products/${product.id}/calculations`, { method: 'POST', headers: auth, body: JSON.stringify({ title: 'csv', design }) })).json();
    // The stored bytes do not matter to the CSV (it prints summaries), only the number of entries does
    const s = prepareSubmission({ input: design, normalized: {}, evaluation: {}, findings: [], verdict: 'clear', engineVersion: '1', ruleSetVersion: DEFAULT_RULE_SET.version, note: 'csv memory' });
    await db.connect();
    // seeded through the service's chain writer (hash, MAC, record function), with the record key the server uses
    // (both run in this folder: <LEADLINE_DATA_DIR>/record-key)
    const seeder = new DataSource({ type: 'postgres', url: url, poolSize: 2, logging: false });
    await seeder.initialize();
    stopSeeder = () => seeder.destroy();
    const seedDb = new Database(seeder, false);
    const store = new RecordStore(seedDb, new ServiceKeys(seedDb, loadConfig({ DATABASE_URL: url })));
    const owner = { id: user.id as string, name: 'CSV author' };
    let revisions = 1;
    const idle = rssMB(server.pid!);
    for (const size of sizes) {
      for (; revisions < size; revisions += 250) {
        const n = Math.min(250, size - revisions);
        await seedDb.transaction(async (q) => {
          const cursor = (await store.lockHead(q, product.id))!;
          for (let i = 0; i < n; i++) await store.appendRevision(q, product.id, calc.calculationId, s, owner, cursor);
        });
      }
      for (const t of ['revisions', 'events']) await db.query(`ANALYZE ${t}`);
      const before = rssMB(server.pid!);
      let peak = before;
      const timer = setInterval(() => (peak = Math.max(peak, rssMB(server.pid!))), 20);
      const t0 = performance.now();
      const r = await fetch(`${base}/api/v1/products/${product.id}/audit?format=csv`, { headers: auth });
      let bytes = 0;
      for await (const chunk of r.body as unknown as AsyncIterable<Uint8Array>) bytes += chunk.length;
      const ms = performance.now() - t0;
      clearInterval(timer);
      console.log(JSON.stringify({
        name: 'CSV download, server in its own process', revisions: size, entries: 2 * size + 2, MB: +(bytes / 2 ** 20).toFixed(1), ms: Math.round(ms),
        serverHeapCapMB: process.env.BENCH_SERVER_HEAP_MB ? Number(process.env.BENCH_SERVER_HEAP_MB) : null, serverIdleRssMB: Math.round(idle), serverRssBeforeMB: Math.round(before), serverPeakRssMB: Math.round(peak), peakGrowthMB: Math.round(peak - before),
      }));
    }
  } finally {
    server.kill('SIGTERM');
    await stopSeeder().catch(() => undefined);
    await db.end().catch(() => undefined);
    await new Promise((r) => setTimeout(r, 500));
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);

/**
 * Once per integration run: launch one Chromium, migrate one template database on the PostgreSQL server and one
 * PGlite snapshot, and hand their addresses to the test files through the environment (test/support/run-resources.ts).
 * Every file still gets a database of its own: a copy of the template (CREATE DATABASE ... TEMPLATE), or a PGlite
 * started from the snapshot. test/support/global-teardown.ts undoes it.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { Client } from 'pg';
import puppeteer from 'puppeteer-core';
import { CHROMIUM_FLAGS } from '../../apps/api/src/infra/pdf/browser-pool';
import { createDataSource } from '../../apps/api/src/infra/database/data-source';
import { migrateServer } from '../../apps/api/src/infra/database/migrate';
import { ENV, serverUrl, withDatabase } from './run-resources';

/** Templates older than this are left over from runs that were killed: dropped at the next start. */
const STALE_MS = 6 * 3600_000;

async function admin<T>(work: (c: Client) => Promise<T>): Promise<T> {
  const client = new Client({ connectionString: serverUrl });
  client.on('error', () => undefined);
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

async function templateDatabase(): Promise<string> {
  const now = Date.now();
  await admin(async (c) => {
    const { rows } = await c.query<{ datname: string }>(`SELECT datname FROM pg_database WHERE datname LIKE 'leadline_tpl_%'`);
    for (const { datname } of rows) {
      const born = Number(datname.split('_')[2]);
      if (Number.isFinite(born) && now - born * 1000 > STALE_MS) {
        await c.query(`ALTER DATABASE ${datname} IS_TEMPLATE false`).catch(() => undefined);
        await c.query(`DROP DATABASE IF EXISTS ${datname} WITH (FORCE)`).catch(() => undefined);
      }
    }
  });
  const name = `leadline_tpl_${Math.floor(now / 1000)}_${randomBytes(4).toString('hex')}`;
  await admin((c) => c.query(`CREATE DATABASE ${name}`));
  await migrateServer({ DATABASE_URL: withDatabase(serverUrl, name), LEADLINE_MIGRATION_DATABASE_URL: undefined, LEADLINE_RUNTIME_ROLE: undefined }, silentLogger);
  await admin((c) => c.query(`ALTER DATABASE ${name} IS_TEMPLATE true`));
  return name;
}

async function pgliteSnapshotFile(dir: string): Promise<string> {
  const { dataSource } = createDataSource({ DATABASE_URL: undefined, LEADLINE_DATA_DIR: 'memory://', LEADLINE_DB_POOL: 1 });
  await dataSource.initialize();
  await dataSource.runMigrations({ transaction: 'each' });
  const { getPGliteInstance } = await import('typeorm-pglite');
  const pglite = await getPGliteInstance();
  const dump = await pglite.dumpDataDir('none');
  const file = join(dir, 'pglite-migrated.tar');
  writeFileSync(file, Buffer.from(await dump.arrayBuffer()));
  await dataSource.destroy();
  return file;
}

const silentLogger = { warn: () => undefined, log: () => undefined } as never;

export default async function globalSetup(): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'leadline-run-'));
  const started = Date.now();
  const [browser, template, snapshot] = await Promise.all([
    puppeteer.launch({ executablePath: process.env.LEADLINE_CHROMIUM_PATH ?? '/usr/bin/chromium', args: [...CHROMIUM_FLAGS], headless: true }),
    templateDatabase(),
    pgliteSnapshotFile(dir),
  ]);
  (globalThis as { __leadlineRun?: unknown }).__leadlineRun = { browser, template, dir };
  process.env[ENV.chromium] = browser.wsEndpoint();
  process.env[ENV.pgTemplate] = template;
  process.env[ENV.pgliteSnapshot] = snapshot;
  if (process.env.LEADLINE_TEST_VERBOSE) process.stderr.write(`integration run resources ready in ${Date.now() - started} ms\n`);
}

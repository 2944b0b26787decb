/**
 * Test harness: the real application on a real database. PostgreSQL tests create a fresh database per test
 * file on the server named by DATABASE_URL (default: the local server's postgres database); PGlite tests use
 * an in-memory embedded database. No mocks.
 */
import type { NestFastifyApplication } from '@nestjs/platform-fastify';
import { randomBytes } from 'node:crypto';
import { Client } from 'pg';
import type { DestinationStream } from 'pino';
import { createApp } from '../../apps/api/src/app.factory';
import { Database } from '../../apps/api/src/infra/database/database.service';

export type Backend = 'postgres' | 'pglite';
export const BACKENDS: Backend[] = ['postgres', 'pglite'];

const serverUrl = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';

function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

async function admin(sql: string): Promise<void> {
  const client = new Client({ connectionString: serverUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

export interface TestApp {
  app: NestFastifyApplication;
  db: Database;
  backend: Backend;
  call(method: string, url: string, body?: unknown, headers?: Record<string, string>): Promise<{ status: number; body: any; headers: Record<string, unknown>; text: string }>;
  close(): Promise<void>;
}

export async function startTestApp(backend: Backend, env: Record<string, string> = {}, logDestination?: DestinationStream): Promise<TestApp> {
  const base: Record<string, string> = { LOG_LEVEL: 'silent', LEADLINE_DEMO_SEED: 'false', ...env };
  let cleanup = async () => undefined as void;
  if (backend === 'postgres') {
    const name = `leadline_test_${randomBytes(6).toString('hex')}`;
    await admin(`CREATE DATABASE ${name}`);
    base.DATABASE_URL = withDatabase(serverUrl, name);
    base.LEADLINE_DB_POOL ??= '10';
    cleanup = () => admin(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  } else {
    base.LEADLINE_DATA_DIR = 'memory://';
  }
  const { app } = await createApp({ env: base, logDestination });
  const fastify = app.getHttpAdapter().getInstance();
  return {
    app,
    db: app.get(Database),
    backend,
    async call(method, url, body, headers = {}) {
      const res = await fastify.inject({
        method: method as 'GET',
        url,
        headers: { ...(body !== undefined && typeof body !== 'string' ? { 'content-type': 'application/json' } : {}), ...headers },
        payload: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
      });
      let parsed: unknown = res.body;
      try {
        parsed = JSON.parse(res.body);
      } catch {
        /* not JSON */
      }
      return { status: res.statusCode, body: parsed, headers: res.headers as Record<string, unknown>, text: res.body };
    },
    async close() {
      await app.close();
      await cleanup();
    },
  };
}

/** Counts rows of the record tables, to prove that a refused request stored nothing. */
export async function countRecords(db: Database): Promise<Record<string, number>> {
  const [row] = await db.query<Record<string, string>>(
    `SELECT (SELECT count(*) FROM products) AS products, (SELECT count(*) FROM calculations) AS calculations,
            (SELECT count(*) FROM revisions) AS revisions, (SELECT count(*) FROM events) AS events`,
  );
  return Object.fromEntries(Object.entries(row).map(([k, v]) => [k, Number(v)]));
}

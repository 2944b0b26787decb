/**
 * The real service with the reviewer pages mounted, listening on a real port (127.0.0.1, port 0) so that
 * Chromium can load it, on a fresh PostgreSQL database. Users are created through the admin API, as
 * test/support/harness.ts does.
 */
import type { NestFastifyApplication } from '@nestjs/platform-fastify';
import { randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import { Client } from 'pg';
import type { DestinationStream } from 'pino';
import { createApp } from '../../apps/api/src/app.factory';
import { PagesModule } from '../../apps/api/src/pages/pages.module';

const serverUrl = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';

async function admin(sql: string): Promise<void> {
  const client = new Client({ connectionString: serverUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

export type PageUser = 'author' | 'reviewer' | 'checkerAuthor' | 'admin';

const USERS: { who: Exclude<PageUser, 'admin'>; name: string; roles: string[] }[] = [
  { who: 'author', name: 'Design author (test)', roles: ['author'] },
  { who: 'reviewer', name: 'Checking engineer (test)', roles: ['reviewer'] },
  // may both submit and check, so that the four-eyes rule (not the role check) is what refuses self-approval
  { who: 'checkerAuthor', name: 'Checker who also designs (test)', roles: ['reviewer', 'author'] },
];

export interface PagesApp {
  app: NestFastifyApplication;
  /** http://127.0.0.1:<port> */
  baseUrl: string;
  tokens: Record<PageUser, string>;
  call(method: string, url: string, body?: unknown, as?: PageUser): Promise<{ status: number; body: any; headers: Record<string, unknown> }>;
  close(): Promise<void>;
}

export async function startPagesApp(env: Record<string, string> = {}, logDestination?: DestinationStream): Promise<PagesApp> {
  const name = `leadline_test_${randomBytes(6).toString('hex')}`;
  await admin(`CREATE DATABASE ${name}`);
  const url = new URL(serverUrl);
  url.pathname = `/${name}`;
  const adminToken = `ll_test_admin_${randomBytes(18).toString('hex')}`;
  const { app } = await createApp({
    env: { LOG_LEVEL: 'silent', LEADLINE_DEMO_SEED: 'false', LEADLINE_ADMIN_TOKEN: adminToken, DATABASE_URL: url.toString(), LEADLINE_DB_POOL: '10', ...env },
    logDestination,
    extraModules: [PagesModule],
  });
  await app.listen({ port: 0, host: '127.0.0.1' });
  const address = app.getHttpServer().address() as AddressInfo;
  const fastify = app.getHttpAdapter().getInstance();
  const tokens = { admin: adminToken } as Record<PageUser, string>;
  const pages: PagesApp = {
    app,
    baseUrl: `http://127.0.0.1:${address.port}`,
    tokens,
    async call(method, path, body, as = 'author') {
      const res = await fastify.inject({
        method: method as 'GET',
        url: path,
        headers: { authorization: `Bearer ${tokens[as]}`, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
        payload: body === undefined ? undefined : JSON.stringify(body),
      });
      let parsed: unknown = res.body;
      try {
        parsed = JSON.parse(res.body);
      } catch {
        /* not JSON */
      }
      return { status: res.statusCode, body: parsed, headers: res.headers as Record<string, unknown> };
    },
    async close() {
      await app.close();
      await admin(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    },
  };
  for (const u of USERS) {
    const created = await pages.call('POST', '/api/v1/users', { name: u.name, roles: u.roles }, 'admin');
    if (created.status !== 201) throw new Error(`could not create ${u.who}: ${JSON.stringify(created.body)}`);
    tokens[u.who] = (await pages.call('POST', `/api/v1/users/${created.body.id}/tokens`, {}, 'admin')).body.token;
  }
  return pages;
}

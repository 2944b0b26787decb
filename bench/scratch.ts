/**
 * What the benchmarks share: a scratch database on the server (created, handed over, dropped), and the service
 * in-process with the baseline routes (bench/baseline.module.ts) and one author with a bearer token.
 */
import { Client } from 'pg';
import type { NestFastifyApplication } from '@nestjs/platform-fastify';
import { createApp } from '../apps/api/src/app.factory';
import { BaselineModule } from './baseline.module';
import { BENCH_UNLIMITED } from './limits';

/** A scratch database on DATABASE_URL's server (default the local postgres), dropped afterwards. */
export async function withScratchDatabase<T>(suffix: string, body: (url: string) => Promise<T>): Promise<T> {
  const serverUrl = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';
  const name = `leadline_bench_${suffix}_${process.pid}`;
  const admin = new Client({ connectionString: serverUrl });
  admin.on('error', () => undefined);
  await admin.connect();
  await admin.query(`CREATE DATABASE ${name}`);
  const u = new URL(serverUrl);
  u.pathname = `/${name}`;
  try {
    return await body(u.toString());
  } finally {
    await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    await admin.end();
  }
}

export interface BenchApp {
  readonly app: NestFastifyApplication;
  readonly base: string;
  readonly token: string;
  readonly user: { readonly id: string; readonly name: string };
}

/** The service listening on a free loopback port, the per-user limits raised, with one author and their token. */
export async function startBenchApp(env: Record<string, string>): Promise<BenchApp> {
  const admin = `ll_bench_admin_${process.pid}_${'x'.repeat(16)}`;
  const { app } = await createApp({ env: { LOG_LEVEL: 'warn', LEADLINE_DEMO_SEED: 'false', LEADLINE_ADMIN_TOKEN: admin, ...BENCH_UNLIMITED, ...env }, extraModules: [BaselineModule] });
  await app.listen({ port: 0, host: '127.0.0.1' });
  const base = `http://127.0.0.1:${(app.getHttpServer().address() as { port: number }).port}`;
  const asAdmin = { authorization: `Bearer ${admin}`, 'content-type': 'application/json' };
  const user = await (await fetch(`${base}/api/v1/users`, { method: 'POST', headers: asAdmin, body: JSON.stringify({ name: 'Benchmark author', roles: ['author'] }) })).json();
  const token = (await (await fetch(`${base}/api/v1/users/${user.id}/tokens`, { method: 'POST', headers: asAdmin, body: '{}' })).json()).token as string;
  return { app, base, token, user: { id: user.id as string, name: 'Benchmark author' } };
}

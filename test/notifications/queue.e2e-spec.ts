/**
 * The job queue on PostgreSQL as the least-privilege runtime role: two instances on one database each run a job at
 * most once and together run every job; a job whose instance died is taken again once its lease runs out (by the
 * injected clock); the runtime role changes jobs only through the queue functions.
 */
import type { NestFastifyApplication } from '@nestjs/platform-fastify';
import { Client } from 'pg';
import { createApp } from '../../apps/api/src/app.factory';
import { Database } from '../../apps/api/src/infra/database/database.service';
import { once } from 'node:events';
import { RevocationListener } from '../../apps/api/src/notifications/revocation-listener';
import { QueueService, type Job } from '../../apps/api/src/queue/queue.service';
import { TestClock } from '../support/clock';
import { startTestApp, UNLIMITED, type TestApp } from '../support/harness';

let t: TestApp;
let second: NestFastifyApplication;
let clock: TestClock;
const runs: { job: string; by: string }[] = [];

beforeAll(async () => {
  clock = new TestClock();
  t = await startTestApp('postgres', {}, undefined, { roles: true, clock });
  // A second instance of the service on the same database, as the same runtime role
  ({ app: second } = await createApp({
    env: {
      LOG_LEVEL: 'silent', LEADLINE_DEMO_SEED: 'false', LEADLINE_WORKERS: '0', ...UNLIMITED,
      DATABASE_URL: t.roles!.runtimeUrl, LEADLINE_MIGRATION_DATABASE_URL: t.roles!.ownerUrl,
    },
    runtime: { clock },
  }));
  for (const [name, app] of [['first', t.app], ['second', second]] as const) {
    app.get(QueueService).handle('test.count', async (job: Job) => {
      runs.push({ job: job.id, by: name });
      // Let the other instance claim meanwhile: each job is awaited across a real database round trip
      await app.get(Database).query(`SELECT pg_sleep(0)`);
    });
  }
});
afterAll(async () => {
  await second?.close();
  await t?.close();
});

it('runs every job once across two instances draining at the same time', async () => {
  const queue = t.app.get(QueueService);
  const ids: string[] = [];
  for (let i = 0; i < 60; i++) ids.push((await queue.enqueue(t.db, 'test.count', { i }))!);
  runs.length = 0;
  const [a, b] = await Promise.all([queue.drain(), second.get(QueueService).drain()]);
  expect(a + b).toBe(60);
  expect(runs.map((r) => r.job).sort()).toEqual([...ids].sort());
  const states = await t.db.query<{ state: string; n: string }>(`SELECT state, count(*) AS n FROM queue.jobs WHERE kind = 'test.count' GROUP BY state`);
  expect(states).toEqual([{ state: 'done', n: '60' }]);
});

it('takes a job again once the lease of the instance that claimed it (and died) has run out', async () => {
  const queue = t.app.get(QueueService);
  const id = (await queue.enqueue(t.db, 'test.count', { orphan: true }))!;
  // An instance claims it and dies before finishing: its lease is all that is left
  const [claimed] = await t.db.query<{ id: string }>(`SELECT id FROM queue.claim('dead-instance', ARRAY['test.count'], 1, $1, 120)`, [new Date(clock.now()).toISOString()]);
  expect(claimed.id).toBe(id);
  runs.length = 0;
  expect(await second.get(QueueService).drain()).toBe(0);
  clock.advance(121_000);
  expect(await second.get(QueueService).drain()).toBe(1);
  expect(runs).toEqual([{ job: id, by: 'second' }]);
  // The dead instance's late answer changes nothing
  const [late] = await t.db.query<{ finish: boolean }>(`SELECT queue.finish($1, 'dead-instance', 'failed', NULL, 'late', NULL) AS finish`, [id]);
  expect(late.finish).toBe(false);
  expect((await queue.get(id))!.state).toBe('done');
});

it('keeps the runtime role to SELECT, INSERT and the queue functions', async () => {
  const runtime = new Client({ connectionString: t.roles!.runtimeUrl });
  runtime.on('error', () => undefined);
  await runtime.connect();
  try {
    const refused = async (sql: string) => expect((await runtime.query(sql).catch((e) => e)).code).toBe('42501');
    await refused(`UPDATE queue.jobs SET state = 'done'`);
    await refused(`DELETE FROM queue.jobs`);
    await refused(`TRUNCATE queue.jobs`);
    await refused(`UPDATE queue.webhook_endpoints SET enabled = true`);
    await refused(`DELETE FROM queue.webhook_attempts`);
    await refused(`SELECT queue.enqueue_record_event()`);
    await refused(`DROP TABLE queue.jobs`);
    await refused(`CREATE TABLE queue.extra (id int)`);
  } finally {
    await runtime.end();
  }
});

it('refuses a token revoked on one instance on the other at once, although the other had it cached', async () => {
  const other = second.getHttpAdapter().getInstance();
  const me = () => other.inject({ method: 'GET', url: '/api/v1/me', headers: { authorization: `Bearer ${t.tokens.author2}` } });
  expect((await me()).statusCode).toBe(200);
  expect((await me()).statusCode).toBe(200); // now answered from the second instance's two-second cache
  const tokens = await t.call('GET', `/api/v1/users/${t.users.author2}/tokens`, undefined, { as: 'admin' });
  const tokenId = tokens.body.items[0].id;
  const notice = once(second.get(RevocationListener).events, 'revoked');
  expect((await t.call('POST', `/api/v1/users/${t.users.author2}/tokens/${tokenId}/revoke`, undefined, { as: 'admin' })).status).toBe(200);
  // The NOTIFY is sent at the revocation's commit; the other instance drops its cache when it arrives
  expect(await notice).toEqual([tokenId]);
  expect((await me()).statusCode).toBe(401);
});

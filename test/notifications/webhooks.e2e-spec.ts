/**
 * Webhooks through the real path: admin routes, the outbox trigger in the record's transaction, the queue on
 * PostgreSQL as the least-privilege runtime role, deliveries to a receiver on loopback (allowed by configuration in
 * this suite only), signatures checked with the Standard Webhooks reference verifier (standardwebhooks), retries
 * decided by the injected clock.
 */
import { Webhook } from 'standardwebhooks';
import { QueueService } from '../../apps/api/src/queue/queue.service';
import { RecordStore } from '../../apps/api/src/records/record-store';
import { TestClock } from '../support/clock';
import { clearDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';
import { startReceiver, type Receiver } from './receiver';

let t: TestApp;
let clock: TestClock;
let receiver: Receiver;
let queue: QueueService;
let productId: string;

beforeAll(async () => {
  clock = new TestClock();
  receiver = await startReceiver();
  t = await startTestApp('postgres', { LEADLINE_WEBHOOK_ALLOW_PRIVATE: 'true' }, undefined, { roles: true, clock });
  queue = t.app.get(QueueService);
  productId = (await t.call('POST', '/api/v1/products', { code: 'WH-10', name: 'Harrowgate WH-10 lifting table (test product)' })).body.id;
});
afterAll(async () => {
  await t?.close();
  await receiver?.close();
});

async function createEndpoint(events: string[]) {
  const res = await t.call('POST', '/api/v1/webhooks', { url: receiver.url, events }, { as: 'admin' });
  expect(res.status).toBe(201);
  return res.body as { id: string; secret: string; enabled: boolean };
}

/** Runs every due job; attempts whose retry is due later wait for the clock. */
const drain = () => queue.drain();

it('shows the secret once: in the answer to create, never in the list [POST/GET /api/v1/webhooks]', async () => {
  const created = await createEndpoint(['calculation.opened']);
  expect(created.secret).toMatch(/^whsec_[A-Za-z0-9+/]{43}=$/);
  const list = await t.call('GET', '/api/v1/webhooks', undefined, { as: 'admin' });
  const listed = list.body.items.find((e: { id: string }) => e.id === created.id);
  expect(listed).toMatchObject({ url: receiver.url, events: ['calculation.opened'], enabled: true });
  expect(JSON.stringify(list.body)).not.toContain(created.secret.slice(6));
  expect((await t.call('GET', '/api/v1/webhooks', undefined, { as: 'reviewer' })).status).toBe(403);
  await t.call('POST', `/api/v1/webhooks/${created.id}/disable`, undefined, { as: 'admin' });
});

it('refuses loopback, private and malformed targets by default, naming the field [POST /api/v1/webhooks]', async () => {
  const strict = await startTestApp('pglite');
  try {
    for (const url of ['http://127.0.0.1:9/x', 'http://10.0.0.8/x', 'http://[::1]/x', 'http://169.254.169.254/latest', 'ftp://example.org/x']) {
      const res = await strict.call('POST', '/api/v1/webhooks', { url, events: ['revision.approved'] }, { as: 'admin' });
      expect(res.status).toBe(422);
      expect(res.body.errors[0].path).toBe('url');
    }
    const badEvent = await strict.call('POST', '/api/v1/webhooks', { url: 'https://example.org/x', events: ['revision.deleted'] }, { as: 'admin' });
    expect(badEvent.status).toBe(422);
    expect(badEvent.body.errors[0].path).toBe('events.0');
    expect((await strict.call('GET', '/api/v1/webhooks', undefined, { as: 'admin' })).body.items).toEqual([]);
  } finally {
    await strict.close();
  }
});

it('delivers a submission after a 500 with the same webhook-id twice; the reference verifier accepts it and refuses a tampered body', async () => {
  const endpoint = await createEndpoint(['revision.submitted']);
  receiver.received.length = 0;
  receiver.script.push({ status: 500 });
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Table lift screw', design: clearDesign });
  expect(opened.status).toBe(201);

  await drain();
  expect(receiver.received).toHaveLength(1);
  const attempts1 = (await t.call('GET', `/api/v1/webhooks/${endpoint.id}/attempts`, undefined, { as: 'admin' })).body.items;
  expect(attempts1).toMatchObject([{ attempt: 1, status: 500, outcome: 'retry' }]);
  // Not due yet: nothing more is sent until the clock reaches the recorded next attempt
  await drain();
  expect(receiver.received).toHaveLength(1);
  clock.advance(Date.parse(attempts1[0].nextAttemptAt) - clock.now() + 1);
  await drain();

  expect(receiver.received).toHaveLength(2);
  const [first, second] = receiver.received;
  expect(second.headers['webhook-id']).toBe(first.headers['webhook-id']);
  expect(second.body).toBe(first.body);
  const payload = JSON.parse(second.body);
  expect(payload).toEqual({
    type: 'revision.submitted',
    timestamp: expect.stringMatching(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{6}Z$/),
    data: { eventId: expect.any(String), productId, calculationId: opened.body.calculationId, revisionId: opened.body.revisionId },
  });
  const verifier = new Webhook(endpoint.secret);
  const headers = second.headers as Record<string, string>;
  expect(verifier.verify(second.body, headers)).toEqual(payload);
  expect(() => verifier.verify(second.body.replace('revision.submitted', 'revision.approved'), headers)).toThrow();
  expect(() => new Webhook(`whsec_${Buffer.alloc(32, 7).toString('base64')}`).verify(second.body, headers)).toThrow();

  const attempts = (await t.call('GET', `/api/v1/webhooks/${endpoint.id}/attempts`, undefined, { as: 'admin' })).body.items;
  expect(attempts.map((a: { attempt: number; outcome: string; status: number }) => [a.attempt, a.outcome, a.status])).toEqual([
    [2, 'delivered', 200],
    [1, 'retry', 500],
  ]);
  await t.call('POST', `/api/v1/webhooks/${endpoint.id}/disable`, undefined, { as: 'admin' });
});

// Before the tests that move the clock by hours: the reference verifier checks webhook-timestamp against the real time
it('signs with the new secret after a rotation; the old one no longer verifies [POST /api/v1/webhooks/:id/rotate]', async () => {
  const endpoint = await createEndpoint(['calculation.opened']);
  const rotated = await t.call('POST', `/api/v1/webhooks/${endpoint.id}/rotate`, undefined, { as: 'admin' });
  expect(rotated.status).toBe(200);
  expect(rotated.body.secret).not.toBe(endpoint.secret);
  receiver.received.length = 0;
  await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Fifth table screw', design: clearDesign });
  await drain();
  const [got] = receiver.received;
  expect(new Webhook(rotated.body.secret).verify(got.body, got.headers as Record<string, string>)).toMatchObject({ type: 'calculation.opened' });
  expect(() => new Webhook(endpoint.secret).verify(got.body, got.headers as Record<string, string>)).toThrow();
  await t.call('POST', `/api/v1/webhooks/${endpoint.id}/disable`, undefined, { as: 'admin' });
});

it('honours Retry-After over its own backoff', async () => {
  const endpoint = await createEndpoint(['calculation.opened']);
  receiver.received.length = 0;
  receiver.script.push({ status: 503, headers: { 'retry-after': '3600' } });
  const before = clock.now();
  await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Second table screw', design: clearDesign });
  await drain();
  const [attempt] = (await t.call('GET', `/api/v1/webhooks/${endpoint.id}/attempts`, undefined, { as: 'admin' })).body.items;
  expect(attempt).toMatchObject({ status: 503, outcome: 'retry' });
  const wait = Date.parse(attempt.nextAttemptAt) - before;
  expect(wait).toBeGreaterThanOrEqual(3600_000);
  expect(wait).toBeLessThan(3600_000 + 60_000);
  clock.advance(1800_000);
  await drain();
  expect(receiver.received).toHaveLength(1);
  clock.advance(1800_000 + 60_000);
  await drain();
  expect(receiver.received).toHaveLength(2);
  await t.call('POST', `/api/v1/webhooks/${endpoint.id}/disable`, undefined, { as: 'admin' });
});

it('disables an endpoint whose receiver answers 410 Gone, and sends it nothing more', async () => {
  const endpoint = await createEndpoint(['calculation.opened']);
  receiver.received.length = 0;
  receiver.script.push({ status: 410 });
  await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Third table screw', design: clearDesign });
  await drain();
  const after = await t.call('GET', `/api/v1/webhooks/${endpoint.id}`, undefined, { as: 'admin' });
  expect(after.body).toMatchObject({ enabled: false, disabledReason: 'the receiver answered 410 Gone' });
  await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Fourth table screw', design: clearDesign });
  clock.advance(48 * 3600_000);
  await drain();
  expect(receiver.received).toHaveLength(1);
  expect((await t.call('GET', `/api/v1/webhooks/${endpoint.id}/attempts`, undefined, { as: 'admin' })).body.items).toMatchObject([{ status: 410, outcome: 'disabled' }]);
});

it('enqueues in the record transaction: a rolled-back event leaves no job, a committed decision always does', async () => {
  const endpoint = await createEndpoint(['revision.approved', 'revision.rejected']);
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Sixth table screw', design: clearDesign });
  await drain();
  receiver.received.length = 0;
  // A comment appended through the record store, then the transaction fails: the event and its job go together
  const records = t.app.get(RecordStore);
  let eventId = '';
  await expect(
    t.db.transaction(async (q) => {
      const cursor = (await records.lockHead(q, productId))!;
      eventId = (await records.appendEvent(q, cursor, {
        productId, type: 'comment', calculationId: opened.body.calculationId, revisionId: opened.body.revisionId,
        actor: { id: t.users.author, name: 'Design author (test)' }, data: { revision: 1, text: 'rolled back', target: null },
      })).id;
      const [inside] = await q.query<{ n: string }>(`SELECT count(*) AS n FROM queue.jobs WHERE dedupe_key = $1`, [`event:${eventId}`]);
      expect(Number(inside.n)).toBe(1);
      throw new Error('the transaction fails after the event was written');
    }),
  ).rejects.toThrow('the transaction fails');
  const [after] = await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM queue.jobs WHERE dedupe_key = $1`, [`event:${eventId}`]);
  expect(Number(after.n)).toBe(0);
  await drain();
  expect(receiver.received).toEqual([]);
  const decided = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'approve', comment: 'Margins fine.' }, { as: 'reviewer' });
  expect(decided.status).toBe(201);
  await drain();
  expect(receiver.received.map((r) => JSON.parse(r.body))).toMatchObject([{ type: 'revision.approved', data: { eventId: decided.body.eventId, revisionId: opened.body.revisionId } }]);
  await t.call('POST', `/api/v1/webhooks/${endpoint.id}/disable`, undefined, { as: 'admin' });
});

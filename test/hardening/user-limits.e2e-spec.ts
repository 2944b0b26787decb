/**
 * Per-user limits (429 problem+json with Retry-After, configured per kind): screw searches, evaluations,
 * submissions (products, calculations, revisions: permanent records) and PDFs. The limit is the user's: another
 * user is not affected, and the allowance comes back as the service's clock moves on (a TestClock, no waiting).
 */
import { TestClock } from '../support/clock';
import { changedDesign, clearDesign } from '../support/designs';
import { BACKENDS, countRecords, startTestApp, type TestApp } from '../support/harness';
import { createApp } from '../../apps/api/src/app.factory';
import { LeasedAllowances, TokenBuckets } from '../../apps/api/src/infra/http/user-limits';
import { LEAD_SCREW } from '../support/sizing';

const clock = new TestClock();
let t: TestApp;
beforeAll(async () => {
  t = await startTestApp(
    'postgres',
    {
      LEADLINE_SEARCHES_PER_USER_PER_MINUTE: '2',
      LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE: '3',
      LEADLINE_SUBMISSIONS_PER_USER_PER_MINUTE: '3',
      LEADLINE_PDFS_PER_USER_PER_MINUTE: '1',
    },
    undefined,
    { clock, roles: true },
  );
});
afterAll(() => t?.close());

function expectLimited(res: { status: number; headers: Record<string, unknown>; body: any }, setting: string) {
  expect(res.status).toBe(429);
  expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  expect(Number(res.headers['retry-after'])).toBeGreaterThanOrEqual(1);
  expect(res.body.detail).toContain(setting);
}

const search = { requirements: LEAD_SCREW, search: { forms: ['trapezoidal'], starts: [1], majorDiameter: { max: '20 mm' }, nutLength: { ratios: [2] } } };

it('limits screw searches per user [POST /api/v1/sizing]', async () => {
  for (let i = 0; i < 2; i++) expect((await t.call('POST', '/api/v1/sizing', search)).status).toBe(200);
  const refused = await t.call('POST', '/api/v1/sizing', search);
  expectLimited(refused, 'LEADLINE_SEARCHES_PER_USER_PER_MINUTE');
  // one search a minute / 2 = 30 s until the next
  expect(Number(refused.headers['retry-after'])).toBeLessThanOrEqual(30);
  expect((await t.call('POST', '/api/v1/sizing', search, { as: 'reviewer' })).status).toBe(200);
  clock.advance(Number(refused.headers['retry-after']) * 1000);
  expect((await t.call('POST', '/api/v1/sizing', search)).status).toBe(200);
});

it('limits evaluations per user, the charts of an unsaved design counted with them [POST /api/v1/evaluations]', async () => {
  expect((await t.call('POST', '/api/v1/evaluations', clearDesign, { as: 'author2' })).status).toBe(200);
  expect((await t.call('POST', '/api/v1/evaluations', clearDesign, { as: 'author2' })).status).toBe(200);
  expect((await t.call('POST', '/api/v1/evaluations/charts', clearDesign, { as: 'author2' })).status).toBe(200);
  expectLimited(await t.call('POST', '/api/v1/evaluations', clearDesign, { as: 'author2' }), 'LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE');
  expectLimited(await t.call('POST', '/api/v1/evaluations/charts', clearDesign, { as: 'author2' }), 'LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE');
  expect((await t.call('POST', '/api/v1/evaluations', clearDesign, { as: 'reviewer2' })).status).toBe(200);
  clock.advance(60_000);
  expect((await t.call('POST', '/api/v1/evaluations', clearDesign, { as: 'author2' })).status).toBe(200);
});

it('limits submissions per user and stores nothing for a refused one [POST /products, /calculations, /revisions]', async () => {
  clock.advance(60_000);
  const product = await t.call('POST', '/api/v1/products', { code: 'UL-1', name: 'Limits' });
  const opened = await t.call('POST', `/api/v1/products/${product.body.id}/calculations`, { title: 'screw', design: clearDesign });
  const revised = await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: changedDesign(clearDesign, 2) });
  expect([product.status, opened.status, revised.status]).toEqual([201, 201, 201]);
  const before = await countRecords(t.db);
  expectLimited(await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: changedDesign(clearDesign, 3) }), 'LEADLINE_SUBMISSIONS_PER_USER_PER_MINUTE');
  expectLimited(await t.call('POST', '/api/v1/products', { code: 'UL-2', name: 'Limits' }), 'LEADLINE_SUBMISSIONS_PER_USER_PER_MINUTE');
  expect(await countRecords(t.db)).toEqual(before);
  clock.advance(20_000); // 3 a minute: one more after 20 s
  expect((await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: changedDesign(clearDesign, 3) })).status).toBe(201);
});

it('limits PDFs per user over both PDF routes [GET report.pdf, design-file.pdf]', async () => {
  clock.advance(60_000);
  const product = await t.call('POST', '/api/v1/products', { code: 'UL-PDF', name: 'PDF limits' }, { as: 'reviewer2' });
  const opened = await t.call('POST', `/api/v1/products/${product.body.id}/calculations`, { title: 'screw', design: clearDesign }, { as: 'reviewer2' });
  expect((await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.pdf`, undefined, { as: 'reviewer' })).status).toBe(200);
  expectLimited(await t.call('GET', `/api/v1/products/${product.body.id}/design-file.pdf`, undefined, { as: 'reviewer' }), 'LEADLINE_PDFS_PER_USER_PER_MINUTE');
  expectLimited(await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.pdf`, undefined, { as: 'reviewer' }), 'LEADLINE_PDFS_PER_USER_PER_MINUTE');
  // the HTML report is not limited
  expect((await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.html`, undefined, { as: 'reviewer' })).status).toBe(200);
  clock.advance(60_000);
  expect((await t.call('GET', `/api/v1/products/${product.body.id}/design-file.pdf`, undefined, { as: 'reviewer' })).status).toBe(200);
  // the queued design file counts as a PDF too
  expectLimited(await t.call('POST', `/api/v1/products/${product.body.id}/design-files`, {}, { as: 'reviewer' }), 'LEADLINE_PDFS_PER_USER_PER_MINUTE');
});

it('shares each user\'s allowance between two instances on one PostgreSQL', async () => {
  const { app: second } = await createApp({
    env: {
      LOG_LEVEL: 'silent', LEADLINE_DEMO_SEED: 'false', LEADLINE_WORKERS: '0', DATABASE_URL: t.roles!.runtimeUrl, LEADLINE_MIGRATION_DATABASE_URL: t.roles!.ownerUrl,
      LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE: '3',
    },
    runtime: { clock },
  });
  try {
    clock.advance(60_000);
    const onSecond = async () => (await second.getHttpAdapter().getInstance().inject({
      method: 'POST', url: '/api/v1/evaluations', headers: { 'content-type': 'application/json', authorization: `Bearer ${t.tokens.reviewer}` }, payload: JSON.stringify(clearDesign),
    })).statusCode;
    const onFirst = async () => (await t.call('POST', '/api/v1/evaluations', clearDesign, { as: 'reviewer' })).status;
    // 3 a minute for one user, taken on either instance
    expect([await onFirst(), await onSecond(), await onFirst()]).toEqual([200, 200, 200]);
    expect(await onSecond()).toBe(429);
    expect(await onFirst()).toBe(429);
    clock.advance(20_000);
    expect(await onSecond()).toBe(200);
    expect(await onFirst()).toBe(429);
  } finally {
    await second.close();
  }
});

describe.each(BACKENDS)('TokenBuckets on %s', (backend) => {
  let db: TestApp;
  beforeAll(async () => (db = await startTestApp(backend)));
  afterAll(() => db?.close());

  it('allows a minute\'s allowance at once, then one more each 60/perMinute seconds; a refused take costs nothing', async () => {
    const b = new TokenBuckets(db.db, 'test:a', 3);
    const t0 = Date.parse('2026-12-05T10:00:00Z');
    expect([await b.take('u', t0), await b.take('u', t0), await b.take('u', t0)]).toEqual([0, 0, 0]);
    expect(await b.take('u', t0)).toBe(20); // 3 a minute: the next one in 20 s
    expect(await b.take('u', t0 + 19_000)).toBe(1); // 1 s left
    expect(await b.take('u', t0 + 20_000)).toBe(0);
    expect(await b.take('other', t0 + 20_000)).toBe(0); // every key has its own bucket
    expect(await new TokenBuckets(db.db, 'test:b', 3).take('u', t0 + 20_000)).toBe(0); // and every kind
  });

  it('never holds more than a minute\'s allowance, however long a user was away', async () => {
    const b = new TokenBuckets(db.db, 'test:c', 2);
    expect(await b.take('u', 0)).toBe(0);
    const later = 3_600_000;
    expect([await b.take('u', later), await b.take('u', later), await b.take('u', later)]).toEqual([0, 0, 30]);
  });

  it('two instances leasing from one bucket allow exactly its allowance together, in far fewer round trips than requests', async () => {
    const bucket = new TokenBuckets(db.db, 'test:lease', 600);
    let roundTrips = 0;
    const counted = Object.assign(Object.create(bucket) as TokenBuckets, {
      takeUpTo: (key: string, now: number, want: number) => { roundTrips++; return bucket.takeUpTo(key, now, want); },
    });
    const instances = [new LeasedAllowances(counted), new LeasedAllowances(counted)];
    const now = Date.parse('2026-12-05T11:00:00Z');
    let allowed = 0;
    let refusedOnce = false;
    for (let i = 0; i < 700 && !refusedOnce; i++) {
      const lease = instances[i % 2];
      if (lease.spendLocal('u') || (await lease.refill('u', now)) === 0) allowed++;
      else refusedOnce = true;
    }
    // Leases of up to 600 / 20 = 30 tokens: the allowed requests cost a few dozen round trips, not 600 (a refused
    // request asks the shared bucket each time, since it may have refilled)
    expect(roundTrips).toBeLessThan(60);
    // Both instances then drain what their leases still hold, and not one more is allowed at this instant
    for (let i = 0; i < 100; i++) if (instances[i % 2].spendLocal('u')) allowed++;
    expect(allowed).toBe(600); // the minute's allowance, spread over both instances, and not one more
    expect(await instances[0].refill('u', now)).toBe(1); // 600 a minute: the next in 0.1 s, said as the whole second
    expect(await instances[1].refill('u', now + 100)).toBe(0); // and 0.1 s later there is one
  });
});

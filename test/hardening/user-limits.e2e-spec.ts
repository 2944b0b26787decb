/**
 * Per-user limits (429 problem+json with Retry-After, configured per kind): screw searches, evaluations,
 * submissions (products, calculations, revisions: permanent records) and PDFs. The limit is the user's: another
 * user is not affected, and the allowance comes back as the service's clock moves on (a TestClock, no waiting).
 */
import { TestClock } from '../support/clock';
import { changedDesign, clearDesign } from '../support/designs';
import { countRecords, startTestApp, type TestApp } from '../support/harness';
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
    { clock },
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
});

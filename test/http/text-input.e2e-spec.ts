/**
 * Attack: text that cannot be stored (U+0000, an unpaired UTF-16 surrogate) in any free string of a request.
 * Before: 500 from the database and, for some fields, a half-written record. Now: 422 naming the field, and
 * the record tables (and users) hold exactly as many rows as before.
 */
import { clearDesign } from '../support/designs';
import { countRecords, startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
const ids: Record<string, string> = {};

beforeAll(async () => {
  t = await startTestApp('postgres');
  ids.product = (await t.call('POST', '/api/v1/products', { code: 'TX-1', name: 'Text test product' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${ids.product}/calculations`, { title: 'text', design: clearDesign });
  ids.calculation = opened.body.calculationId;
  ids.revision = opened.body.revisionId;
});
afterAll(() => t?.close());

const NUL = 'bad\u0000text';
const HIGH = 'bad\ud800text';
const LOW = 'bad\udc00';

const withSource = (reference: string) => ({
  ...clearDesign,
  friction: { ...clearDesign.friction, thread: { ...clearDesign.friction.thread, source: { kind: 'handbook', reference } } },
});

const CASES: { name: string; method: string; url: () => string; body: (s: string) => unknown; field: string; as?: 'admin' | 'reviewer' }[] = [
  { name: 'product name', method: 'POST', url: () => '/api/v1/products', body: (s) => ({ code: 'TX-2', name: s }), field: 'name' },
  { name: 'product code', method: 'POST', url: () => '/api/v1/products', body: (s) => ({ code: s, name: 'x' }), field: 'code' },
  { name: 'calculation title', method: 'POST', url: () => `/api/v1/products/${ids.product}/calculations`, body: (s) => ({ title: s, design: clearDesign }), field: 'title' },
  { name: 'design input string', method: 'POST', url: () => `/api/v1/products/${ids.product}/calculations`, body: (s) => ({ title: 'ok', design: withSource(s) }), field: 'design.friction.thread.source.reference' },
  { name: 'revision note', method: 'POST', url: () => `/api/v1/calculations/${ids.calculation}/revisions`, body: (s) => ({ design: clearDesign, note: s }), field: 'note' },
  { name: 'comment text', method: 'POST', url: () => `/api/v1/revisions/${ids.revision}/comments`, body: (s) => ({ text: s }), field: 'text', as: 'reviewer' },
  { name: 'decision comment', method: 'POST', url: () => `/api/v1/revisions/${ids.revision}/decisions`, body: (s) => ({ decision: 'reject', comment: s }), field: 'comment', as: 'reviewer' },
  { name: 'user name', method: 'POST', url: () => '/api/v1/users', body: (s) => ({ name: s, roles: ['author'] }), field: 'name', as: 'admin' },
  { name: 'field name (object key)', method: 'POST', url: () => '/api/v1/products', body: (s) => ({ code: 'TX-3', name: 'x', [s]: 1 }), field: '(key)' },
];

async function counts() {
  const [u] = await t.db.query<{ users: string; tokens: string; closures: string }>(
    `SELECT (SELECT count(*) FROM users) AS users, (SELECT count(*) FROM tokens) AS tokens, (SELECT count(*) FROM revision_closures) AS closures`,
  );
  return { ...(await countRecords(t.db)), users: Number(u.users), tokens: Number(u.tokens), closures: Number(u.closures) };
}

describe.each([
  ['NUL (U+0000)', NUL, /NUL/],
  ['lone high surrogate', HIGH, /unpaired surrogate/],
  ['lone low surrogate', LOW, /unpaired surrogate/],
])('%s', (_label, bad, message) => {
  it.each(CASES.map((c) => [c.name, c] as const))('in the %s answers 422 naming the field and stores nothing', async (_n, c) => {
    const before = await counts();
    const res = await t.call(c.method, c.url(), c.body(bad), { as: c.as ?? 'author' });
    expect(res.status).toBe(422);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.errors).toEqual(expect.arrayContaining([expect.objectContaining({ path: c.field, message: expect.stringMatching(message) })]));
    expect(await counts()).toEqual(before);
  });
});

it('refuses such text in a stateless evaluation too, and in a query string', async () => {
  const res = await t.call('POST', '/api/v1/evaluations', withSource(NUL));
  expect(res.status).toBe(422);
  expect(res.body.errors[0].path).toBe('friction.thread.source.reference');
  const q = await t.call('GET', '/api/v1/reviews/queue?product=%00');
  expect(q.status).toBe(422);
  expect(q.body.errors[0].path).toBe('query.product');
});

it('still accepts well-formed text with astral characters and other control-free Unicode', async () => {
  const res = await t.call('POST', `/api/v1/revisions/${ids.revision}/comments`, { text: 'checked 🔩 — Ø 40 mm, μ = 0.1' }, { as: 'reviewer' });
  expect(res.status).toBe(201);
});

it('answers 401 before looking at the body when the token is missing', async () => {
  const res = await t.call('POST', '/api/v1/products', { code: 'TX-4', name: NUL }, { as: 'anonymous', ip: '198.51.100.77' });
  expect(res.status).toBe(401);
});

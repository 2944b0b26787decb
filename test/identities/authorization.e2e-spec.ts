/**
 * Identities through HTTP on real PostgreSQL: every role/endpoint pair, token revocation, the failed-auth
 * limit, the bootstrap admin, and that no token ever reaches the logs (log output captured).
 */
import { Writable } from 'node:stream';
import { clearDesign, warningDesign } from '../support/designs';
import { startTestApp, type TestApp, type Who } from '../support/harness';

const logLines: string[] = [];
const capture = new Writable({
  write(chunk, _enc, done) {
    logLines.push(String(chunk));
    done();
  },
});

let t: TestApp;
const ids: Record<string, string> = {};

beforeAll(async () => {
  t = await startTestApp('postgres', { LOG_LEVEL: 'info' }, capture);
  ids.product = (await t.call('POST', '/api/v1/products', { code: 'AZ-1', name: 'Ashdown AZ-1 (test product)' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${ids.product}/calculations`, { title: 'authz', design: warningDesign });
  ids.calculation = opened.body.calculationId;
  ids.revision = opened.body.revisionId;
});
afterAll(() => t?.close());

type Row = { method: string; url: () => string; body?: () => unknown; allowed: Who[]; route?: string };
const ALL: Who[] = ['author', 'reviewer', 'admin'];
// Statuses that mean "got past authentication and authorization" (the request itself may still be refused on its merits)
const PASSED = (s: number) => s !== 401 && s !== 403;

const TABLE: Row[] = [
  { method: 'POST', url: () => '/api/v1/evaluations', body: () => clearDesign, allowed: ALL },
  { method: 'GET', url: () => '/api/v1/products', allowed: ALL },
  { method: 'POST', url: () => '/api/v1/products', body: () => ({ code: `P-${Math.random().toString(36).slice(2, 8)}`, name: 'x' }), allowed: ['author', 'admin'] },
  { method: 'GET', url: () => `/api/v1/products/${ids.product}`, allowed: ALL },
  { method: 'GET', url: () => `/api/v1/products/${ids.product}/verify`, allowed: ALL },
  { method: 'GET', url: () => `/api/v1/products/${ids.product}/audit`, allowed: ALL },
  { method: 'POST', url: () => `/api/v1/products/${ids.product}/calculations`, body: () => ({ title: 'x', design: clearDesign }), allowed: ['author'] },
  { method: 'GET', url: () => `/api/v1/calculations/${ids.calculation}`, allowed: ALL },
  { method: 'POST', url: () => `/api/v1/calculations/${ids.calculation}/revisions`, body: () => ({ design: warningDesign }), allowed: ['author'] },
  { method: 'GET', url: () => `/api/v1/calculations/${ids.calculation}/revisions`, allowed: ALL },
  { method: 'GET', url: () => `/api/v1/revisions/${ids.revision}`, allowed: ALL },
  { method: 'GET', url: () => `/api/v1/revisions/${ids.revision}/diff?against=${ids.revision}`, allowed: ALL },
  { method: 'POST', url: () => `/api/v1/revisions/${ids.revision}/comments`, body: () => ({ text: 'note' }), allowed: ['author', 'reviewer'] },
  { method: 'POST', url: () => `/api/v1/revisions/${ids.revision}/decisions`, body: () => ({ decision: 'reject' }), allowed: ['reviewer'] },
  { method: 'POST', url: () => `/api/v1/revisions/${ids.revision}/withdraw`, body: () => ({}), allowed: ['author'] },
  { method: 'GET', url: () => '/api/v1/reviews/queue', allowed: ALL },
  { method: 'GET', url: () => '/api/v1/rule-sets', allowed: ALL },
  { method: 'POST', url: () => '/api/v1/rule-sets', body: () => ({ version: 'bad' }), allowed: ['admin'] },
  { method: 'POST', url: () => '/api/v1/rule-sets/2026.12-1/impact', body: () => ({}), allowed: ['reviewer', 'admin'] },
  { method: 'POST', url: () => '/api/v1/rule-sets/2099.01-1/adopt', body: () => ({}), allowed: ['admin'] },
  { method: 'GET', url: () => '/api/v1/users', allowed: ['admin'] },
  { method: 'POST', url: () => '/api/v1/users', body: () => ({ name: 'x', roles: ['author'] }), allowed: ['admin'] },
  { method: 'GET', url: () => '/api/v1/thread-sizes', allowed: ALL },
  { method: 'GET', url: () => '/api/v1/friction-sources', allowed: ALL },
  { method: 'GET', url: () => '/api/v1/materials', allowed: ALL },
  { method: 'GET', url: () => `/api/v1/revisions/${ids.revision}/report.html`, allowed: ALL },
  { method: 'GET', url: () => `/api/v1/revisions/${ids.revision}/report.pdf`, allowed: ALL },
  { method: 'GET', url: () => `/api/v1/products/${ids.product}/audit?format=csv`, allowed: ALL },
];

let client = 0;
describe.each(TABLE.map((r) => ({ ...r, route: r.url.toString().match(/'([^']+)'|`([^`]+)`/)?.slice(1).find(Boolean) ?? '' })))('$method $route', (row) => {
  it.each(['anonymous', ...ALL] as Who[])('as %s', async (who) => {
    // each anonymous call from its own address, so the failed-auth limit does not mask the 401
    const res = await t.call(row.method, row.url(), row.body?.(), { as: who, ip: `198.51.100.${++client % 250}` });
    if (who === 'anonymous') expect(res.status).toBe(401);
    else if (row.allowed.includes(who)) expect(PASSED(res.status)).toBe(true);
    else expect(res.status).toBe(403);
  });
});

it('serves /health and the OpenAPI pages without a token', async () => {
  expect((await t.call('GET', '/health', undefined, { as: 'anonymous' })).status).toBe(200);
  expect((await t.call('GET', '/api/docs-json', undefined, { as: 'anonymous' })).status).toBe(200);
});

it('shows a new token once, stores only its hash, and honours revocation at once', async () => {
  const user = await t.call('POST', '/api/v1/users', { name: 'Temporary checker (test)', roles: ['reviewer'] }, { as: 'admin' });
  const issued = await t.call('POST', `/api/v1/users/${user.body.id}/tokens`, { label: 'laptop' }, { as: 'admin' });
  const token: string = issued.body.token;
  expect(token).toMatch(/^ll_/);
  const stored = await t.db.query<{ token_hash: string }>(`SELECT token_hash FROM tokens WHERE id = $1`, [issued.body.id]);
  expect(stored[0].token_hash).not.toContain(token);
  const listed = await t.call('GET', `/api/v1/users/${user.body.id}/tokens`, undefined, { as: 'admin' });
  expect(JSON.stringify(listed.body)).not.toContain(token);
  const auth = { authorization: `Bearer ${token}` };
  expect((await t.call('GET', '/api/v1/reviews/queue', undefined, { as: 'anonymous', headers: auth })).status).toBe(200);
  await t.call('POST', `/api/v1/users/${user.body.id}/tokens/${issued.body.id}/revoke`, {}, { as: 'admin' });
  expect((await t.call('GET', '/api/v1/reviews/queue', undefined, { as: 'anonymous', headers: auth })).status).toBe(401);
});

it('rate-limits repeated failed authentication from one address', async () => {
  const headers = { authorization: 'Bearer ll_not-a-real-token' };
  const statuses: number[] = [];
  for (let i = 0; i < 12; i++) statuses.push((await t.call('GET', '/api/v1/products', undefined, { as: 'anonymous', headers, ip: '203.0.113.9' })).status);
  expect(statuses.slice(0, 10)).toEqual(Array(10).fill(401));
  expect(statuses.slice(10)).toEqual([429, 429]);
});

it('bootstrapped an admin from LEADLINE_ADMIN_TOKEN on a fresh database', async () => {
  const users = await t.call('GET', '/api/v1/users', undefined, { as: 'admin' });
  expect(users.body.items[0]).toMatchObject({ name: 'Administrator (bootstrap)', roles: ['admin'] });
});

it('never writes a token or secret into the logs', async () => {
  const text = logLines.join('');
  expect(text.length).toBeGreaterThan(1000); // requests were logged
  for (const [who, token] of Object.entries(t.tokens)) expect({ who, leaked: text.includes(token) }).toEqual({ who, leaked: false });
  expect(text).not.toContain('ll_not-a-real-token');
});

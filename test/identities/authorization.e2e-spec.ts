/**
 * Identities through HTTP on real PostgreSQL: every role/endpoint pair, token revocation, the failed-auth
 * limit, the bootstrap admin, and that no token ever reaches the logs (log output captured).
 * Each allowed pair must answer the success status the OpenAPI document states for its route (ROUTES in
 * infra/openapi.ts), with a request valid on its merits; each refused pair 403, and every anonymous call 401.
 */
import { Writable } from 'node:stream';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { ROUTES } from '../../apps/api/src/infra/openapi';
import { QueueService } from '../../apps/api/src/queue/queue.service';
import { changedDesign, clearDesign, warningDesign } from '../support/designs';
import { TEXTBOOK_JACK as SIZING_REQUIREMENTS } from '../support/sizing';
import { startTestApp, type TestApp, type Who } from '../support/harness';
import { softPasskey } from '../support/soft-passkey';

const logLines: string[] = [];
const capture = new Writable({
  write(chunk, _enc, done) {
    logLines.push(String(chunk));
    done();
  },
});

let t: TestApp;
const ids: Record<string, string> = {};
let checkpoint: unknown;

beforeAll(async () => {
  t = await startTestApp('postgres', { LOG_LEVEL: 'info' }, capture);
  ids.product = (await t.call('POST', '/api/v1/products', { code: 'AZ-1', name: 'Ashdown AZ-1 (test product)' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${ids.product}/calculations`, { title: 'authz', design: warningDesign });
  ids.calculation = opened.body.calculationId;
  ids.revision = opened.body.revisionId;
  // separate records for the calls that change review state, so every allowed call is valid on its merits
  const open = async (title: string) => (await t.call('POST', `/api/v1/products/${ids.product}/calculations`, { title, design: warningDesign })).body;
  ids.reviseCalculation = (await open('authz revise')).calculationId;
  ids.draftCalculation = (await open('authz draft')).calculationId;
  expect((await t.call('PUT', `/api/v1/calculations/${ids.draftCalculation}/draft`, { design: warningDesign })).status).toBe(200);
  ids.decideRevision = (await open('authz decide')).revisionId;
  ids.withdrawRevision = (await open('authz withdraw')).revisionId;
  ids.reassignCalculation = (await open('authz reassign')).calculationId;
  ids.passkeyRevision = (await open('authz passkey')).revisionId;
  // the reviewer's own passkey (a signing challenge is offered to the passkeys of the one asking)
  const session = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
  const options = await t.call('POST', '/api/v1/account/passkeys/options', undefined, { session });
  expect((await t.call('POST', '/api/v1/account/passkeys', { challengeId: options.body.challengeId, response: softPasskey().register(options.body.options, 'http://localhost') }, { session })).status).toBe(201);
  checkpoint = (await t.call('POST', `/api/v1/products/${ids.product}/checkpoints`, {}, { as: 'reviewer' })).body;
  ids.webhook = (await t.call('POST', '/api/v1/webhooks', { url: 'https://93.184.215.14/hooks', events: ['calculation.opened'] }, { as: 'admin' })).body.id;
  // a design file rendered by the queue (drained here: the harness runs no workers)
  ids.designFileJob = (await t.call('POST', `/api/v1/products/${ids.product}/design-files`, {}, { as: 'author' })).body.jobId;
  await t.app.get(QueueService).drain();
  ids.designFileHref = (await t.call('GET', `/api/v1/jobs/${ids.designFileJob}`)).body.result.href;
  ids.subject = (await t.call('POST', '/api/v1/users', { name: 'Administered user (test)', email: 'administered@authz.example.com', roles: ['author'] }, { as: 'admin' })).body.id;
});
afterAll(() => t?.close());

/** path: the route as the OpenAPI document names it; its documented success status is what each allowed role must get. */
/** open: the route needs no token (anonymous gets the documented status too). */
type Row = { method: string; path: string; url: () => string; body?: () => unknown; allowed: Who[]; open?: boolean };
const ALL: Who[] = ['author', 'reviewer', 'admin'];
const unique = () => Math.random().toString(36).slice(2, 8);
let ruleSetSeq = 0;

/** The success status the OpenAPI document states for a route (200 unless it says otherwise). */
function documentedStatus(method: string, path: string): number {
  const route = ROUTES.find((r) => r.method === method.toLowerCase() && r.path === path);
  if (!route) throw new Error(`${method} ${path} is not in the OpenAPI document (infra/openapi.ts ROUTES)`);
  return route.status ?? 200;
}

const TABLE: Row[] = [
  { method: 'POST', path: '/api/v1/evaluations', url: () => '/api/v1/evaluations', body: () => clearDesign, allowed: ALL },
  { method: 'GET', path: '/api/v1/products', url: () => '/api/v1/products', allowed: ALL },
  { method: 'POST', path: '/api/v1/products', url: () => '/api/v1/products', body: () => ({ code: `P-${unique()}`, name: 'x' }), allowed: ['author', 'admin'] },
  { method: 'GET', path: '/api/v1/products/{id}', url: () => `/api/v1/products/${ids.product}`, allowed: ALL },
  { method: 'GET', path: '/api/v1/products/{id}/verify', url: () => `/api/v1/products/${ids.product}/verify`, allowed: ALL },
  { method: 'GET', path: '/api/v1/products/{id}/audit', url: () => `/api/v1/products/${ids.product}/audit`, allowed: ALL },
  { method: 'POST', path: '/api/v1/products/{id}/calculations', url: () => `/api/v1/products/${ids.product}/calculations`, body: () => ({ title: 'x', design: clearDesign }), allowed: ['author'] },
  { method: 'GET', path: '/api/v1/calculations/{id}', url: () => `/api/v1/calculations/${ids.calculation}`, allowed: ALL },
  { method: 'POST', path: '/api/v1/calculations/{id}/revisions', url: () => `/api/v1/calculations/${ids.reviseCalculation}/revisions`, body: () => ({ design: changedDesign(warningDesign, unique()) }), allowed: ['author'] },
  { method: 'PUT', path: '/api/v1/calculations/{id}/draft', url: () => `/api/v1/calculations/${ids.reviseCalculation}/draft`, body: () => ({ design: warningDesign }), allowed: ['author'] },
  { method: 'GET', path: '/api/v1/calculations/{id}/draft', url: () => `/api/v1/calculations/${ids.draftCalculation}/draft`, allowed: ['author'] },
  { method: 'GET', path: '/api/v1/calculations/{id}/revisions', url: () => `/api/v1/calculations/${ids.calculation}/revisions`, allowed: ALL },
  { method: 'GET', path: '/api/v1/revisions/{id}', url: () => `/api/v1/revisions/${ids.revision}`, allowed: ALL },
  { method: 'GET', path: '/api/v1/revisions/{id}/diff', url: () => `/api/v1/revisions/${ids.revision}/diff?against=${ids.revision}`, allowed: ALL },
  { method: 'POST', path: '/api/v1/revisions/{id}/comments', url: () => `/api/v1/revisions/${ids.revision}/comments`, body: () => ({ text: 'note' }), allowed: ['author', 'reviewer'] },
  { method: 'POST', path: '/api/v1/revisions/{id}/decisions', url: () => `/api/v1/revisions/${ids.decideRevision}/decisions`, body: () => ({ decision: 'reject', comment: 'not yet (test)' }), allowed: ['reviewer'] },
  { method: 'POST', path: '/api/v1/revisions/{id}/passkey-challenges', url: () => `/api/v1/revisions/${ids.passkeyRevision}/passkey-challenges`, allowed: ['reviewer'] },
  { method: 'POST', path: '/api/v1/revisions/{id}/withdraw', url: () => `/api/v1/revisions/${ids.withdrawRevision}/withdraw`, body: () => ({}), allowed: ['author'] },
  { method: 'GET', path: '/api/v1/reviews/queue', url: () => '/api/v1/reviews/queue', allowed: ALL },
  { method: 'GET', path: '/api/v1/rule-sets', url: () => '/api/v1/rule-sets', allowed: ALL },
  { method: 'GET', path: '/api/v1/rule-sets/{version}', url: () => '/api/v1/rule-sets/2026.12-1', allowed: ALL },
  {
    method: 'POST', path: '/api/v1/rule-sets', url: () => '/api/v1/rule-sets', allowed: ['admin'],
    body: () => ({ ...DEFAULT_RULE_SET, version: `2099.01-${++ruleSetSeq}`, description: 'authorization table (test)' }),
  },
  { method: 'POST', path: '/api/v1/rule-sets/{version}/impact', url: () => '/api/v1/rule-sets/2026.12-1/impact', body: () => ({}), allowed: ['reviewer', 'admin'] },
  { method: 'POST', path: '/api/v1/rule-sets/recheck', url: () => '/api/v1/rule-sets/recheck', body: () => ({}), allowed: ['reviewer', 'admin'] },
  { method: 'POST', path: '/api/v1/rule-sets/{version}/adopt', url: () => `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}/adopt`, body: () => ({}), allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/users', url: () => '/api/v1/users', allowed: ['admin'] },
  { method: 'POST', path: '/api/v1/users', url: () => '/api/v1/users', body: () => ({ name: 'x', roles: ['author'] }), allowed: ['admin'] },
  // user administration (admin only): a subject with an email, created in beforeAll
  { method: 'POST', path: '/api/v1/users/{id}/roles', url: () => `/api/v1/users/${ids.subject}/roles`, body: () => ({ roles: ['author'] }), allowed: ['admin'] },
  { method: 'POST', path: '/api/v1/users/{id}/deactivate', url: () => `/api/v1/users/${ids.subject}/deactivate`, allowed: ['admin'] },
  { method: 'POST', path: '/api/v1/users/{id}/reactivate', url: () => `/api/v1/users/${ids.subject}/reactivate`, allowed: ['admin'] },
  { method: 'POST', path: '/api/v1/users/{id}/password-reset', url: () => `/api/v1/users/${ids.subject}/password-reset`, allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/thread-sizes', url: () => '/api/v1/thread-sizes', allowed: ALL },
  { method: 'GET', path: '/api/v1/friction-sources', url: () => '/api/v1/friction-sources', allowed: ALL },
  { method: 'GET', path: '/api/v1/materials', url: () => '/api/v1/materials', allowed: ALL },
  { method: 'GET', path: '/api/v1/revisions/{id}/report.html', url: () => `/api/v1/revisions/${ids.revision}/report.html`, allowed: ALL },
  { method: 'GET', path: '/api/v1/revisions/{id}/report.pdf', url: () => `/api/v1/revisions/${ids.revision}/report.pdf`, allowed: ALL },
  { method: 'GET', path: '/api/v1/products/{id}/audit', url: () => `/api/v1/products/${ids.product}/audit?format=csv`, allowed: ALL },
  // the design workbench and screw selection: every signed-in role
  { method: 'POST', path: '/api/v1/evaluations/charts', url: () => '/api/v1/evaluations/charts', body: () => clearDesign, allowed: ALL },
  { method: 'GET', path: '/api/v1/products/{id}/design-file.pdf', url: () => `/api/v1/products/${ids.product}/design-file.pdf`, allowed: ALL },
  { method: 'POST', path: '/api/v1/products/{id}/design-files', url: () => `/api/v1/products/${ids.product}/design-files`, body: () => ({}), allowed: ALL },
  { method: 'GET', path: '/api/v1/jobs/{id}', url: () => `/api/v1/jobs/${ids.designFileJob}`, allowed: ALL },
  { method: 'GET', path: '/api/v1/products/{id}/design-files', url: () => `/api/v1/products/${ids.product}/design-files`, allowed: ALL },
  { method: 'GET', path: '/api/v1/products/{id}/design-files/{fileId}', url: () => ids.designFileHref, allowed: ALL },
  { method: 'GET', path: '/api/v1/me', url: () => '/api/v1/me', allowed: ALL },
  { method: 'GET', path: '/api/v1/me/revisions', url: () => '/api/v1/me/revisions', allowed: ALL },
  {
    method: 'POST', path: '/api/v1/sizing', url: () => '/api/v1/sizing', allowed: ALL,
    body: () => ({ requirements: { ...SIZING_REQUIREMENTS }, search: { forms: ['trapezoidal'], starts: [1], majorDiameter: { min: '36 mm', max: '44 mm' }, limit: 3 } }),
  },
  // admin only (a chained, audited hand-over); the calculation's author is author2 afterwards
  { method: 'POST', path: '/api/v1/calculations/{id}/reassignments', url: () => `/api/v1/calculations/${ids.reassignCalculation}/reassignments`, body: () => ({ userId: t.users.author2, reason: 'authorization table (test)' }), allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/identity-events', url: () => '/api/v1/identity-events', allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/identity-events/verify', url: () => '/api/v1/identity-events/verify', allowed: ['admin'] },
  // checkpoints: signing the head on request and verifying are open to every role; the public key needs no token
  { method: 'POST', path: '/api/v1/products/{id}/checkpoints', url: () => `/api/v1/products/${ids.product}/checkpoints`, body: () => ({}), allowed: ALL },
  { method: 'POST', path: '/api/v1/checkpoints/verify', url: () => '/api/v1/checkpoints/verify', body: () => checkpoint, allowed: ALL },
  // webhook endpoints: admin only; the mail preference: every signed-in user, their own
  { method: 'POST', path: '/api/v1/webhooks', url: () => '/api/v1/webhooks', body: () => ({ url: 'https://93.184.215.14/hooks', events: ['revision.approved'] }), allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/webhooks', url: () => '/api/v1/webhooks', allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/webhooks/{id}', url: () => `/api/v1/webhooks/${ids.webhook}`, allowed: ['admin'] },
  { method: 'POST', path: '/api/v1/webhooks/{id}/disable', url: () => `/api/v1/webhooks/${ids.webhook}/disable`, allowed: ['admin'] },
  { method: 'POST', path: '/api/v1/webhooks/{id}/rotate', url: () => `/api/v1/webhooks/${ids.webhook}/rotate`, allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/webhooks/{id}/attempts', url: () => `/api/v1/webhooks/${ids.webhook}/attempts`, allowed: ['admin'] },
  { method: 'GET', path: '/api/v1/me/notifications', url: () => '/api/v1/me/notifications', allowed: ALL },
  { method: 'PUT', path: '/api/v1/me/notifications', url: () => '/api/v1/me/notifications', body: () => ({ email: 'someone@example.test', enabled: false }), allowed: ALL },
  { method: 'GET', path: '/api/v1/checkpoints/public-key', url: () => '/api/v1/checkpoints/public-key', allowed: ALL, open: true },
];

let client = 0;
describe.each(TABLE)('$method $path', (row) => {
  const documented = documentedStatus(row.method, row.path);
  it.each(['anonymous', ...ALL] as Who[])('as %s', async (who) => {
    // each anonymous call from its own address, so the failed-auth limit does not mask the 401
    const res = await t.call(row.method, row.url(), row.body?.(), { as: who, ip: `198.51.100.${++client % 250}` });
    const expected = who === 'anonymous' ? (row.open ? documented : 401) : row.allowed.includes(who) ? documented : 403;
    expect({ who, status: res.status }).toEqual({ who, status: expected });
  });
});

// sign-in, sign-out, activation and own tokens take a page session or no token at all: test/identities/accounts.e2e-spec.ts
it('the table covers every documented route except identity administration of tokens, page sessions and accounts, and /health', () => {
  const covered = new Set(TABLE.map((r) => `${r.method.toLowerCase()} ${r.path}`));
  const missing = ROUTES.map((r) => `${r.method} ${r.path}`).filter((k) => !covered.has(k) && !/tokens|\/health|\/sessions|\/account\//.test(k));
  expect(missing).toEqual([]);
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

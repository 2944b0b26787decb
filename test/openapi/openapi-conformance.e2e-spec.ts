/**
 * The OpenAPI document says what the API answers: the document served at /api/docs-json passes a standard
 * OpenAPI 3.0 validator (@seriousme/openapi-schema-validator), and every documented operation's real success
 * answer and a real documented 4xx answer are validated with ajv against the document's own schemas.
 *
 * The operations come from the document; CALLS below drives each one. A documented operation without an entry
 * in CALLS fails the test, so a route added to the document must be added here too.
 */
import Ajv, { type ValidateFunction } from 'ajv';
import addFormats from 'ajv-formats';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { changedDesign, clearDesign, warningDesign } from '../support/designs';
import { TEXTBOOK_JACK } from '../support/sizing';
import { startTestApp, type TestApp } from '../support/harness';
import { QueueService } from '../../apps/api/src/queue/queue.service';
import { softPasskey } from '../support/soft-passkey';

type Answer = Awaited<ReturnType<TestApp['call']>>;

/** Ids created once for the calls below. */
interface Ctx {
  t: TestApp;
  productId: string;
  calculationId: string;
  revisionId: string;
  secondRevisionId: string;
  userId: string;
  tokenId: string;
  /** A calculation opened by the author with one revision awaiting review (for one-shot calls: decide, withdraw) */
  freshRevision(design?: unknown): Promise<string>;
  /** A calculation opened by the author (for one-shot calls: reassignment) */
  freshCalculation(): Promise<string>;
  /** The reviewer's software passkey (test/support/soft-passkey.ts) */
  passkey: ReturnType<typeof softPasskey>;
  /** Registers the reviewer's passkey from their own session (once; answers the registration) */
  addPasskey(): Promise<Answer>;
}

interface Calls {
  /** A real call that succeeds */
  ok(c: Ctx): Promise<Answer>;
  /** A real call that the route refuses with a documented 4xx (every operation but those in NO_4XX) */
  bad?(c: Ctx): Promise<Answer>;
}

/** A user for the admin routes to act on (created once). */
let subjectId: string | null = null;
async function subject(c: { t: { call: (...a: any[]) => Promise<{ body: any }> } }): Promise<string> {
  subjectId ??= (await c.t.call('POST', '/api/v1/users', { name: 'Conformance subject (test)', roles: ['author'] }, { as: 'admin' })).body.id as string;
  return subjectId;
}
const MISSING = '00000000-0000-4000-8000-000000000000';
const NEXT_RULE_SET = { ...DEFAULT_RULE_SET, version: '2027.05-1', description: 'conformance test copy of the default rule set' };

/** One entry per documented operation, keyed "METHOD /path/{param}" as in the document. */
const CALLS: Record<string, Calls> = {
  'POST /api/v1/evaluations': {
    ok: (c) => c.t.call('POST', '/api/v1/evaluations', clearDesign),
    bad: (c) => c.t.call('POST', '/api/v1/evaluations', { ...clearDesign, load: { axial: '18 MPa', sense: 'compression' } }),
  },
  'POST /api/v1/products': {
    ok: (c) => c.t.call('POST', '/api/v1/products', { code: 'OA-2', name: 'Openwell OA-2 press (invented)' }),
    bad: (c) => c.t.call('POST', '/api/v1/products', { code: 'bad code!', name: '' }),
  },
  'GET /api/v1/products': {
    ok: (c) => c.t.call('GET', '/api/v1/products?limit=5'),
    bad: (c) => c.t.call('GET', '/api/v1/products?limit=-1'),
  },
  'GET /api/v1/products/{id}': {
    ok: (c) => c.t.call('GET', `/api/v1/products/${c.productId}`),
    bad: (c) => c.t.call('GET', `/api/v1/products/${MISSING}`),
  },
  'GET /api/v1/products/{id}/verify': {
    ok: (c) => c.t.call('GET', `/api/v1/products/${c.productId}/verify`),
    bad: (c) => c.t.call('GET', '/api/v1/products/not-a-uuid/verify'),
  },
  'POST /api/v1/products/{id}/calculations': {
    ok: (c) => c.t.call('POST', `/api/v1/products/${c.productId}/calculations`, { title: 'second screw', design: clearDesign }, { headers: { 'idempotency-key': 'conformance-open-1' } }),
    bad: (c) => c.t.call('POST', `/api/v1/products/${c.productId}/calculations`, { title: 'no design' }),
  },
  'GET /api/v1/calculations/{id}': {
    ok: (c) => c.t.call('GET', `/api/v1/calculations/${c.calculationId}`),
    bad: (c) => c.t.call('GET', `/api/v1/calculations/${MISSING}`),
  },
  'POST /api/v1/calculations/{id}/revisions': {
    ok: (c) => c.t.call('POST', `/api/v1/calculations/${c.calculationId}/revisions`, { design: changedDesign(clearDesign, 'conformance'), note: 'conformance' }),
    bad: (c) => c.t.call('POST', `/api/v1/calculations/${c.calculationId}/revisions`, { design: clearDesign, extra: true }),
  },
  'PUT /api/v1/calculations/{id}/draft': {
    ok: (c) => c.t.call('PUT', `/api/v1/calculations/${c.calculationId}/draft`, { design: clearDesign, note: 'not yet submitted' }),
    bad: (c) => c.t.call('PUT', `/api/v1/calculations/${c.calculationId}/draft`, { design: { ...clearDesign, load: { axial: '18 MPa', sense: 'compression' } } }),
  },
  'GET /api/v1/calculations/{id}/draft': {
    ok: async (c) => {
      await c.t.call('PUT', `/api/v1/calculations/${c.calculationId}/draft`, { design: warningDesign });
      return c.t.call('GET', `/api/v1/calculations/${c.calculationId}/draft`);
    },
    bad: async (c) => c.t.call('GET', `/api/v1/calculations/${await c.freshCalculation()}/draft`),
  },
  'GET /api/v1/calculations/{id}/revisions': {
    ok: (c) => c.t.call('GET', `/api/v1/calculations/${c.calculationId}/revisions`),
    bad: (c) => c.t.call('GET', `/api/v1/calculations/${MISSING}/revisions`),
  },
  'GET /api/v1/revisions/{id}': {
    ok: (c) => c.t.call('GET', `/api/v1/revisions/${c.revisionId}`),
    bad: (c) => c.t.call('GET', `/api/v1/revisions/${MISSING}`),
  },
  'GET /api/v1/thread-sizes': {
    ok: (c) => c.t.call('GET', '/api/v1/thread-sizes?form=trapezoidal'),
    bad: (c) => c.t.call('GET', '/api/v1/thread-sizes', undefined, { as: 'anonymous' }),
  },
  'GET /api/v1/friction-sources': {
    ok: (c) => c.t.call('GET', '/api/v1/friction-sources'),
    bad: (c) => c.t.call('GET', '/api/v1/friction-sources', undefined, { as: 'anonymous' }),
  },
  'GET /api/v1/materials': {
    ok: (c) => c.t.call('GET', '/api/v1/materials'),
    bad: (c) => c.t.call('GET', '/api/v1/materials', undefined, { as: 'anonymous' }),
  },
  'POST /api/v1/users/{id}/roles': {
    ok: async (c) => c.t.call('POST', `/api/v1/users/${await subject(c)}/roles`, { roles: ['author', 'reviewer'] }, { as: 'admin' }),
    bad: async (c) => c.t.call('POST', `/api/v1/users/${await subject(c)}/roles`, { roles: ['owner'] }, { as: 'admin' }),
  },
  'POST /api/v1/users/{id}/deactivate': {
    ok: async (c) => c.t.call('POST', `/api/v1/users/${await subject(c)}/deactivate`, undefined, { as: 'admin' }),
    bad: async (c) => c.t.call('POST', `/api/v1/users/${MISSING}/deactivate`, undefined, { as: 'admin' }),
  },
  'POST /api/v1/users/{id}/reactivate': {
    ok: async (c) => c.t.call('POST', `/api/v1/users/${await subject(c)}/reactivate`, undefined, { as: 'admin' }),
    bad: async (c) => c.t.call('POST', `/api/v1/users/${await subject(c)}/reactivate`, undefined, { as: 'reviewer' }),
  },
  'POST /api/v1/users/{id}/password-reset': {
    ok: async (c) => c.t.call('POST', `/api/v1/users/${c.t.users.author2}/password-reset`, undefined, { as: 'admin' }),
    bad: async (c) => c.t.call('POST', `/api/v1/users/${MISSING}/password-reset`, undefined, { as: 'admin' }),
  },
  'POST /api/v1/sessions': {
    ok: (c) => c.t.call('POST', '/api/v1/sessions', { email: c.t.emails.reviewer, password: c.t.passwords.reviewer }, { as: 'anonymous' }),
    bad: (c) => c.t.call('POST', '/api/v1/sessions', { email: 'not an email', password: 'x' }, { as: 'anonymous' }),
  },
  'DELETE /api/v1/sessions/current': {
    ok: async (c) => c.t.call('DELETE', '/api/v1/sessions/current', undefined, { session: await c.t.signIn(c.t.emails.reviewer, c.t.passwords.reviewer) }),
    bad: async (c) => {
      const s = await c.t.signIn(c.t.emails.reviewer, c.t.passwords.reviewer);
      return c.t.call('DELETE', '/api/v1/sessions/current', undefined, { session: { cookie: s.cookie, csrf: '' } });
    },
  },
  'POST /api/v1/account/activate': {
    ok: async (c) => {
      const created = await c.t.call('POST', '/api/v1/users', { name: 'Conformance user (test)', email: 'conformance@openapi.example.com', roles: ['author'] }, { as: 'admin' });
      return c.t.call('POST', '/api/v1/account/activate', { activationCode: created.body.activationCode, password: 'a password of the conformance user' }, { as: 'anonymous' });
    },
    bad: (c) => c.t.call('POST', '/api/v1/account/activate', { activationCode: 'act_unknown', password: 'short' }, { as: 'anonymous' }),
  },
  'GET /api/v1/account/passkeys': {
    ok: (c) => c.t.call('GET', '/api/v1/account/passkeys', undefined, { as: 'reviewer' }),
    bad: (c) => c.t.call('GET', '/api/v1/account/passkeys', undefined, { as: 'anonymous' }),
  },
  'POST /api/v1/account/passkeys/options': {
    ok: async (c) => c.t.call('POST', '/api/v1/account/passkeys/options', undefined, { session: await c.t.signIn(c.t.emails.author, c.t.passwords.author) }),
    bad: (c) => c.t.call('POST', '/api/v1/account/passkeys/options', undefined, { as: 'author' }),
  },
  'POST /api/v1/account/passkeys': {
    ok: (c) => c.addPasskey(),
    bad: async (c) => c.t.call('POST', '/api/v1/account/passkeys', { challengeId: MISSING, response: {} }, { session: await c.t.signIn(c.t.emails.author, c.t.passwords.author) }),
  },
  'POST /api/v1/sessions/passkey/options': {
    ok: (c) => c.t.call('POST', '/api/v1/sessions/passkey/options', undefined, { as: 'anonymous' }),
    bad: async (c) => {
      // the 31st challenge within a minute from one address
      let res = await c.t.call('POST', '/api/v1/sessions/passkey/options', undefined, { as: 'anonymous', ip: '10.7.0.2' });
      for (let i = 0; i < 30 && res.status === 201; i++) res = await c.t.call('POST', '/api/v1/sessions/passkey/options', undefined, { as: 'anonymous', ip: '10.7.0.2' });
      return res;
    },
  },
  'POST /api/v1/sessions/passkey': {
    ok: async (c) => {
      await c.addPasskey();
      const options = await c.t.call('POST', '/api/v1/sessions/passkey/options', undefined, { as: 'anonymous' });
      return c.t.call('POST', '/api/v1/sessions/passkey', { challengeId: options.body.challengeId, response: c.passkey.assert(options.body.options, 'http://localhost') }, { as: 'anonymous' });
    },
    bad: (c) => c.t.call('POST', '/api/v1/sessions/passkey', { challengeId: MISSING, response: c.passkey.assert({ challenge: 'x', rpId: 'localhost' }, 'http://localhost') }, { as: 'anonymous', ip: '10.7.0.1' }),
  },
  'POST /api/v1/revisions/{id}/passkey-challenges': {
    ok: async (c) => {
      await c.addPasskey();
      return c.t.call('POST', `/api/v1/revisions/${await c.freshRevision()}/passkey-challenges`, undefined, { as: 'reviewer' });
    },
    bad: (c) => c.t.call('POST', `/api/v1/revisions/${MISSING}/passkey-challenges`, undefined, { as: 'reviewer' }),
  },
  'POST /api/v1/account/tokens': {
    ok: async (c) => c.t.call('POST', '/api/v1/account/tokens', { label: 'conformance' }, { session: await c.t.signIn(c.t.emails.author, c.t.passwords.author) }),
    bad: (c) => c.t.call('POST', '/api/v1/account/tokens', { label: 'by token' }, { as: 'author' }),
  },
  'POST /api/v1/revisions/{id}/decisions': {
    ok: async (c) => c.t.call('POST', `/api/v1/revisions/${await c.freshRevision()}/decisions`, { decision: 'approve', comment: 'checked' }, { as: 'reviewer' }),
    bad: async (c) => c.t.call('POST', `/api/v1/revisions/${await c.freshRevision(warningDesign)}/decisions`, { decision: 'approve' }, { as: 'reviewer' }),
  },
  'POST /api/v1/revisions/{id}/comments': {
    ok: (c) => c.t.call('POST', `/api/v1/revisions/${c.revisionId}/comments`, { text: 'why bronze?', target: { field: 'nut.material' } }, { as: 'reviewer' }),
    bad: (c) => c.t.call('POST', `/api/v1/revisions/${c.revisionId}/comments`, { text: ' ' }, { as: 'reviewer' }),
  },
  'POST /api/v1/revisions/{id}/withdraw': {
    ok: async (c) => c.t.call('POST', `/api/v1/revisions/${await c.freshRevision()}/withdraw`, { comment: 'wrong load case' }),
    bad: (c) => c.t.call('POST', `/api/v1/revisions/${c.revisionId}/withdraw`, { comment: 'not mine' }, { as: 'author2' }),
  },
  'GET /api/v1/reviews/queue': {
    ok: (c) => c.t.call('GET', `/api/v1/reviews/queue?productId=${c.productId}`),
    bad: (c) => c.t.call('GET', '/api/v1/reviews/queue?verdict=maybe'),
  },
  'GET /api/v1/products/{id}/audit': {
    ok: (c) => c.t.call('GET', `/api/v1/products/${c.productId}/audit?limit=5`),
    bad: (c) => c.t.call('GET', `/api/v1/products/${c.productId}/audit?limit=0`),
  },
  'GET /api/v1/revisions/{id}/diff': {
    ok: (c) => c.t.call('GET', `/api/v1/revisions/${c.secondRevisionId}/diff?against=${c.revisionId}`),
    bad: (c) => c.t.call('GET', `/api/v1/revisions/${c.secondRevisionId}/diff`),
  },
  'GET /api/v1/revisions/{id}/report.html': {
    ok: (c) => c.t.call('GET', `/api/v1/revisions/${c.revisionId}/report.html`),
    bad: (c) => c.t.call('GET', `/api/v1/revisions/${MISSING}/report.html`),
  },
  'GET /api/v1/revisions/{id}/report.pdf': {
    ok: (c) => c.t.call('GET', `/api/v1/revisions/${c.revisionId}/report.pdf`),
    bad: (c) => c.t.call('GET', `/api/v1/revisions/${c.revisionId}/report.pdf?paper=A0`),
  },
  'GET /api/v1/rule-sets': {
    ok: (c) => c.t.call('GET', '/api/v1/rule-sets'),
    bad: (c) => c.t.call('GET', '/api/v1/rule-sets', undefined, { as: 'anonymous' }),
  },
  'POST /api/v1/rule-sets': {
    ok: (c) => c.t.call('POST', '/api/v1/rule-sets', NEXT_RULE_SET, { as: 'admin' }),
    bad: (c) => c.t.call('POST', '/api/v1/rule-sets', { ...NEXT_RULE_SET, version: 'not a version' }, { as: 'admin' }),
  },
  'GET /api/v1/rule-sets/{version}': {
    ok: (c) => c.t.call('GET', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}`),
    bad: (c) => c.t.call('GET', '/api/v1/rule-sets/2099.01-1'),
  },
  'POST /api/v1/rule-sets/{version}/impact': {
    ok: (c) => c.t.call('POST', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}/impact`, { scope: 'latest', productId: c.productId }, { as: 'reviewer' }),
    bad: (c) => c.t.call('POST', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}/impact`, { scope: 'everything' }, { as: 'reviewer' }),
  },
  'POST /api/v1/rule-sets/{version}/adopt': {
    ok: (c) => c.t.call('POST', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}/adopt`, { note: 'conformance: keep the default' }, { as: 'admin' }),
    bad: (c) => c.t.call('POST', '/api/v1/rule-sets/2099.01-1/adopt', {}, { as: 'admin' }),
  },
  'POST /api/v1/webhooks': {
    ok: (c) => c.t.call('POST', '/api/v1/webhooks', { url: 'https://93.184.215.14/hooks', events: ['revision.approved'] }, { as: 'admin' }),
    bad: (c) => c.t.call('POST', '/api/v1/webhooks', { url: 'http://127.0.0.1/hooks', events: ['revision.approved'] }, { as: 'admin' }),
  },
  'GET /api/v1/webhooks': {
    ok: (c) => c.t.call('GET', '/api/v1/webhooks', undefined, { as: 'admin' }),
    bad: (c) => c.t.call('GET', '/api/v1/webhooks', undefined, { as: 'reviewer' }),
  },
  'GET /api/v1/webhooks/{id}': {
    ok: async (c) => c.t.call('GET', `/api/v1/webhooks/${await endpoint(c)}`, undefined, { as: 'admin' }),
    bad: (c) => c.t.call('GET', `/api/v1/webhooks/${MISSING}`, undefined, { as: 'admin' }),
  },
  'POST /api/v1/webhooks/{id}/disable': {
    ok: async (c) => c.t.call('POST', `/api/v1/webhooks/${await endpoint(c)}/disable`, undefined, { as: 'admin' }),
    bad: (c) => c.t.call('POST', `/api/v1/webhooks/${MISSING}/disable`, undefined, { as: 'admin' }),
  },
  'POST /api/v1/webhooks/{id}/rotate': {
    ok: async (c) => c.t.call('POST', `/api/v1/webhooks/${await endpoint(c)}/rotate`, undefined, { as: 'admin' }),
    bad: (c) => c.t.call('POST', `/api/v1/webhooks/${MISSING}/rotate`, undefined, { as: 'admin' }),
  },
  'GET /api/v1/webhooks/{id}/attempts': {
    ok: async (c) => c.t.call('GET', `/api/v1/webhooks/${await endpoint(c)}/attempts`, undefined, { as: 'admin' }),
    bad: (c) => c.t.call('GET', `/api/v1/webhooks/${MISSING}/attempts`, undefined, { as: 'admin' }),
  },
  'GET /api/v1/me/notifications': {
    ok: (c) => c.t.call('GET', '/api/v1/me/notifications'),
    bad: (c) => c.t.call('GET', '/api/v1/me/notifications', undefined, { as: 'anonymous' }),
  },
  'PUT /api/v1/me/notifications': {
    ok: (c) => c.t.call('PUT', '/api/v1/me/notifications', { email: 'author@example.test', enabled: true }),
    bad: (c) => c.t.call('PUT', '/api/v1/me/notifications', { email: 'nobody', enabled: true }),
  },
  'POST /api/v1/users': {
    ok: (c) => c.t.call('POST', '/api/v1/users', { name: 'Conformance reviewer (test)', roles: ['reviewer'] }, { as: 'admin' }),
    bad: (c) => c.t.call('POST', '/api/v1/users', { name: 'No roles', roles: ['wizard'] }, { as: 'admin' }),
  },
  'GET /api/v1/users': {
    ok: (c) => c.t.call('GET', '/api/v1/users', undefined, { as: 'admin' }),
    bad: (c) => c.t.call('GET', '/api/v1/users', undefined, { as: 'author' }),
  },
  'POST /api/v1/users/{id}/tokens': {
    ok: (c) => c.t.call('POST', `/api/v1/users/${c.userId}/tokens`, { label: 'conformance' }, { as: 'admin' }),
    bad: (c) => c.t.call('POST', `/api/v1/users/${c.userId}/tokens`, { label: 'x'.repeat(500) }, { as: 'admin' }),
  },
  'GET /api/v1/users/{id}/tokens': {
    ok: (c) => c.t.call('GET', `/api/v1/users/${c.userId}/tokens`, undefined, { as: 'admin' }),
    bad: (c) => c.t.call('GET', `/api/v1/users/${MISSING}/tokens`, undefined, { as: 'admin' }),
  },
  'POST /api/v1/users/{id}/tokens/{tokenId}/revoke': {
    ok: (c) => c.t.call('POST', `/api/v1/users/${c.userId}/tokens/${c.tokenId}/revoke`, {}, { as: 'admin' }),
    bad: (c) => c.t.call('POST', `/api/v1/users/${c.userId}/tokens/${MISSING}/revoke`, {}, { as: 'admin' }),
  },
  'GET /health': {
    ok: (c) => c.t.call('GET', '/health', undefined, { as: 'anonymous' }),
  },
  'POST /api/v1/sizing': {
    ok: (c) => c.t.call('POST', '/api/v1/sizing', { requirements: TEXTBOOK_JACK, search: { forms: ['trapezoidal'] } }),
    bad: (c) => c.t.call('POST', '/api/v1/sizing', { requirements: { ...TEXTBOOK_JACK, load: { axial: '80 MPa', sense: 'compression' } } }),
  },
  'POST /api/v1/evaluations/charts': {
    ok: (c) => c.t.call('POST', '/api/v1/evaluations/charts?units=SI', clearDesign),
    bad: (c) => c.t.call('POST', '/api/v1/evaluations/charts', { ...clearDesign, load: { axial: '18 MPa', sense: 'compression' } }),
  },
  'GET /api/v1/products/{id}/design-file.pdf': {
    ok: (c) => c.t.call('GET', `/api/v1/products/${c.productId}/design-file.pdf`, undefined, { as: 'reviewer' }),
    bad: (c) => c.t.call('GET', `/api/v1/products/${c.productId}/design-file.pdf?paper=A0`, undefined, { as: 'reviewer' }),
  },
  'POST /api/v1/products/{id}/design-files': {
    ok: (c) => c.t.call('POST', `/api/v1/products/${c.productId}/design-files`, { paper: 'Letter' }, { as: 'reviewer' }),
    bad: (c) => c.t.call('POST', `/api/v1/products/${c.productId}/design-files`, { paper: 'A0' }, { as: 'reviewer' }),
  },
  'GET /api/v1/products/{id}/design-files': {
    ok: async (c) => {
      await designFileJob(c);
      return c.t.call('GET', `/api/v1/products/${c.productId}/design-files`);
    },
    bad: (c) => c.t.call('GET', `/api/v1/products/${MISSING}/design-files`),
  },
  'GET /api/v1/jobs/{id}': {
    ok: async (c) => c.t.call('GET', `/api/v1/jobs/${(await designFileJob(c)).id}`),
    bad: (c) => c.t.call('GET', `/api/v1/jobs/${MISSING}`),
  },
  'GET /api/v1/products/{id}/design-files/{fileId}': {
    ok: async (c) => c.t.call('GET', (await designFileJob(c)).result.href),
    bad: (c) => c.t.call('GET', `/api/v1/products/${c.productId}/design-files/${MISSING}`),
  },
  'GET /api/v1/me': {
    ok: (c) => c.t.call('GET', '/api/v1/me'),
    bad: (c) => c.t.call('GET', '/api/v1/me', undefined, { as: 'anonymous' }),
  },
  'GET /api/v1/me/revisions': {
    ok: (c) => c.t.call('GET', '/api/v1/me/revisions?limit=5'),
    bad: (c) => c.t.call('GET', '/api/v1/me/revisions?state=maybe'),
  },
  'POST /api/v1/calculations/{id}/reassignments': {
    ok: async (c) => c.t.call('POST', `/api/v1/calculations/${await c.freshCalculation()}/reassignments`, { userId: c.t.users.author2, reason: 'conformance: handed over' }, { as: 'admin' }),
    bad: (c) => c.t.call('POST', `/api/v1/calculations/${c.calculationId}/reassignments`, { userId: 'not-a-uuid' }, { as: 'admin' }),
  },
  'POST /api/v1/rule-sets/recheck': {
    ok: (c) => c.t.call('POST', '/api/v1/rule-sets/recheck', { productId: c.productId }, { as: 'reviewer' }),
    bad: (c) => c.t.call('POST', '/api/v1/rule-sets/recheck', { scope: 'everything' }, { as: 'reviewer' }),
  },
  'GET /api/v1/identity-events': {
    ok: (c) => c.t.call('GET', '/api/v1/identity-events?limit=5', undefined, { as: 'admin' }),
    bad: (c) => c.t.call('GET', '/api/v1/identity-events?limit=0', undefined, { as: 'admin' }),
  },
  'GET /api/v1/identity-events/verify': {
    ok: (c) => c.t.call('GET', '/api/v1/identity-events/verify', undefined, { as: 'admin' }),
    bad: (c) => c.t.call('GET', '/api/v1/identity-events/verify', undefined, { as: 'author' }),
  },
  'POST /api/v1/products/{id}/checkpoints': {
    ok: (c) => c.t.call('POST', `/api/v1/products/${c.productId}/checkpoints`, {}, { as: 'reviewer' }),
    bad: (c) => c.t.call('POST', `/api/v1/products/${MISSING}/checkpoints`, {}, { as: 'reviewer' }),
  },
  'POST /api/v1/checkpoints/verify': {
    ok: async (c) => {
      const signed = await c.t.call('POST', `/api/v1/products/${c.productId}/checkpoints`, {}, { as: 'reviewer' });
      return c.t.call('POST', '/api/v1/checkpoints/verify', signed.body, { as: 'reviewer' });
    },
    bad: (c) => c.t.call('POST', '/api/v1/checkpoints/verify', { productId: c.productId, seq: 0, headHash: 'x', time: '', signature: '' }, { as: 'reviewer' }),
  },
  'GET /api/v1/checkpoints/public-key': {
    ok: (c) => c.t.call('GET', '/api/v1/checkpoints/public-key', undefined, { as: 'anonymous' }),
  },
};

/** Operations without a client error to provoke (public, no input). */
/** A webhook endpoint registered for one call (a public address literal: nothing is delivered in this suite) */
/** A design file rendered by the queue (the harness runs no workers: the queue is drained here). */
let renderedJob: any = null;
async function designFileJob(c: Ctx): Promise<any> {
  if (!renderedJob) {
    const accepted = await c.t.call('POST', `/api/v1/products/${c.productId}/design-files`, {}, { as: 'reviewer' });
    await c.t.app.get(QueueService).drain();
    renderedJob = (await c.t.call('GET', accepted.headers.location as string)).body;
  }
  return renderedJob;
}

async function endpoint(c: Ctx): Promise<string> {
  const res = await c.t.call('POST', '/api/v1/webhooks', { url: 'https://93.184.215.14/hooks', events: ['calculation.opened'] }, { as: 'admin' });
  return res.body.id;
}

const NO_4XX = new Set(['GET /health', 'GET /api/v1/checkpoints/public-key']);

interface Operation {
  key: string;
  responses: Record<string, { content?: Record<string, { schema?: object }> }>;
}

describe('OpenAPI document conformance', () => {
  let t: TestApp;
  let doc: { openapi: string; paths: Record<string, Record<string, Operation['responses'] | { responses: Operation['responses'] }>> };
  let ctx: Ctx;
  const ajv = new Ajv({ strict: false, allErrors: true }); // understands OpenAPI 3.0 `nullable` by default
  addFormats(ajv);
  const compiled = new Map<object, ValidateFunction>();
  const validator = (schema: object) => {
    if (!compiled.has(schema)) compiled.set(schema, ajv.compile(schema));
    return compiled.get(schema)!;
  };
  const operations = (): Operation[] =>
    Object.entries(doc.paths).flatMap(([path, item]) =>
      Object.entries(item).map(([method, op]) => ({ key: `${method.toUpperCase()} ${path}`, responses: (op as { responses: Operation['responses'] }).responses })));

  beforeAll(async () => {
    t = await startTestApp('postgres');
    const res = await t.call('GET', '/api/docs-json', undefined, { as: 'anonymous' });
    expect(res.status).toBe(200);
    doc = res.body;
    const product = await t.call('POST', '/api/v1/products', { code: 'OA-1', name: 'Openwell OA-1 jack (invented)' });
    const opened = await t.call('POST', `/api/v1/products/${product.body.id}/calculations`, { title: 'lift screw', design: clearDesign });
    const second = await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: warningDesign, note: 'assumed friction' });
    const user = await t.call('POST', '/api/v1/users', { name: 'Token holder (test)', roles: ['author'] }, { as: 'admin' });
    const token = await t.call('POST', `/api/v1/users/${user.body.id}/tokens`, {}, { as: 'admin' });
    ctx = {
      t,
      productId: product.body.id,
      calculationId: opened.body.calculationId,
      revisionId: opened.body.revisionId,
      secondRevisionId: second.body.revisionId,
      userId: user.body.id,
      tokenId: token.body.id,
      async freshRevision(design = clearDesign) {
        const r = await t.call('POST', `/api/v1/products/${product.body.id}/calculations`, { title: 'one-shot', design });
        return r.body.revisionId;
      },
      async freshCalculation() {
        const r = await t.call('POST', `/api/v1/products/${product.body.id}/calculations`, { title: 'to hand over', design: clearDesign });
        return r.body.calculationId;
      },
      passkey: softPasskey(),
      addPasskey() {
        registered ??= (async () => {
          const session = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
          const options = await t.call('POST', '/api/v1/account/passkeys/options', undefined, { session });
          return t.call('POST', '/api/v1/account/passkeys', { challengeId: options.body.challengeId, response: ctx.passkey.register(options.body.options, 'http://localhost') }, { session });
        })();
        return registered;
      },
    };
    let registered: Promise<Answer> | null = null;
    expect(Object.values(ctx).every((v) => v !== undefined)).toBe(true);
  });
  afterAll(() => t?.close());

  it('passes a standard OpenAPI 3.0 validator [GET /api/docs-json]', async () => {
    const { Validator } = await import('@seriousme/openapi-schema-validator');
    const result = await new Validator().validate(structuredClone(doc) as never);
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
    expect(doc.openapi).toMatch(/^3\.0\./);
  });

  it('uses `nullable` only beside a `type` (OpenAPI 3.0)', () => {
    const bad: string[] = [];
    const walk = (node: unknown, at: string) => {
      if (node === null || typeof node !== 'object') return;
      const n = node as Record<string, unknown>;
      if (n.nullable === true && n.type === undefined) bad.push(at);
      for (const [k, v] of Object.entries(n)) walk(v, `${at}/${k}`);
    };
    walk(doc, '');
    expect(bad).toEqual([]);
  });

  it('has a real call for every documented operation (add new routes to CALLS)', () => {
    const documented = operations().map((o) => o.key);
    expect(documented.length).toBeGreaterThan(25);
    expect(documented.filter((k) => !CALLS[k])).toEqual([]);
    expect(Object.keys(CALLS).filter((k) => !documented.includes(k))).toEqual([]);
    expect(Object.keys(CALLS).filter((k) => !CALLS[k].bad && !NO_4XX.has(k))).toEqual([]);
  });

  /** Checks one real answer against the document: a documented status, media type and (for JSON) schema. */
  function conforms(op: Operation, res: Answer): string[] {
    const status = String(res.status);
    const documented = op.responses[status] ?? op.responses[`${status[0]}XX`];
    if (!documented) return [`status ${status} is not documented (documented: ${Object.keys(op.responses).join(', ')})`];
    if (status === '204' && !documented.content) return res.text === '' ? [] : ['a 204 answer has a body'];
    const type = String(res.headers['content-type'] ?? '').split(';')[0].trim();
    const media = documented.content?.[type];
    if (!media) return [`media type "${type}" is not documented for ${status} (documented: ${Object.keys(documented.content ?? {}).join(', ')})`];
    if (!/json$/.test(type) || !media.schema) return [];
    const validate = validator(media.schema);
    return validate(res.body) ? [] : (validate.errors ?? []).slice(0, 5).map((e) => `${e.instancePath || '(root)'} ${e.message} ${JSON.stringify(e.params)}`);
  }

  it('answers every documented operation with a documented success status, media type and body schema', async () => {
    const problems: string[] = [];
    for (const op of operations()) {
      const calls = CALLS[op.key];
      if (!calls) continue; // reported by the test above
      const res = await calls.ok(ctx);
      if (res.status < 200 || res.status >= 300) problems.push(`${op.key}: expected a success, got ${res.status} ${res.text.slice(0, 200)}`);
      else problems.push(...conforms(op, res).map((p) => `${op.key} ${res.status}: ${p}`));
    }
    expect(problems).toEqual([]);
  }, 120_000);

  it('answers every documented operation\'s refusal with a documented 4xx problem+json body', async () => {
    const problems: string[] = [];
    for (const op of operations()) {
      const calls = CALLS[op.key];
      if (!calls?.bad) continue; // reported by the test above
      const res = await calls.bad(ctx);
      if (res.status < 400 || res.status >= 500) problems.push(`${op.key}: expected a 4xx, got ${res.status} ${res.text.slice(0, 200)}`);
      else if (!String(res.headers['content-type']).startsWith('application/problem+json')) problems.push(`${op.key}: ${res.status} is not problem+json`);
      else problems.push(...conforms(op, res).map((p) => `${op.key} ${res.status}: ${p}`));
    }
    expect(problems).toEqual([]);
  }, 120_000);
});

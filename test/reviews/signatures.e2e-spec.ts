/**
 * A decision is an electronic signature (21 CFR 11.50, 11.70, 11.100, 11.200; EU GMP Annex 11 §14): the signer's
 * printed name, the meaning, the time with its offset and the method, linked to the revision's record hash, made
 * with something only the signer holds at the moment of signing. Written as the attacks it stops:
 * - an admin issues a token for an existing reviewer and approves as that reviewer;
 * - an admin who is also an author creates a second admin, who issues a token for a reviewer, and that reviewer's
 *   "approval" of the first admin's own work is offered;
 * - a reviewer signs with another person's password.
 */
import { clearDesign } from '../support/designs';
import { countRecords, startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let productId: string;
beforeAll(async () => {
  t = await startTestApp('postgres');
  productId = (await t.call('POST', '/api/v1/products', { code: 'SIG-1', name: 'Signature test lift (test product)' })).body.id;
});
afterAll(() => t?.close());

const bearer = (token: string) => ({ as: 'anonymous' as const, headers: { authorization: `Bearer ${token}` } });
let n = 0;
async function submitted(as: { headers: Record<string, string>; as: 'anonymous' } | { as: 'author' } = { as: 'author' }): Promise<string> {
  const res = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: `Signed screw ${++n}`, design: clearDesign }, as);
  expect(res.status).toBe(201);
  return res.body.revisionId;
}
const decisions = (id: string) => `/api/v1/revisions/${id}/decisions`;
const stateOf = async (id: string) => (await t.call('GET', `/api/v1/revisions/${id}`, undefined, { as: 'reviewer' })).body.review.state;

it('records the signature with the decision: printed name, meaning, time with offset, method, the record it belongs to, a fingerprint of the signed event', async () => {
  const id = await submitted();
  const res = await t.call('POST', decisions(id), { decision: 'approve', comment: 'Checked.', signature: { method: 'password', password: t.passwords.reviewer } }, { as: 'reviewer' });
  expect(res.status).toBe(201);
  const revision = (await t.call('GET', `/api/v1/revisions/${id}`, undefined, { as: 'author' })).body;
  const [event] = await t.db.query<{ hash: string; created: string }>(`SELECT hash, to_char(created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US') AS created FROM events WHERE id = $1`, [res.body.eventId]);
  expect(revision.review.signature).toEqual({
    signerId: t.users.reviewer,
    printedName: 'Checking engineer (test)',
    meaning: 'approved as checking engineer',
    method: 'password',
    revisionHash: revision.hash,
    signedAt: `${event.created}+00:00`,
    fingerprint: event.hash.slice(0, 16),
  });
  expect(res.body.signature).toEqual(revision.review.signature);
  // the signature's fields are in the chained event, so verify covers them
  const [stored] = await t.db.query<{ data: { signature: Record<string, string> } }>(`SELECT data FROM events WHERE id = $1`, [res.body.eventId]);
  expect(stored.data.signature).toEqual({ signerId: t.users.reviewer, printedName: 'Checking engineer (test)', meaning: 'approved as checking engineer', method: 'password', revisionHash: revision.hash });
  expect(JSON.stringify(stored.data)).not.toContain(t.passwords.reviewer);
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`, undefined, { as: 'reviewer' })).body.valid).toBe(true);
});

it('signs a rejection with its own meaning, from a page session with its CSRF token', async () => {
  const id = await submitted();
  const session = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
  const res = await t.call('POST', decisions(id), { decision: 'reject', comment: 'Measure the friction.', signature: { method: 'password', password: t.passwords.reviewer } }, { session });
  expect(res.status).toBe(201);
  expect(res.body.signature).toMatchObject({ meaning: 'rejected as checking engineer', printedName: 'Checking engineer (test)' });
});

it('refuses a decision without a signature, or with another person\'s password (403 naming signature; nothing stored)', async () => {
  const id = await submitted();
  const before = await countRecords(t.db);
  const unsigned = await t.call('POST', decisions(id), { decision: 'approve' }, { as: 'reviewer', sign: false });
  expect(unsigned.status).toBe(403);
  expect(unsigned.body.errors[0].path).toBe('signature');
  // the second checker's password is a real password, but not the deciding reviewer's
  const borrowed = await t.call('POST', decisions(id), { decision: 'approve', signature: { method: 'password', password: t.passwords.reviewer2 } }, { as: 'reviewer' });
  expect(borrowed.status).toBe(403);
  expect(borrowed.body.errors[0].path).toBe('signature.password');
  expect(await countRecords(t.db)).toEqual(before);
  expect(await stateOf(id)).toBe('submitted');
});

it('refuses the admin who issues a token for an existing reviewer and approves as that reviewer', async () => {
  const id = await submitted();
  const before = await countRecords(t.db);
  const minted = await t.call('POST', `/api/v1/users/${t.users.reviewer}/tokens`, { label: 'for the reviewer' }, { as: 'admin' });
  expect(minted.status).toBe(201);
  // the token reads as the reviewer, but it was issued by another person: it never decides, signed or not
  for (const signature of [undefined, { method: 'password', password: 'the admin guesses a password' }, { method: 'password', password: t.passwords.reviewer }]) {
    const res = await t.call('POST', decisions(id), { decision: 'approve', ...(signature ? { signature } : {}) }, { ...bearer(minted.body.token), sign: false });
    expect(res.status).toBe(403);
    expect(res.body.errors[0].path).toBe('signature');
    expect(res.body.detail).toMatch(/issued by another person/);
  }
  expect(await countRecords(t.db)).toEqual(before);
  expect(await stateOf(id)).toBe('submitted');
});

it('refuses the chain admin-author -> second admin -> token for a reviewer -> "approval" of the first admin\'s own work', async () => {
  // an admin who is also an author, with their own account and session
  const boss = (await t.call('POST', '/api/v1/users', { name: 'Author with admin rights (test)', email: 'boss@signatures.example.com', roles: ['author', 'admin'] }, { as: 'admin' })).body;
  await t.call('POST', '/api/v1/account/activate', { activationCode: boss.activationCode, password: 'the boss has a long password' }, { as: 'anonymous' });
  const bossSession = await t.signIn('boss@signatures.example.com', 'the boss has a long password');
  const bossToken = (await t.call('POST', '/api/v1/account/tokens', {}, { session: bossSession })).body.token;
  const id = await submitted(bearer(bossToken));
  // the boss creates a second admin and gives them a token; the second admin issues a token for the reviewer
  const second = (await t.call('POST', '/api/v1/users', { name: 'Second admin (test)', roles: ['admin'] }, bearer(bossToken))).body;
  const secondToken = (await t.call('POST', `/api/v1/users/${second.id}/tokens`, {}, bearer(bossToken))).body.token;
  const forReviewer = await t.call('POST', `/api/v1/users/${t.users.reviewer}/tokens`, {}, bearer(secondToken));
  expect(forReviewer.status).toBe(201);
  const before = await countRecords(t.db);
  const res = await t.call('POST', decisions(id), { decision: 'approve', signature: { method: 'password', password: 'the boss has a long password' } }, { ...bearer(forReviewer.body.token), sign: false });
  expect(res.status).toBe(403);
  expect(res.body.errors[0].path).toBe('signature');
  // and the second admin cannot set the reviewer's password: the only way to one is the user's own activation,
  // and a password reset gives a code, not a password, while the reviewer's own password keeps working
  const reset = await t.call('POST', `/api/v1/users/${t.users.reviewer}/password-reset`, undefined, bearer(secondToken));
  expect(Object.keys(reset.body).sort()).toEqual(['activationCode', 'activationExpiresAt']);
  expect(await countRecords(t.db)).toEqual(before);
  expect(await stateOf(id)).toBe('submitted');
  // the reviewer, with their own token and password, can still decide it
  const own = await t.call('POST', decisions(id), { decision: 'approve' }, { as: 'reviewer' });
  expect(own.status).toBe(201);
  // the identity audit shows the chain of issuers
  const events = (await t.call('GET', `/api/v1/identity-events?user=${t.users.reviewer}`, undefined, { as: 'admin' })).body.items;
  expect(events.some((e: { type: string; actorId: string; data: { forAnotherUser?: boolean } }) => e.type === 'token-issued' && e.actorId === second.id && e.data.forAnotherUser)).toBe(true);
});

it('refuses a signature method the site does not accept (LEADLINE_SIGNATURE_METHODS)', async () => {
  const only = await startTestApp('pglite', { LEADLINE_SIGNATURE_METHODS: 'oidc' });
  try {
    const p = (await only.call('POST', '/api/v1/products', { code: 'SIG-2', name: 'Method test (test product)' })).body.id;
    const id = (await only.call('POST', `/api/v1/products/${p}/calculations`, { title: 'm', design: clearDesign })).body.revisionId;
    const res = await only.call('POST', decisions(id), { decision: 'approve' }, { as: 'reviewer' });
    expect(res.status).toBe(403);
    expect(res.body.errors[0].path).toBe('signature.method');
  } finally {
    await only.close();
  }
});

it('reads roles as the identity events say: a reviewer role granted after creation decides and verifies; a calculation is handed only to a current, active author', async () => {
  // an author who is later also made a checking engineer (role-granted after user-created)
  const late = (await t.call('POST', '/api/v1/users', { name: 'Late checker (test)', email: 'late@signatures.example.com', roles: ['author'] }, { as: 'admin' })).body;
  await t.call('POST', '/api/v1/account/activate', { activationCode: late.activationCode, password: 'the late checker has a long one' }, { as: 'anonymous' });
  expect((await t.call('POST', `/api/v1/users/${late.id}/roles`, { roles: ['author', 'reviewer'] }, { as: 'admin' })).status).toBeLessThan(300);
  const session = await t.signIn('late@signatures.example.com', 'the late checker has a long one');
  const id = await submitted();
  const decided = await t.call('POST', decisions(id), { decision: 'approve', signature: { method: 'password', password: 'the late checker has a long one' } }, { session });
  expect(decided.status).toBe(201);
  // verify judges the decision by the roles the signer held at the decision (not by the roles given at creation)
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`, undefined, { as: 'reviewer' })).body).toMatchObject({ valid: true });
  // and a later revocation does not turn the past decision into a break
  expect((await t.call('POST', `/api/v1/users/${late.id}/roles`, { roles: ['author'] }, { as: 'admin' })).status).toBeLessThan(300);
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`, undefined, { as: 'reviewer' })).body).toMatchObject({ valid: true });

  // reassignment: to the user who holds the author role now, yes; to one whose author role was revoked, or who is
  // deactivated, no (the service and leadline_append_event read the same current roles)
  const calculation = (await t.call('GET', `/api/v1/revisions/${id}`, undefined, { as: 'author' })).body.calculationId;
  const reassign = (userId: string) => t.call('POST', `/api/v1/calculations/${calculation}/reassignments`, { userId, reason: 'roles test' }, { as: 'admin' });
  expect((await reassign(late.id)).status).toBe(201);
  const former = (await t.call('POST', '/api/v1/users', { name: 'Former author (test)', roles: ['author'] }, { as: 'admin' })).body;
  expect((await t.call('POST', `/api/v1/users/${former.id}/roles`, { roles: ['reviewer'] }, { as: 'admin' })).status).toBeLessThan(300);
  const refused = await reassign(former.id);
  expect(refused.status).toBe(422);
  expect(refused.body.errors[0].path).toBe('userId');
  const gone = (await t.call('POST', '/api/v1/users', { name: 'Departed author (test)', roles: ['author'] }, { as: 'admin' })).body;
  expect((await t.call('POST', `/api/v1/users/${gone.id}/deactivate`, undefined, { as: 'admin' })).status).toBeLessThan(300);
  expect((await reassign(gone.id)).status).toBe(422);
});

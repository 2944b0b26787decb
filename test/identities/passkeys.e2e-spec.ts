/**
 * Passkeys in real Chromium with the DevTools virtual authenticator (a platform authenticator with user
 * verification), against the real service on real PostgreSQL: a reviewer adds a passkey on their account page, signs
 * in with it and signs a decision with it, by keyboard only (axe-core on each page); over HTTP a forged assertion
 * (one bit of the signature flipped) and a replayed one (the same challenge twice) are refused; and verify names a
 * passkey decision whose signature does not match the key stored for it (the key swapped by the database owner).
 * WebAuthn needs a secure context: the pages are opened at http://localhost:<port> (the service listens on
 * 127.0.0.1), whose host is the relying party's id.
 */
import type { CDPSession, Page } from 'puppeteer-core';
import { clearDesign } from '../support/designs';
import { testBrowser, type TestBrowser } from '../support/browser';
import { startTestApp, type TestApp } from '../support/harness';
import { signInByKeyboard, tabTo, typeInto } from '../support/keyboard';
import { checkPage } from '../support/page-checks';
import { softPasskey } from '../support/soft-passkey';

let t: TestApp;
let browser: TestBrowser;
let origin: string;
let productId: string;
const consoleProblems: string[] = [];

beforeAll(async () => {
  t = await startTestApp('postgres', {}, undefined, { listen: true });
  origin = t.baseUrl!.replace('127.0.0.1', 'localhost');
  productId = (await t.call('POST', '/api/v1/products', { code: 'PK-1', name: 'Passkey test lift (test product)' })).body.id;
  browser = await testBrowser();
});

afterAll(async () => {
  await browser?.close();
  await t?.close();
});

let n = 0;
async function submitted(product = productId): Promise<string> {
  const res = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: `Passkey screw ${++n}`, design: clearDesign });
  expect(res.status).toBe(201);
  return res.body.revisionId;
}

/** A tab with a virtual platform authenticator of its own (resident keys, user verification that succeeds). */
async function tabWithAuthenticator(): Promise<{ page: Page; cdp: CDPSession; authenticatorId: string }> {
  const page = await browser.newPage();
  page.on('console', (m) => {
    if (m.type() === 'error' || /Content Security Policy/i.test(m.text())) consoleProblems.push(m.text());
  });
  page.on('pageerror', (e) => consoleProblems.push(String(e)));
  const cdp = await page.createCDPSession();
  await cdp.send('WebAuthn.enable');
  const { authenticatorId } = await cdp.send('WebAuthn.addVirtualAuthenticator', {
    options: { protocol: 'ctap2', transport: 'internal', hasResidentKey: true, hasUserVerification: true, isUserVerified: true },
  });
  return { page, cdp, authenticatorId };
}

const text = (page: Page, selector: string) => page.$eval(selector, (e) => (e as HTMLElement).innerText);

/** Adds a passkey on the account page, signed in by keyboard with the user's password. */
async function addPasskey(page: Page, email: string, password: string, label: string): Promise<void> {
  await page.goto(`${origin}/account`);
  await signInByKeyboard(page, email, password);
  expect(new URL(page.url()).pathname).toBe('/account');
  await page.waitForSelector('#passkeys-none:not([hidden])');
  await typeInto(page, '#passkey-label', label);
  await tabTo(page, '#passkey-add');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#passkey-list li, #passkey-problem .problem');
  expect(await text(page, '#passkey-problem')).toBe('');
  expect(await text(page, '#passkey-done')).toContain(`Passkey "${label}" added`);
}

/** The page's passkey signs the options (the page's own lib-passkey.js module); answers the assertion JSON. */
function assertionFor(page: Page, options: unknown): Promise<{ id: string; response: { signature: string; clientDataJSON: string; authenticatorData: string } }> {
  return page.evaluate(async (o) => {
    const lib = await import('/review/assets/lib-passkey.js' as string);
    return lib.usePasskey(o);
  }, options as never);
}

/** The same signature with one bit flipped (base64url in, base64url out). */
function flipped(signature: string): string {
  const bytes = Buffer.from(signature, 'base64url');
  bytes[bytes.length - 5] ^= 0x01;
  return bytes.toString('base64url');
}

let reviewerTab: { page: Page; cdp: CDPSession; authenticatorId: string };

it('adds a passkey from the reviewer\'s own session, signs in with it and signs a decision with it, by keyboard only', async () => {
  reviewerTab = await tabWithAuthenticator();
  const { page } = reviewerTab;
  await addPasskey(page, t.emails.reviewer, t.passwords.reviewer, 'Test laptop');
  await checkPage(page, 'passkeys/account');
  expect(await page.$$eval('#passkey-list li', (items) => items.map((i) => (i as HTMLElement).innerText))).toEqual([expect.stringMatching(/^Test laptop, added .* UTC for localhost$/)]);
  // registration is a chained identity event of the user, made by the user
  const events = (await t.call('GET', `/api/v1/identity-events?user=${t.users.reviewer}`, undefined, { as: 'admin' })).body.items;
  expect(events.filter((e: { type: string }) => e.type === 'passkey-registered')).toEqual([
    expect.objectContaining({ actorId: t.users.reviewer, subjectUserId: t.users.reviewer, data: expect.objectContaining({ label: 'Test laptop', rpId: 'localhost' }) }),
  ]);
  const { credentials } = await reviewerTab.cdp.send('WebAuthn.getCredentials', { authenticatorId: reviewerTab.authenticatorId });
  expect(credentials).toHaveLength(1);

  // sign out, then sign in with the passkey: no email, no password
  await tabTo(page, '#sign-out');
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  expect(new URL(page.url()).pathname).toBe('/sign-in');
  await page.waitForSelector('#passkey-sign-in:not([disabled])');
  await checkPage(page, 'passkeys/sign-in');
  await tabTo(page, '#passkey-sign-in');
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  expect(new URL(page.url()).pathname).toBe('/design');
  const me = await page.evaluate(async () => (await fetch('/api/v1/me', { credentials: 'same-origin' })).json());
  expect({ id: me.id, authMethod: me.authMethod }).toEqual({ id: t.users.reviewer, authMethod: 'passkey' });

  // sign a decision with the passkey: the signature block shows the method, and the event holds the assertion
  const id = await submitted();
  await page.goto(`${origin}/review/revisions/${id}`);
  await page.waitForSelector('#signature-passkey-field:not([hidden])');
  expect(await page.$eval('#signature-passkey', (c) => (c as HTMLInputElement).checked)).toBe(true);
  expect(await page.$eval('#signature-password-field', (f) => (f as HTMLElement).hidden)).toBe(true);
  await checkPage(page, 'passkeys/revision');
  await tabTo(page, 'input[name="decision"][value="approve"]'); // no decision is preset: chosen by keyboard
  await page.keyboard.press('Space');
  await typeInto(page, '#decision-comment', 'Checked; signed with my passkey.');
  await tabTo(page, '#decision-submit');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#decision-done:not([hidden]), #decision-problem .problem');
  expect(await text(page, '#decision-problem')).toBe('');
  expect(await text(page, '#decision-done')).toContain('signed by Checking engineer (test) (approved as checking engineer; signature ');
  const revision = (await t.call('GET', `/api/v1/revisions/${id}`, undefined, { as: 'reviewer' })).body;
  expect(revision.review.signature).toMatchObject({ signerId: t.users.reviewer, method: 'passkey', revisionHash: revision.hash });
  expect(revision.review.signature.passkey).toEqual({
    credentialId: credentials[0].credentialId.replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, ''),
    nonce: expect.stringMatching(/^[A-Za-z0-9_-]{43}$/),
    authenticatorData: expect.any(String),
    clientDataJSON: expect.any(String),
    signature: expect.any(String),
  });
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`, undefined, { as: 'reviewer' })).body.valid).toBe(true);
  expect(consoleProblems.filter((m) => !/status of 40[13]/.test(m))).toEqual([]);
});

it('refuses a forged passkey signature (one bit flipped) and a replayed one (the same challenge twice) [POST /api/v1/revisions/:id/decisions]', async () => {
  const { page } = reviewerTab;
  const id = await submitted();
  const challenge = await t.call('POST', `/api/v1/revisions/${id}/passkey-challenges`, undefined, { as: 'reviewer' });
  expect(challenge.status).toBe(201);
  const genuine = await assertionFor(page, challenge.body.options);
  const body = (response: unknown) => ({ decision: 'approve', signature: { method: 'passkey', challengeId: challenge.body.challengeId, response } });

  const forged = await t.call('POST', `/api/v1/revisions/${id}/decisions`, body({ ...genuine, response: { ...genuine.response, signature: flipped(genuine.response.signature) } }), { as: 'reviewer' });
  expect(forged.status).toBe(403);
  expect(forged.body.errors[0].path).toBe('signature.response');
  expect((await t.call('GET', `/api/v1/revisions/${id}`, undefined, { as: 'reviewer' })).body.review.state).toBe('submitted');

  // the genuine assertion on the same challenge signs once ...
  const signed = await t.call('POST', `/api/v1/revisions/${id}/decisions`, body(genuine), { as: 'reviewer' });
  expect(signed.status).toBe(201);
  expect(signed.body.signature.method).toBe('passkey');
  // ... and never again: not on this revision, not on another one
  const replayed = await t.call('POST', `/api/v1/revisions/${id}/decisions`, body(genuine), { as: 'reviewer' });
  expect(replayed.status).toBe(403);
  expect(replayed.body.errors[0].path).toMatch(/^signature/);
  const other = await submitted();
  const elsewhere = await t.call('POST', `/api/v1/revisions/${other}/decisions`, body(genuine), { as: 'reviewer' });
  expect(elsewhere.status).toBe(403);
  expect(elsewhere.body.errors[0].path).toBe('signature.challengeId');
  // another reviewer cannot use the reviewer's passkey signature as theirs
  const fresh = await t.call('POST', `/api/v1/revisions/${other}/passkey-challenges`, undefined, { as: 'reviewer' });
  const theirs = await assertionFor(page, fresh.body.options);
  const borrowed = await t.call('POST', `/api/v1/revisions/${other}/decisions`, { decision: 'approve', signature: { method: 'passkey', challengeId: fresh.body.challengeId, response: theirs } }, { as: 'reviewer2' });
  expect(borrowed.status).toBe(403);
  expect(borrowed.body.errors[0].path).toMatch(/^signature/);
  expect((await t.call('GET', `/api/v1/revisions/${other}`, undefined, { as: 'reviewer' })).body.review.state).toBe('submitted');
});

it('refuses a replayed or forged passkey sign-in [POST /api/v1/sessions/passkey]', async () => {
  const { page } = reviewerTab;
  const options = await t.call('POST', '/api/v1/sessions/passkey/options', undefined, { as: 'anonymous' });
  expect(options.status).toBe(201);
  const assertion = await assertionFor(page, options.body.options);
  const forged = await t.call('POST', '/api/v1/sessions/passkey', { challengeId: options.body.challengeId, response: { ...assertion, response: { ...assertion.response, signature: flipped(assertion.response.signature) } } }, { as: 'anonymous', ip: '10.9.0.1' });
  expect(forged.status).toBe(401);
  expect(forged.headers['set-cookie']).toBeUndefined();
  const first = await t.call('POST', '/api/v1/sessions/passkey', { challengeId: options.body.challengeId, response: assertion }, { as: 'anonymous', ip: '10.9.0.1' });
  expect(first.status).toBe(201);
  expect(first.body.user.id).toBe(t.users.reviewer);
  expect(String(first.headers['set-cookie'])).toMatch(/^leadline_session=.*HttpOnly; SameSite=Strict/);
  const again = await t.call('POST', '/api/v1/sessions/passkey', { challengeId: options.body.challengeId, response: assertion }, { as: 'anonymous', ip: '10.9.0.1' });
  expect(again.status).toBe(401);
  expect(again.headers['set-cookie']).toBeUndefined();
});

it('registers a passkey only from the user\'s own session: never with a token, not even an admin\'s', async () => {
  for (const as of ['reviewer', 'admin'] as const) {
    const res = await t.call('POST', '/api/v1/account/passkeys/options', undefined, { as });
    expect(res.status).toBe(403);
  }
});

it('verify names a passkey decision whose signature does not match the key stored for its signer', async () => {
  // a second user's passkey, in a tab with an authenticator of its own
  const second = await tabWithAuthenticator();
  await addPasskey(second.page, t.emails.reviewer2, t.passwords.reviewer2, 'Second checker key');
  // a product of its own, so that its first passkey decision is this one
  const product = (await t.call('POST', '/api/v1/products', { code: 'PK-2', name: 'Passkey verify lift (test product)' })).body.id;
  const id = await submitted(product);
  const challenge = await t.call('POST', `/api/v1/revisions/${id}/passkey-challenges`, undefined, { as: 'reviewer' });
  const signed = await t.call('POST', `/api/v1/revisions/${id}/decisions`, {
    decision: 'approve', signature: { method: 'passkey', challengeId: challenge.body.challengeId, response: await assertionFor(reviewerTab.page, challenge.body.options) },
  }, { as: 'reviewer' });
  expect(signed.status).toBe(201);
  expect((await t.call('GET', `/api/v1/products/${product}/verify`, undefined, { as: 'reviewer' })).body.valid).toBe(true);
  expect((await t.call('GET', '/api/v1/identity-events/verify', undefined, { as: 'admin' })).body).toMatchObject({ valid: true });
  // the database owner swaps the reviewer's stored public key for the second user's (around the immutability trigger)
  const credentialId = signed.body.signature.passkey.credentialId;
  await t.db.transaction(async (q) => {
    await q.query(`SET LOCAL session_replication_role = replica`);
    await q.query(
      `UPDATE passkey_credentials SET public_key = (SELECT public_key FROM passkey_credentials WHERE user_id = $2) WHERE credential_id = $1`,
      [credentialId, t.users.reviewer2],
    );
  });
  const verify = (await t.call('GET', `/api/v1/products/${product}/verify`, undefined, { as: 'reviewer' })).body;
  expect(verify.valid).toBe(false);
  expect(verify.firstBrokenLink).toMatchObject({ id: signed.body.eventId, reason: expect.stringContaining('does not verify with the signer\'s registered public key') });
  // the identity chain's check names the swapped row too: its passkey-registered event holds the key as registered
  const identities = (await t.call('GET', '/api/v1/identity-events/verify', undefined, { as: 'admin' })).body;
  expect(identities).toMatchObject({ valid: false, firstBrokenLink: { kind: 'passkey', reason: expect.stringContaining('not borne out by a passkey-registered event') } });
});

it('refuses a passkey signature whose counter did not advance (a cloned authenticator), and takes one that did', async () => {
  // a checker of their own with a software passkey (test/support/soft-passkey.ts) registered from their own session
  const user = (await t.call('POST', '/api/v1/users', { name: 'Counter checker (test)', email: 'counter@passkeys.example.com', roles: ['reviewer'] }, { as: 'admin' })).body;
  await t.call('POST', '/api/v1/account/activate', { activationCode: user.activationCode, password: 'the counter checker password' }, { as: 'anonymous' });
  const session = await t.signIn('counter@passkeys.example.com', 'the counter checker password');
  const key = softPasskey();
  key.counter = 7;
  const options = await t.call('POST', '/api/v1/account/passkeys/options', undefined, { session });
  expect(options.status).toBe(201);
  const registered = await t.call('POST', '/api/v1/account/passkeys', { challengeId: options.body.challengeId, response: key.register(options.body.options, 'http://localhost'), label: 'Software key' }, { session });
  expect(registered.status).toBe(201);
  // a registration challenge is used once
  const twice = await t.call('POST', '/api/v1/account/passkeys', { challengeId: options.body.challengeId, response: key.register(options.body.options, 'http://localhost') }, { session });
  expect(twice.status).toBe(403);

  const signWith = async (revisionId: string, counter: number) => {
    const challenge = await t.call('POST', `/api/v1/revisions/${revisionId}/passkey-challenges`, undefined, { session });
    expect(challenge.status).toBe(201);
    key.counter = counter;
    return t.call('POST', `/api/v1/revisions/${revisionId}/decisions`, { decision: 'approve', signature: { method: 'passkey', challengeId: challenge.body.challengeId, response: key.assert(challenge.body.options, 'http://localhost') } }, { session });
  };
  const first = await submitted();
  expect((await signWith(first, 7)).status).toBe(403); // not above the counter at registration
  expect((await signWith(first, 8)).status).toBe(201);
  const second = await submitted();
  const stale = await signWith(second, 8);
  expect(stale.status).toBe(403);
  expect(stale.body.errors[0]).toMatchObject({ path: 'signature.response', message: expect.stringMatching(/counter/) });
  expect((await signWith(second, 9)).status).toBe(201);
  // an assertion made on another site is refused
  const third = await submitted();
  const challenge = await t.call('POST', `/api/v1/revisions/${third}/passkey-challenges`, undefined, { session });
  key.counter = 10;
  const phished = await t.call('POST', `/api/v1/revisions/${third}/decisions`, { decision: 'approve', signature: { method: 'passkey', challengeId: challenge.body.challengeId, response: key.assert(challenge.body.options, 'https://localhost.example.net') } }, { session });
  expect(phished.status).toBe(403);
  expect(phished.body.detail).toMatch(/another site/);
});

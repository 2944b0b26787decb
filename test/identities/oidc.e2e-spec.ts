/**
 * OpenID Connect end to end in Chromium against an in-process OpenID provider on loopback (oidc-provider, its
 * development login screens): sign-in with PKCE through the sign-in page, roles from the role claim, sign-out, a
 * fresh login (max_age=0) at the decision, and a decision refused when the provider's auth_time is older than the
 * start of the signing (the service's injected clock runs ahead of the provider's).
 */
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { Page } from 'puppeteer-core';
import { testBrowser, type TestBrowser } from '../support/browser';
import { TestClock } from '../support/clock';
import { clearDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

// oidc-provider is ESM only: an import() that the test transform leaves alone (as apps/api/src/reports/charts.ts does)
const nativeImport = new Function('specifier', `return import(specifier); /* ${Math.random()} */`) as <T>(specifier: string) => Promise<T>;

/** The provider's people: login name -> printed name and the roles its role claim lists. */
const PEOPLE: Record<string, { name: string; roles: string[] }> = {
  checker: { name: 'Checking engineer (provider test)', roles: ['reviewer'] },
  designer: { name: 'Design author (provider test)', roles: ['author', 'not-a-leadline-role'] },
};
const CLIENT = { id: 'leadline-test', secret: 'a client secret for the loopback provider only' };

let t: TestApp;
let browser: TestBrowser;
let server: Server;
let handler: (req: IncomingMessage, res: ServerResponse) => void = (_req, res) => res.end();
const clock = new TestClock();

beforeAll(async () => {
  server = createServer((req, res) => handler(req, res));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const issuer = `http://localhost:${(server.address() as { port: number }).port}`;
  t = await startTestApp('postgres', {
    LEADLINE_OIDC_ISSUER: issuer, LEADLINE_OIDC_CLIENT_ID: CLIENT.id, LEADLINE_OIDC_CLIENT_SECRET: CLIENT.secret, LEADLINE_OIDC_ROLE_CLAIM: 'leadline_roles',
    // long enough that moving the clock an hour ahead (the stale-login test) keeps the session
    LEADLINE_SESSION_IDLE_MINUTES: '600', LEADLINE_SESSION_ABSOLUTE_HOURS: '24',
  }, undefined, { listen: true, clock });
  const { default: Provider } = await nativeImport<{ default: new (issuer: string, config: unknown) => { callback(): typeof handler } }>('oidc-provider');
  const provider = new Provider(issuer, {
    clients: [{ client_id: CLIENT.id, client_secret: CLIENT.secret, redirect_uris: [`${t.baseUrl}/api/v1/auth/oidc/callback`], grant_types: ['authorization_code'], response_types: ['code'] }],
    claims: { openid: ['sub', 'auth_time'], email: ['email', 'email_verified'], profile: ['name', 'leadline_roles'] },
    conformIdTokenClaims: false, // scope claims (email, name, roles) in the ID token itself
    cookies: { keys: ['loopback provider cookie key (test)'] },
    findAccount: async (_ctx: unknown, id: string) => ({
      accountId: id,
      claims: async () => ({ sub: id, email: `${id}@idp.example.com`, email_verified: true, name: PEOPLE[id]?.name ?? id, leadline_roles: PEOPLE[id]?.roles ?? [] }),
    }),
  });
  handler = provider.callback();
  browser = await testBrowser();
});
afterAll(async () => {
  await browser?.close();
  await t?.close();
  await new Promise((resolve) => server?.close(resolve));
});

/** The provider's development login (any password), and its consent screen when it asks. */
async function loginAtProvider(page: Page, login: string): Promise<void> {
  await page.waitForSelector('input[name="login"]');
  await page.type('input[name="login"]', login);
  await page.type('input[name="password"]', 'any password at the loopback provider');
  await Promise.all([page.waitForNavigation(), page.click('button[type="submit"]')]);
  if (new URL(page.url()).host !== new URL(t.baseUrl!).host) {
    await page.waitForSelector('button[type="submit"]');
    await Promise.all([page.waitForNavigation(), page.click('button[type="submit"]')]);
  }
}

async function signInAtProvider(login: string): Promise<Page> {
  const page = await browser.newPage();
  await page.goto(`${t.baseUrl}/review`);
  await page.waitForSelector('#oidc-sign-in');
  await Promise.all([page.waitForNavigation(), page.click('#oidc-sign-in')]);
  expect(new URL(page.url()).host).not.toBe(new URL(t.baseUrl!).host); // at the provider
  await loginAtProvider(page, login);
  await page.waitForSelector('#content:not([hidden])');
  expect(page.url()).toBe(`${t.baseUrl}/review`);
  return page;
}

const me = (page: Page) => page.evaluate(async () => (await fetch('/api/v1/me')).json());

it('signs in at the provider with PKCE, maps the role claim, and signs out', async () => {
  const requests: string[] = [];
  const page = await browser.newPage();
  page.on('request', (r) => requests.push(r.url()));
  await page.goto(`${t.baseUrl}/review`);
  await page.waitForSelector('#oidc-sign-in');
  await Promise.all([page.waitForNavigation(), page.click('#oidc-sign-in')]);
  const authorize = new URL(requests.find((u) => u.includes('/auth?'))!);
  expect(Object.fromEntries(['response_type', 'code_challenge_method', 'scope'].map((k) => [k, authorize.searchParams.get(k)]))).toEqual({
    response_type: 'code', code_challenge_method: 'S256', scope: 'openid email profile',
  });
  expect(authorize.searchParams.get('code_challenge')).toMatch(/^[A-Za-z0-9_-]{43}$/);
  expect(authorize.searchParams.get('max_age')).toBeNull();
  await loginAtProvider(page, 'checker');
  await page.waitForSelector('#content:not([hidden])');
  expect(page.url()).toBe(`${t.baseUrl}/review`);
  expect(await me(page)).toMatchObject({ name: 'Checking engineer (provider test)', roles: ['reviewer'], authMethod: 'oidc' });
  const [user] = await t.db.query<{ id: string; email: string }>(`SELECT id, email FROM users WHERE email = 'checker@idp.example.com'`);
  const events = await t.db.query<{ type: string }>(`SELECT type FROM identity_events WHERE subject_user_id = $1 ORDER BY created_at`, [user.id]);
  expect(events.map((e) => e.type)).toEqual(['user-created', 'role-granted']);
  // no activation code for a provider user: they never get a local password
  expect(await t.db.query(`SELECT 1 FROM activation_codes WHERE user_id = $1`, [user.id])).toEqual([]);
  // an unknown name in the claim is ignored
  const designer = await signInAtProvider('designer');
  expect((await me(designer)).roles).toEqual(['author']);
  // sign-out ends the session
  const cookie = (await page.cookies()).find((c) => c.name === 'leadline_session')!;
  await Promise.all([page.waitForNavigation(), page.click('#sign-out')]);
  expect(new URL(page.url()).pathname).toBe('/sign-in');
  expect((await fetch(`${t.baseUrl}/api/v1/me`, { headers: { cookie: `leadline_session=${cookie.value}` } })).status).toBe(401);
});

async function newRevision(title: string): Promise<string> {
  const product = (await t.call('POST', '/api/v1/products', { code: `OIDC-${title}`, name: `Provider signature lift ${title} (test product)` })).body.id;
  return (await t.call('POST', `/api/v1/products/${product}/calculations`, { title, design: clearDesign })).body.revisionId;
}

it('signs a decision after a fresh login at the provider (max_age=0), once', async () => {
  const revisionId = await newRevision('FRESH');
  const page = await signInAtProvider('checker');
  await page.goto(`${t.baseUrl}/review/revisions/${revisionId}`);
  await page.waitForSelector('#signature-oidc:not([hidden])');
  expect(await page.$eval('#signature-password-field', (e) => (e as HTMLElement).hidden)).toBe(true);
  // recording before the fresh login is refused
  await page.click('input[name="decision"][value="approve"]'); // no decision is preset
  await page.click('#decision-submit');
  await page.waitForSelector('#decision-problem .problem');
  expect(await page.$eval('#decision-problem', (e) => (e as HTMLElement).innerText)).toMatch(/Signature not accepted[\s\S]*no fresh login/);
  const requests: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  await Promise.all([page.waitForNavigation(), page.click('#signature-oidc-start')]);
  const authorize = new URL(requests.find((u) => u.includes('/auth?'))!);
  expect(authorize.searchParams.get('max_age')).toBe('0');
  await loginAtProvider(page, 'checker'); // the provider asks again although its session is live
  await page.waitForSelector('#decision:not([hidden])');
  expect(page.url()).toBe(`${t.baseUrl}/review/revisions/${revisionId}#signed-at-provider`);
  expect(await page.$eval('#signature-oidc-status', (e) => e.textContent)).toContain('Identity confirmed');
  await page.click('input[name="decision"][value="approve"]'); // no decision is preset
  await page.click('#decision-submit');
  await page.waitForSelector('#decision-done:not([hidden])');
  const revision = (await t.call('GET', `/api/v1/revisions/${revisionId}`)).body;
  expect(revision.review.signature).toMatchObject({ printedName: 'Checking engineer (provider test)', meaning: 'approved as checking engineer', method: 'oidc' });
  const [row] = await t.db.query<{ started_at: Date; auth_time: Date }>(`SELECT started_at, auth_time FROM reauthentications WHERE revision_id = $1`, [revisionId]);
  expect(row.auth_time.getTime()).toBeGreaterThanOrEqual(row.started_at.getTime());
  expect(await t.db.query(`SELECT 1 FROM reauthentication_uses u JOIN reauthentications r ON r.id = u.reauthentication_id WHERE r.revision_id = $1`, [revisionId])).toHaveLength(1);
});

it('refuses the signature when the provider\'s auth_time is older than the start of the signing', async () => {
  const revisionId = await newRevision('STALE');
  const page = await signInAtProvider('checker');
  // the service's clock an hour ahead: the signing starts "later" than the provider's fresh login says it happened
  clock.advance(3_600_000);
  await page.goto(`${t.baseUrl}/review/revisions/${revisionId}`);
  await page.waitForSelector('#signature-oidc:not([hidden])');
  await Promise.all([page.waitForNavigation(), page.click('#signature-oidc-start')]);
  await loginAtProvider(page, 'checker');
  await page.waitForSelector('#decision:not([hidden])');
  expect(page.url()).toBe(`${t.baseUrl}/review/revisions/${revisionId}#provider-login-too-old`);
  expect(await t.db.query(`SELECT 1 FROM reauthentications WHERE revision_id = $1`, [revisionId])).toEqual([]);
  await page.click('input[name="decision"][value="approve"]'); // no decision is preset
  await page.click('#decision-submit');
  await page.waitForSelector('#decision-problem .problem');
  expect(await page.$eval('#decision-problem', (e) => (e as HTMLElement).innerText)).toMatch(/Signature not accepted/);
  expect((await t.call('GET', `/api/v1/revisions/${revisionId}`)).body.review.state).toBe('submitted');
});

/**
 * Local accounts and page sessions through HTTP on real PostgreSQL: an admin creates a user and gets a one-time
 * activation code (never a password); the user sets their own password (Argon2id at OWASP's parameters) and signs
 * in; the session cookie's flags; CSRF refusal; idle and absolute time-outs by an injected clock; sign-out;
 * failure limiting per address that never locks an account; deactivation, roles and password reset as identity
 * events.
 */
import { TestClock } from '../support/clock';
import { startTestApp, type TestApp, type TestSession } from '../support/harness';

let t: TestApp;
const clock = new TestClock();
// one trusted proxy hop (loopback): X-Forwarded-Proto https marks a request as HTTPS, as behind a TLS proxy
beforeAll(async () => (t = await startTestApp('postgres', { LEADLINE_TRUST_PROXY: 'loopback', LEADLINE_SESSION_IDLE_MINUTES: '30', LEADLINE_SESSION_ABSOLUTE_HOURS: '8' }, undefined, { clock })));
afterAll(() => t?.close());

const MIN = 60_000;
let n = 0;
/** A fresh address per test, so that the failure limit of one test never touches another. */
const nextIp = () => `198.51.100.${++n}`;
const cookieOf = (res: { headers: Record<string, unknown> }) => String(res.headers['set-cookie']).split(';')[0];

async function newAccount(roles: string[] = ['reviewer'], password = 'a long enough password 1') {
  const email = `user${++n}@accounts.example.com`;
  const created = await t.call('POST', '/api/v1/users', { name: `Account ${n} (test)`, email, roles }, { as: 'admin' });
  expect(created.status).toBe(201);
  const activated = await t.call('POST', '/api/v1/account/activate', { activationCode: created.body.activationCode, password }, { as: 'anonymous', ip: nextIp() });
  expect(activated.status).toBe(200);
  return { id: created.body.id as string, email, password };
}

describe('activation and sign-in [POST /api/v1/users, POST /api/v1/account/activate, POST /api/v1/sessions]', () => {
  it('gives the admin a one-time activation code and never a password; the user sets the password, stored as Argon2id at OWASP parameters', async () => {
    const ip = nextIp();
    const created = await t.call('POST', '/api/v1/users', { name: 'Checking engineer two (test)', email: 'Checker.Two@accounts.example.com', roles: ['reviewer'] }, { as: 'admin' });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ email: 'Checker.Two@accounts.example.com', roles: ['reviewer'], active: true, hasPassword: false });
    expect(created.body.activationCode).toMatch(/^act_/);
    expect(Date.parse(created.body.activationExpiresAt)).toBeGreaterThan(clock.now());
    expect(JSON.stringify(created.body)).not.toMatch(/password"\s*:\s*"/);
    // the same email (in other case) is taken
    const twice = await t.call('POST', '/api/v1/users', { name: 'Impostor (test)', email: 'checker.two@ACCOUNTS.example.com', roles: ['reviewer'] }, { as: 'admin' });
    expect(twice.status).toBe(409);
    expect(twice.body.errors[0].path).toBe('email');
    // too short a password: 422 naming the field, nothing set (NIST SP 800-63B-4 §3.1.1.2: at least 15 characters)
    const short = await t.call('POST', '/api/v1/account/activate', { activationCode: created.body.activationCode, password: 'fourteen chars' }, { as: 'anonymous', ip });
    expect(short.status).toBe(422);
    expect(short.body.errors[0].path).toBe('password');
    const set = await t.call('POST', '/api/v1/account/activate', { activationCode: created.body.activationCode, password: 'fifteen chars!!' }, { as: 'anonymous', ip });
    expect(set.status).toBe(200);
    expect(set.body).toEqual({ userId: created.body.id, email: 'Checker.Two@accounts.example.com', passwordSet: true });
    // OWASP Password Storage Cheat Sheet: Argon2id, m = 19 MiB (19456 KiB), t = 2, p = 1
    const [cred] = await t.db.query<{ hash: string }>(`SELECT hash FROM password_credentials WHERE user_id = $1`, [created.body.id]);
    const [, algorithm, version, params] = cred.hash.split('$');
    expect([algorithm, version, params.split(',').sort().join(',')]).toEqual(['argon2id', 'v=19', 'm=19456,p=1,t=2']);
    // a code works once
    const again = await t.call('POST', '/api/v1/account/activate', { activationCode: created.body.activationCode, password: 'another fifteen chars' }, { as: 'anonymous', ip });
    expect(again.status).toBe(403);
    expect(again.body.errors[0].path).toBe('activationCode');
    // sign in with the email in any case
    const signed = await t.call('POST', '/api/v1/sessions', { email: 'checker.two@accounts.example.com', password: 'fifteen chars!!' }, { as: 'anonymous', ip });
    expect(signed.status).toBe(201);
    expect(signed.body.user).toMatchObject({ id: created.body.id, name: 'Checking engineer two (test)', roles: ['reviewer'] });
    const events = await t.call('GET', `/api/v1/identity-events?user=${created.body.id}`, undefined, { as: 'admin' });
    expect(events.body.items.map((e: { type: string }) => e.type).sort()).toEqual(['activation-issued', 'password-set', 'role-granted', 'user-created']);
    const setEvent = events.body.items.find((e: { type: string }) => e.type === 'password-set');
    expect(setEvent.actorId).toBe(created.body.id); // set by the user themselves
  });

  it('refuses an expired activation code', async () => {
    const created = await t.call('POST', '/api/v1/users', { name: 'Late starter (test)', email: 'late@accounts.example.com', roles: ['author'] }, { as: 'admin' });
    clock.advance(72 * 60 * MIN + 1000); // LEADLINE_ACTIVATION_HOURS default 72
    const late = await t.call('POST', '/api/v1/account/activate', { activationCode: created.body.activationCode, password: 'a long enough password 2' }, { as: 'anonymous', ip: nextIp() });
    expect(late.status).toBe(403);
  });

  it('sets the session cookie HttpOnly, SameSite=Strict, Path=/, Secure only under HTTPS, without Max-Age; no credential in the answer', async () => {
    const a = await newAccount();
    const http = await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous', ip: nextIp() });
    const flags = String(http.headers['set-cookie']).split(';').map((f) => f.trim());
    expect(flags[0]).toMatch(/^leadline_session=[A-Za-z0-9_-]{43}\.\d+\.[A-Za-z0-9_-]{43}$/);
    expect(flags.slice(1).sort()).toEqual(['HttpOnly', 'Path=/', 'SameSite=Strict']);
    expect(http.text).not.toContain(flags[0].split('=')[1]);
    const https = await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous', ip: '127.0.0.1', headers: { 'x-forwarded-proto': 'https' } }); // from the trusted proxy
    expect(String(https.headers['set-cookie']).split(';').map((f) => f.trim())).toContain('Secure');
  });

  it('refuses a wrong password or an unknown email with the same 401', async () => {
    const a = await newAccount();
    const ip = nextIp();
    const wrong = await t.call('POST', '/api/v1/sessions', { email: a.email, password: 'not the password at all' }, { as: 'anonymous', ip });
    const unknown = await t.call('POST', '/api/v1/sessions', { email: 'nobody@accounts.example.com', password: 'not the password at all' }, { as: 'anonymous', ip });
    expect([wrong.status, unknown.status]).toEqual([401, 401]);
    expect(wrong.body.detail).toBe(unknown.body.detail);
    expect(wrong.headers['set-cookie']).toBeUndefined();
  });

  it('limits failures per address and never locks the account: after ten failures the address waits, the valid password signs in from the user\'s own address', async () => {
    const a = await newAccount();
    const attacker = nextIp();
    for (let i = 0; i < 10; i++) {
      expect((await t.call('POST', '/api/v1/sessions', { email: a.email, password: `guess number ${i} of many` }, { as: 'anonymous', ip: attacker })).status).toBe(401);
    }
    const blocked = await t.call('POST', '/api/v1/sessions', { email: a.email, password: 'guess number 11 of many' }, { as: 'anonymous', ip: attacker });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    const owner = await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous', ip: nextIp() });
    expect(owner.status).toBe(201);
    // the window ends: the address may try again (FailureLimiter: 10 per minute)
    clock.advance(MIN);
    expect((await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous', ip: attacker })).status).toBe(201);
  });
});

describe('page sessions', () => {
  it('refuses a state-changing request without the session\'s CSRF token, and takes it with the token from GET /api/v1/me', async () => {
    const s = await t.signIn(t.emails.author, t.passwords.author);
    const body = { code: 'CSRF-1', name: 'Cross-site test product (test)' };
    const none = await t.call('POST', '/api/v1/products', body, { session: { cookie: s.cookie, csrf: '' } });
    expect(none.status).toBe(403);
    expect(none.body.errors[0].path).toBe('(header x-csrf-token)');
    const other = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
    const foreign = await t.call('POST', '/api/v1/products', body, { session: { cookie: s.cookie, csrf: other.csrf } });
    expect(foreign.status).toBe(403);
    expect((await t.db.query(`SELECT 1 FROM products WHERE code = 'CSRF-1'`)).length).toBe(0);
    const ok = await t.call('POST', '/api/v1/products', body, { session: s });
    expect(ok.status).toBe(201);
    // reads need no CSRF token; bearer-token clients need none
    expect((await t.call('GET', '/api/v1/products', undefined, { session: { cookie: s.cookie, csrf: '' } })).status).toBe(200);
    expect((await t.call('POST', '/api/v1/products', { code: 'CSRF-2', name: 'Token client product (test)' })).status).toBe(201);
  });

  it('ends a session after 30 idle minutes (each request moves the idle stamp), and 8 hours after sign-in whatever its activity', async () => {
    let s: TestSession = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
    const me = async () => {
      const res = await t.call('GET', '/api/v1/me', undefined, { session: s });
      if (res.status === 200) s = { ...s, cookie: cookieOf(res) };
      return res;
    };
    // active every 29 minutes: the session lives on (the renewed cookie carries the new stamp)
    for (let i = 0; i < 16; i++) {
      clock.advance(29 * MIN);
      expect((await me()).status).toBe(200);
    }
    // 16 x 29 min = 7 h 44 min; the next step passes 8 h after sign-in
    clock.advance(29 * MIN);
    const late = await me();
    expect(late.status).toBe(401);
    expect(late.body.detail).toMatch(/time limit/);
    // idle: a fresh session, untouched for 30 min + 1 s
    s = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
    clock.advance(30 * MIN - 1000);
    expect((await me()).status).toBe(200);
    const stale = { ...s };
    clock.advance(30 * MIN + 1000);
    const idle = await t.call('GET', '/api/v1/me', undefined, { session: stale });
    expect(idle.status).toBe(401);
    expect(idle.body.detail).toMatch(/without activity/);
  });

  it('refuses a cookie whose idle stamp was changed by the client', async () => {
    const s = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
    const [secret, seen, tag] = s.cookie.split('=')[1].split('.');
    const forged = `leadline_session=${secret}.${Number(seen) + 3_600_000}.${tag}`;
    expect((await t.call('GET', '/api/v1/me', undefined, { session: { cookie: forged, csrf: s.csrf } })).status).toBe(401);
  });

  it('signs out: the session ends (a row appended) and its cookie is refused afterwards [DELETE /api/v1/sessions/current]', async () => {
    const s = await t.signIn(t.emails.author, t.passwords.author);
    const out = await t.call('DELETE', '/api/v1/sessions/current', undefined, { session: s });
    expect(out.status).toBe(204);
    expect(String(out.headers['set-cookie'])).toMatch(/^leadline_session=;.*Max-Age=0/);
    const after = await t.call('GET', '/api/v1/me', undefined, { session: s });
    expect(after.status).toBe(401);
    expect(after.body.detail).toMatch(/signed out/);
  });

  it('issues a token to the signed-in user for their own API client, never to a bearer token [POST /api/v1/account/tokens]', async () => {
    const s = await t.signIn(t.emails.author2, t.passwords.author2);
    const own = await t.call('POST', '/api/v1/account/tokens', { label: 'laptop' }, { session: s });
    expect(own.status).toBe(201);
    const [row] = await t.db.query<{ user_id: string; created_by: string }>(`SELECT user_id, created_by FROM tokens WHERE id = $1`, [own.body.id]);
    expect(row).toEqual({ user_id: t.users.author2, created_by: t.users.author2 });
    const byToken = await t.call('POST', '/api/v1/account/tokens', {}, { as: 'author2' });
    expect(byToken.status).toBe(403);
  });
});

describe('admin changes, each an identity event [POST /api/v1/users/:id/...]', () => {
  it('deactivates a user (tokens and sessions stop at once, the user and their name stay) and reactivates them', async () => {
    const a = await newAccount(['author']);
    const s = await t.signIn(a.email, a.password, { ip: nextIp() });
    const token = (await t.call('POST', '/api/v1/account/tokens', {}, { session: s })).body.token;
    const off = await t.call('POST', `/api/v1/users/${a.id}/deactivate`, undefined, { as: 'admin' });
    expect(off.status).toBe(200);
    expect(off.body).toMatchObject({ id: a.id, active: false, email: a.email });
    expect((await t.call('GET', '/api/v1/me', undefined, { session: s })).status).toBe(401);
    expect((await t.call('GET', '/api/v1/me', undefined, { as: 'anonymous', headers: { authorization: `Bearer ${token}` } })).status).toBe(401);
    expect((await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous', ip: nextIp() })).status).toBe(401);
    const on = await t.call('POST', `/api/v1/users/${a.id}/reactivate`, undefined, { as: 'admin' });
    expect(on.body.active).toBe(true);
    expect((await t.call('GET', '/api/v1/me', undefined, { as: 'anonymous', headers: { authorization: `Bearer ${token}` } })).status).toBe(200);
    const types = (await t.call('GET', `/api/v1/identity-events?user=${a.id}`, undefined, { as: 'admin' })).body.items.map((e: { type: string }) => e.type);
    expect(types.slice(0, 2)).toEqual(['user-reactivated', 'user-deactivated']);
  });

  it('grants and revokes roles as events; the change applies to the next request', async () => {
    const a = await newAccount(['author']);
    const s = await t.signIn(a.email, a.password, { ip: nextIp() });
    const set = await t.call('POST', `/api/v1/users/${a.id}/roles`, { roles: ['reviewer'] }, { as: 'admin' });
    expect(set.status).toBe(200);
    expect(set.body.roles).toEqual(['reviewer']);
    expect((await t.call('GET', '/api/v1/me', undefined, { session: s })).body.roles).toEqual(['reviewer']);
    const types = (await t.call('GET', `/api/v1/identity-events?user=${a.id}`, undefined, { as: 'admin' })).body.items.map((e: { type: string; data: { role?: string } }) => `${e.type}:${e.data.role ?? ''}`);
    expect(types).toEqual(expect.arrayContaining(['role-granted:reviewer', 'role-revoked:author']));
    const bad = await t.call('POST', `/api/v1/users/${a.id}/roles`, { roles: ['superuser'] }, { as: 'admin' });
    expect(bad.status).toBe(422);
    expect(bad.body.errors[0].path).toMatch(/^roles/);
  });

  it('resets a password only through the user: the admin gets a code, the old password works until the user sets a new one', async () => {
    const a = await newAccount(['author']);
    const reset = await t.call('POST', `/api/v1/users/${a.id}/password-reset`, undefined, { as: 'admin' });
    expect(reset.status).toBe(201);
    expect(Object.keys(reset.body).sort()).toEqual(['activationCode', 'activationExpiresAt']);
    const ip = nextIp();
    expect((await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous', ip })).status).toBe(201);
    const fresh = 'a brand new password of mine';
    expect((await t.call('POST', '/api/v1/account/activate', { activationCode: reset.body.activationCode, password: fresh }, { as: 'anonymous', ip })).status).toBe(200);
    expect((await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous', ip })).status).toBe(401);
    expect((await t.call('POST', '/api/v1/sessions', { email: a.email, password: fresh }, { as: 'anonymous', ip })).status).toBe(201);
  });
});

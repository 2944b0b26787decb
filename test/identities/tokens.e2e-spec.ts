/**
 * Attacks on token lifetime and on who may act as whom:
 * - a token kept from long ago still works: every token now expires (401 after its expiry, cache included);
 * - demo tokens (admin included) were minted and printed on every start: now only into an empty database, short-lived,
 *   or with an explicit flag;
 * - an admin minting a token for a reviewer left no trace: issuing tokens and granting roles are audited events
 *   (insert-only, with the acting user and the token they used).
 */
import { randomBytes, randomUUID } from 'node:crypto';
import { legacyTokenHash } from '../../apps/api/src/identities/identities.service';
import { ServiceKeys } from '../../apps/api/src/records/service-keys';
import { seedDemo } from '../../apps/api/src/seed/demo-seed';
import { TestClock } from '../support/clock';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
const clock = new TestClock();
beforeAll(async () => (t = await startTestApp('postgres', { LEADLINE_TOKEN_TTL_DAYS: '90', LEADLINE_DEMO_TOKEN_TTL_HOURS: '12' }, undefined, { clock })));
afterAll(() => t?.close());

const DAY = 86_400_000;
const asToken = (token: string) => ({ as: 'anonymous' as const, headers: { authorization: `Bearer ${token}` } });
let ip = 0;
const get = (token: string) => t.call('GET', '/api/v1/products', undefined, { ...asToken(token), ip: `192.0.2.${++ip}` });

describe('token expiry', () => {
  it('answers 401 once a token has expired, although it answered 200 just before (the cache never outlives the expiry)', async () => {
    const expiresAt = new Date(clock.now() + 60_000).toISOString();
    const issued = await t.call('POST', `/api/v1/users/${t.users.reviewer}/tokens`, { label: 'short', expiresAt }, { as: 'admin' });
    expect(issued.status).toBe(201);
    expect(issued.body.expiresAt).toBe(expiresAt);
    expect((await get(issued.body.token)).status).toBe(200); // cached now
    clock.advance(Date.parse(expiresAt) - clock.now() - 500);
    expect((await get(issued.body.token)).status).toBe(200); // half a second before its expiry
    clock.advance(501);
    const after = await get(issued.body.token);
    expect(after.status).toBe(401);
    expect(after.body.detail).toMatch(/expired/);
  });

  it('refuses an expired token stored long ago, and a token without a stored expiry once it is older than LEADLINE_TOKEN_TTL_DAYS', async () => {
    const insert = async (createdDaysAgo: number, expiresDaysAgo: number | null) => {
      const token = `ll_${randomBytes(32).toString('base64url')}`;
      await t.db.query(
        `INSERT INTO tokens (id, user_id, token_hash, label, created_at, expires_at)
         VALUES ($1, $2, $3, 'old', now() - make_interval(days => $4::int), CASE WHEN $5::int IS NULL THEN NULL ELSE now() - make_interval(days => $5::int) END)`,
        [randomUUID(), t.users.author, legacyTokenHash(token), createdDaysAgo, expiresDaysAgo],
      );
      return token;
    };
    expect((await get(await insert(30, 1))).status).toBe(401); // expired yesterday
    expect((await get(await insert(91, null))).status).toBe(401); // issued before expiries were stored, 91 days ago
    expect((await get(await insert(1, null))).status).toBe(200); // same, but only a day old
  });

  it('gives every issued token an expiry: the default lifetime, or a shorter one asked for; never past the maximum', async () => {
    const before = clock.now();
    const issued = await t.call('POST', `/api/v1/users/${t.users.author}/tokens`, {}, { as: 'admin' });
    const expires = Date.parse(issued.body.expiresAt);
    expect(expires).toBeGreaterThanOrEqual(before + 90 * DAY - 1000);
    expect(expires).toBeLessThanOrEqual(clock.now() + 90 * DAY + 1000);
    const week = await t.call('POST', `/api/v1/users/${t.users.author}/tokens`, { expiresInDays: 7 }, { as: 'admin' });
    expect(Date.parse(week.body.expiresAt)).toBeLessThanOrEqual(clock.now() + 7 * DAY + 1000);
    const listed = await t.call('GET', `/api/v1/users/${t.users.author}/tokens`, undefined, { as: 'admin' });
    expect(listed.body.items.find((x: { id: string }) => x.id === week.body.id)).toMatchObject({ expired: false, revoked: false, expiresAt: expect.any(String) });
    const bad = [
      { expiresInDays: 3651 },
      { expiresAt: new Date(clock.now() - 1000).toISOString() },
      { expiresAt: new Date(clock.now() + 3651 * DAY).toISOString() },
      { expiresInDays: 1, expiresAt: new Date(clock.now() + DAY).toISOString() },
    ];
    for (const body of bad) {
      const res = await t.call('POST', `/api/v1/users/${t.users.author}/tokens`, body, { as: 'admin' });
      expect(res.status).toBe(422);
      expect(res.body.errors[0].path).toMatch(/expires/);
    }
  });
});

describe('user-level audit [GET /api/v1/identity-events]', () => {
  it('records a token issued for another user, with the admin and the admin token that issued it', async () => {
    const [adminToken] = await t.db.query<{ id: string }>(`SELECT id FROM tokens WHERE token_hash = $1`, [t.app.get(ServiceKeys).key.tokenHash(t.tokens.admin)]);
    const issued = await t.call('POST', `/api/v1/users/${t.users.reviewer}/tokens`, { label: 'for the checker' }, { as: 'admin' });
    const events = await t.call('GET', `/api/v1/identity-events?user=${t.users.reviewer}`, undefined, { as: 'admin' });
    expect(events.status).toBe(200);
    const event = events.body.items.find((e: { tokenId: string }) => e.tokenId === issued.body.id);
    expect(event).toMatchObject({
      type: 'token-issued', actorId: t.users.admin, actorTokenId: adminToken.id, subjectUserId: t.users.reviewer, subjectName: 'Checking engineer (test)',
      data: { label: 'for the checker', forAnotherUser: true, expiresAt: expect.any(String) },
    });
  });

  it('records a new user and every role granted to it, and a revocation', async () => {
    const user = await t.call('POST', '/api/v1/users', { name: 'Audited checker (test)', roles: ['reviewer', 'author'] }, { as: 'admin' });
    const token = await t.call('POST', `/api/v1/users/${user.body.id}/tokens`, {}, { as: 'admin' });
    await t.call('POST', `/api/v1/users/${user.body.id}/tokens/${token.body.id}/revoke`, {}, { as: 'admin' });
    const events = await t.call('GET', `/api/v1/identity-events?user=${user.body.id}`, undefined, { as: 'admin' });
    const kinds = events.body.items.map((e: { type: string; data: { role?: string } }) => (e.type === 'role-granted' ? `role-granted:${e.data.role}` : e.type)).sort();
    expect(kinds).toEqual(['role-granted:author', 'role-granted:reviewer', 'token-issued', 'token-revoked', 'user-created']);
    for (const e of events.body.items) expect(e.actorId).toBe(t.users.admin);
  });

  it('is for admins only, and insert-only in the database', async () => {
    expect((await t.call('GET', '/api/v1/identity-events', undefined, { as: 'reviewer' })).status).toBe(403);
    await expect(t.db.query(`UPDATE identity_events SET type = 'user-created'`)).rejects.toThrow();
    await expect(t.db.query(`DELETE FROM identity_events`)).rejects.toThrow();
    await expect(t.db.query(`TRUNCATE identity_events`)).rejects.toThrow();
  });
});

describe('demo seed', () => {
  it('seeds and prints short-lived tokens only into an empty database; later starts issue none unless asked', async () => {
    const first = await seedDemo(t.app);
    expect(first.seeded).toBe(true);
    expect(first.tokens.map((x) => x.name)).toEqual(['Design author (demo)', 'Checking engineer (demo)', 'Administrator (demo)']);
    for (const token of first.tokens) {
      expect(Date.parse(token.expiresAt)).toBeLessThanOrEqual(clock.now() + 12 * 3_600_000 + 1000);
      expect((await get(token.token)).status).toBe(200);
    }
    // the demo accounts: emails and generated passwords, printed once, that sign in
    expect(first.accounts.map((a) => a.email)).toEqual(['author@demo.example.com', 'checker@demo.example.com', 'admin@demo.example.com']);
    for (const a of first.accounts) {
      expect(a.password.length).toBeGreaterThanOrEqual(15);
      expect((await t.call('POST', '/api/v1/sessions', { email: a.email, password: a.password }, { as: 'anonymous' })).status).toBe(201);
    }
    const [{ n }] = await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM tokens`);
    const again = await seedDemo(t.app);
    expect(again).toEqual({ seeded: false, products: [], tokens: [], accounts: [] });
    expect((await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM tokens`))[0].n).toBe(n);
    const asked = await seedDemo(t.app, { issueTokens: true });
    expect(asked.seeded).toBe(false);
    expect(asked.tokens).toHaveLength(3);
  });
});

describe('keyed token hashes', () => {
  it('stores new tokens as HMAC with the record key, never as the plain SHA-256 an attacker could compute', async () => {
    const issued = await t.call('POST', `/api/v1/users/${t.users.reviewer}/tokens`, { label: 'keyed' }, { as: 'admin' });
    const [row] = await t.db.query<{ token_hash: string; hash_kind: string }>(`SELECT token_hash, hash_kind FROM tokens WHERE id = $1`, [issued.body.id]);
    expect(row).toEqual({ token_hash: t.app.get(ServiceKeys).key.tokenHash(issued.body.token), hash_kind: 'hmac' });
    expect(row.token_hash).not.toBe(legacyTokenHash(issued.body.token));
  });

  it('refuses a token stored before keyed hashing (plain SHA-256) with LEADLINE_LEGACY_TOKENS=refuse, though it has not expired', async () => {
    const strict = await startTestApp('pglite', { LEADLINE_LEGACY_TOKENS: 'refuse' });
    try {
      const token = `ll_${randomBytes(32).toString('base64url')}`;
      // a row as the service wrote it before migrations/20261204230000 (hash_kind defaults to 'sha256')
      await strict.db.query(`INSERT INTO tokens (id, user_id, token_hash, created_at, expires_at) VALUES ($1, $2, $3, now(), now() + interval '1 day')`, [
        randomUUID(), strict.users.author, legacyTokenHash(token),
      ]);
      expect((await strict.call('GET', '/api/v1/products', undefined, asToken(token))).status).toBe(401);
      expect((await strict.call('GET', '/api/v1/products', undefined, { as: 'author' })).status).toBe(200);
    } finally {
      await strict.close();
    }
    // the default (accept) takes the same kind of row until it expires: the test above, "refuses an expired token stored long ago…"
  });
});

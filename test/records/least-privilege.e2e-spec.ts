/**
 * Least privilege in PostgreSQL, written as the attack: the service connects as a runtime role
 * (created here with a unique name on the shared server and dropped afterwards) while the migrations ran as an
 * owner role. The runtime role can read, and write only through the record functions (test/records/forgery.e2e-spec.ts
 * holds the attacks on those).
 */
import { Client } from 'pg';
import { changedDesign, clearDesign, warningDesign } from '../support/designs';
import { countRecords, startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let productId: string;
const logs: string[] = [];
const capture = { write: (line: string) => void logs.push(line) };

beforeAll(async () => {
  t = await startTestApp('postgres', { LOG_LEVEL: 'warn' }, capture, { roles: true });
  productId = (await t.call('POST', '/api/v1/products', { code: 'LP-1', name: 'Lowmark LP-1 press (test product)' })).body.id;
});
afterAll(() => t?.close());

it('connects as the runtime role, which is neither owner nor superuser', async () => {
  const [me] = await t.db.query<{ user: string; superuser: boolean }>(`SELECT current_user AS user, (SELECT rolsuper FROM pg_roles WHERE rolname = current_user) AS superuser`);
  expect(me).toEqual({ user: t.roles!.runtime, superuser: false });
  const [owner] = await t.db.query<{ owner: string }>(`SELECT tableowner AS owner FROM pg_tables WHERE tablename = 'revisions'`);
  expect(owner.owner).toBe(t.roles!.owner);
});

it('starts without the single-user and privileged-role warnings; a single-user start warns about both', async () => {
  expect(logs.join('')).not.toMatch(/LEADLINE_MIGRATION_DATABASE_URL is not set|connects as a role that/);
  const single: string[] = [];
  const plain = await startTestApp('postgres', { LOG_LEVEL: 'warn' }, { write: (line: string) => void single.push(line) });
  await plain.close();
  expect(single.join('')).toMatch(/LEADLINE_MIGRATION_DATABASE_URL is not set/);
  expect(single.join('')).toMatch(/connects as a role that is a database superuser/);
});

it('serves the whole workflow as the runtime role', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'press screw', design: warningDesign }, { headers: { 'idempotency-key': 'lp-1' } });
  expect(opened.status).toBe(201);
  const again = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'press screw', design: warningDesign }, { headers: { 'idempotency-key': 'lp-1' } });
  expect(again.body).toEqual(opened.body);
  expect((await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, { text: 'which grease?' }, { as: 'reviewer' })).status).toBe(201);
  const rejected = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'reject', comment: 'measure it' }, { as: 'reviewer' });
  expect(rejected.status).toBe(201);
  const next = await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: clearDesign, note: 'measured' });
  expect(next.status).toBe(201);
  const approved = await t.call('POST', `/api/v1/revisions/${next.body.revisionId}/decisions`, { decision: 'approve' }, { as: 'reviewer' });
  expect(approved.status).toBe(201);
  const third = await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: changedDesign(clearDesign, 'to withdraw'), note: 'to withdraw' });
  expect((await t.call('POST', `/api/v1/revisions/${third.body.revisionId}/withdraw`, {})).status).toBe(200);
  const moved = await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/reassignments`, { userId: t.users.author2 }, { as: 'admin' });
  expect(moved.status).toBe(201);
  expect((await t.call('GET', `/api/v1/products/${productId}/audit`, undefined, { as: 'reviewer' })).status).toBe(200);
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body).toMatchObject({ valid: true, firstBrokenLink: null });
});

it('refuses UPDATE, DELETE, TRUNCATE, ALTER TABLE ... DISABLE TRIGGER and DROP to the runtime role', async () => {
  const before = await countRecords(t.db);
  const refused: [string, RegExp][] = [
    [`UPDATE revisions SET note = 'edited'`, /permission denied/],
    [`DELETE FROM events`, /permission denied/],
    [`DELETE FROM revision_closures`, /permission denied/],
    [`TRUNCATE events CASCADE`, /permission denied/],
    [`ALTER TABLE revisions DISABLE TRIGGER revisions_immutable`, /must be owner/],
    [`ALTER TABLE events DISABLE TRIGGER USER`, /must be owner/],
    [`ALTER TABLE revisions ADD COLUMN x int`, /must be owner/],
    [`DROP TABLE revision_closures CASCADE`, /must be owner/],
    [`DROP TRIGGER events_immutable ON events`, /must be owner/],
    [`UPDATE chain_heads SET seq = seq - 1`, /permission denied/],
    [`DELETE FROM chain_heads`, /permission denied/],
    [`SELECT * FROM chain_heads FOR UPDATE`, /permission denied/],
    [`DROP FUNCTION leadline_lock_head(uuid)`, /must be owner/],
    [`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) SELECT id, 'approved', id, id FROM revisions LIMIT 1`, /permission denied/],
    [`CREATE OR REPLACE FUNCTION leadline_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RETURN NEW; END $$`, /must be owner|permission denied/],
    [`SELECT * FROM schema_migrations`, /permission denied/],
    // accounts and sessions: a session row or a password credential made by the runtime role would sign in as anyone
    [`INSERT INTO sessions (id, user_id, secret_hash, seal_key, method, auth_time, expires_at) SELECT gen_random_uuid(), id, 'x', 'k', 'password', now(), now() + interval '1 hour' FROM users LIMIT 1`, /permission denied/],
    [`INSERT INTO activation_codes (id, user_id, code_hash, purpose, expires_at) SELECT gen_random_uuid(), id, 'x', 'reset', now() + interval '1 hour' FROM users LIMIT 1`, /permission denied/],
    [`INSERT INTO password_credentials (id, user_id, hash, activation_id) SELECT gen_random_uuid(), user_id, '$argon2id$x', id FROM activation_codes LIMIT 1`, /permission denied/],
    [`INSERT INTO session_ends (session_id, reason) SELECT id, 'signed-out' FROM sessions LIMIT 1`, /permission denied/],
    [`INSERT INTO reauthentications (id, user_id, revision_id, method, started_at, auth_time) SELECT gen_random_uuid(), u.id, r.id, 'oidc', now(), now() FROM users u, revisions r LIMIT 1`, /permission denied/],
    [`INSERT INTO reauthentication_uses (reauthentication_id) SELECT id FROM reauthentications LIMIT 1`, /permission denied/],
    [`SELECT secret_hash FROM sessions`, /permission denied/],
    [`SELECT seal_key FROM sessions`, /permission denied/],
    // the Argon2id hashes are not the runtime role's to read (an offline guessing attack needs them)
    [`SELECT hash FROM password_credentials`, /permission denied/],
    [`SELECT * FROM password_credentials`, /permission denied/],
    // passkeys: a key, a challenge or a challenge's use written by the runtime role would sign in or sign as anyone
    [`INSERT INTO passkey_credentials (id, user_id, credential_id, public_key, rp_id, counter, label) SELECT gen_random_uuid(), id, 'x', 'y', 'localhost', 0, 'k' FROM users LIMIT 1`, /permission denied/],
    [`INSERT INTO passkey_challenges (id, user_id, purpose, challenge, rp_id, expires_at) SELECT gen_random_uuid(), id, 'register', repeat('a', 43), 'localhost', now() + interval '1 hour' FROM users LIMIT 1`, /permission denied/],
    [`INSERT INTO passkey_challenge_uses (challenge_id) SELECT id FROM passkey_challenges LIMIT 1`, /permission denied/],
  ];
  for (const [sql, error] of refused) {
    await expect(t.db.query(sql)).rejects.toThrow(error);
  }
  // the head moves only inside the record functions, which take a credential
  await expect(t.db.query(`SELECT leadline_move_head($1, $2, $3)`, [productId, 99, 'f'.repeat(64)])).rejects.toThrow(/does not exist/);
  // a session is started only with the service credential, which the runtime role does not hold
  await expect(
    t.db.query(`SELECT leadline_start_session($1, gen_random_uuid(), $2, $3, 'k', 'password', now(), now() + interval '1 hour')`, ['a'.repeat(64), t.users.reviewer, 'b'.repeat(64)]),
  ).rejects.toThrow(/started by the service/);
  // ... and a password hash is read only with it
  await expect(t.db.query(`SELECT leadline_password_hash($1, $2)`, ['a'.repeat(64), t.users.reviewer])).rejects.toThrow(/read by the service only/);
  expect(await countRecords(t.db)).toEqual(before);
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body.valid).toBe(true);
});

it('attack: a closure row forged by the runtime role is refused by the database', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'forged', design: clearDesign });
  const [event] = await t.db.query<{ id: string }>(`SELECT id FROM events WHERE revision_id = $1`, [opened.body.revisionId]);
  await expect(
    t.db.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'approved', $2, $3)`, [opened.body.revisionId, event.id, t.users.reviewer]),
  ).rejects.toThrow(/permission denied/);
  expect((await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body.review.state).toBe('submitted');
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body).toMatchObject({ valid: true });
});

it('attack: a chain head rewound one link by the owner role (trigger disabled, rejection deleted, head moved back) verifies, but its checkpoint does not', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'rewound', design: clearDesign });
  const rejected = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'reject', comment: 'no' }, { as: 'reviewer' });
  expect(rejected.status).toBe(201);
  const checkpoint = rejected.body.checkpoint;
  expect((await t.call('POST', '/api/v1/checkpoints/verify', checkpoint)).body.valid).toBe(true);
  // a forged closure from the earlier test would make verify fail for another reason: judge the chain on its own
  const owner = new Client({ connectionString: t.roles!.ownerUrl });
  owner.on('error', () => undefined);
  await owner.connect();
  try {
    await owner.query('BEGIN');
    for (const table of ['revision_closures', 'events', 'chain_heads']) await owner.query(`ALTER TABLE ${table} DISABLE TRIGGER USER`);
    await owner.query(`DELETE FROM revision_closures WHERE revision_id = $1`, [opened.body.revisionId]);
    await owner.query(`DELETE FROM revision_closures WHERE revision_id IN (SELECT c.revision_id FROM revision_closures c JOIN events e ON e.id = c.event_id WHERE e.type <> c.kind)`);
    await owner.query(`DELETE FROM events WHERE id = $1`, [rejected.body.eventId]);
    await owner.query(`UPDATE chain_heads SET seq = seq - 1, hash = (SELECT hash FROM events WHERE product_id = $1 AND seq = $2) WHERE product_id = $1`, [productId, checkpoint.seq - 1]);
    for (const table of ['revision_closures', 'events', 'chain_heads']) await owner.query(`ALTER TABLE ${table} ENABLE TRIGGER USER`);
    await owner.query('COMMIT');
  } finally {
    await owner.end();
  }
  // the rejection is gone and the chain is consistent again: verify alone cannot see it
  expect((await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body.review.state).toBe('submitted');
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body).toMatchObject({ valid: true });
  const caught = await t.call('POST', '/api/v1/checkpoints/verify', checkpoint);
  expect(caught.body).toMatchObject({ valid: false, signatureValid: true, linkPresent: false, currentHead: { seq: checkpoint.seq - 1 } });
  expect(caught.body.reason).toMatch(/rewound/);
});

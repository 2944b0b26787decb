/**
 * Tamper evidence, written as the attacks on it: everything that decides a state is in the chain, and verify
 * names the first row of a derived table (review closures, products, calculations) or a column (author_id,
 * actor_id) that the chain does not bear out. The tampering here runs as the test's database superuser with the
 * insert-only triggers disabled where needed; test/records/least-privilege.e2e-spec.ts repeats the closure forgery
 * as the service's runtime role.
 */
import { randomUUID } from 'node:crypto';
import { DataSource } from 'typeorm';
import { Client } from 'pg';
import { MIGRATIONS } from '../../migrations';
import { Database } from '../../apps/api/src/infra/database/database.service';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { loadConfig } from '../../apps/api/src/infra/config';
import { linkHash, TS_TEXT } from '../../apps/api/src/records/chain';
import { ServiceKeys } from '../../apps/api/src/records/service-keys';
import { prepareSubmission, RecordStore } from '../../apps/api/src/records/record-store';
import { changedDesign, clearDesign, warningDesign } from '../support/designs';
import { BACKENDS, countRecords, startTestApp, type TestApp } from '../support/harness';

const ACK = [{ finding: 'friction-source-assumed', comment: 'Range brackets the handbook values; test to confirm.' }];

describe.each(BACKENDS)('tamper evidence on %s', (backend) => {
  let t: TestApp;

  beforeAll(async () => {
    t = await startTestApp(backend);
  });
  afterAll(() => t?.close());

  async function product(code: string) {
    const res = await t.call('POST', '/api/v1/products', { code: `${code}-${backend}`, name: `${code} (test product)` });
    expect(res.status).toBe(201);
    return res.body.id as string;
  }
  const open = async (productId: string, design: unknown = warningDesign, as: 'author' | 'author2' | 'reviewer2' = 'author') =>
    (await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'lift screw', design }, { as })).body;
  const verify = async (productId: string) => (await t.call('GET', `/api/v1/products/${productId}/verify`, undefined, { as: 'reviewer' })).body;
  const state = async (revisionId: string) => (await t.call('GET', `/api/v1/revisions/${revisionId}`, undefined, { as: 'reviewer' })).body.review.state;
  async function withTriggersOff(table: string, sql: string, params: unknown[] = []) {
    await t.db.query(`ALTER TABLE ${table} DISABLE TRIGGER USER`);
    try {
      await t.db.query(sql, params);
    } finally {
      await t.db.query(`ALTER TABLE ${table} ENABLE TRIGGER USER`);
    }
  }

  it('a forged closure row does not approve a revision, and verify reports it', async () => {
    const p = await product('FORGE');
    const opened = await open(p);
    const before = await verify(p);
    expect(before).toMatchObject({ valid: true, firstBrokenLink: null });
    // the attacker points a new closure at an existing event (the submission event) and names an approval
    const [submitted] = await t.db.query<{ id: string }>(`SELECT id FROM events WHERE revision_id = $1 AND type = 'revision-submitted'`, [opened.revisionId]);
    await t.db.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'approved', $2, $3)`, [opened.revisionId, submitted.id, t.users.reviewer]);
    expect(await state(opened.revisionId)).toBe('submitted');
    // nor does it count as approved anywhere else (the rule-set impact of approved revisions)
    const version = (await t.call('GET', '/api/v1/rule-sets', undefined, { as: 'reviewer' })).body.current;
    const impact = await t.call('POST', `/api/v1/rule-sets/${version}/impact`, { scope: 'approved', productId: p }, { as: 'reviewer' });
    expect(impact.status).toBe(200);
    expect(impact.body.examined).toBe(0);
    const after = await verify(p);
    expect(after.valid).toBe(false);
    expect(after.firstBrokenLink).toMatchObject({ kind: 'closure', id: opened.revisionId, reason: expect.stringContaining('not borne out') });
  });

  it('an erased closure of a real rejection is reported: the decision event has no closure', async () => {
    const p = await product('ERASE');
    const opened = await open(p);
    const rejected = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'reject', comment: 'measure the friction' }, { as: 'reviewer' });
    expect(rejected.status).toBe(201);
    expect((await verify(p)).valid).toBe(true);
    await withTriggersOff('revision_closures', `DELETE FROM revision_closures WHERE revision_id = $1`, [opened.revisionId]);
    const after = await verify(p);
    expect(after).toMatchObject({ valid: false, firstBrokenLink: { kind: 'event', id: rejected.body.eventId, seq: rejected.body.seq } });
  });

  it('an author_id edited to pass four-eyes is reported, and four-eyes reads the hashed author', async () => {
    const p = await product('AUTHOR');
    // reviewer2 (reviewer and author) submits, then moves author_id away to approve the revision themself
    const opened = await open(p, warningDesign, 'reviewer2');
    await withTriggersOff('revisions', `UPDATE revisions SET author_id = $2 WHERE id = $1`, [opened.revisionId, t.users.author]);
    const after = await verify(p);
    expect(after).toMatchObject({ valid: false, firstBrokenLink: { kind: 'revision', id: opened.revisionId, reason: 'author_id does not match the hashed author' } });
    const self = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'approve', acknowledgements: ACK }, { as: 'reviewer2' });
    expect(self.status).toBe(403);
    expect(self.body.title).toBe('Four-eyes rule');
  });

  it('a renamed product row and an edited calculation title are reported against their registration events', async () => {
    const p = await product('RENAME');
    const opened = await open(p);
    await withTriggersOff('calculations', `UPDATE calculations SET title = 'something else' WHERE id = $1`, [opened.calculationId]);
    expect((await verify(p)).firstBrokenLink).toMatchObject({ kind: 'calculation', id: opened.calculationId });
    const q = await product('RENAME2');
    await withTriggersOff('products', `UPDATE products SET name = 'renamed' WHERE id = $1`, [q]);
    expect((await verify(q)).firstBrokenLink).toMatchObject({ kind: 'product', id: q, seq: 1 });
  });

  it('records and hashes the token id used: a revision and an event edited to another token are reported', async () => {
    const p = await product('TOKEN');
    const opened = await open(p);
    const tokens = (await t.call('GET', `/api/v1/users/${t.users.author}/tokens`, undefined, { as: 'admin' })).body;
    const tokenId = (Array.isArray(tokens) ? tokens : tokens.items)[0].id;
    const rows = await t.db.query<{ token_id: string; link_version: number }>(`SELECT token_id, link_version FROM revisions WHERE id = $1`, [opened.revisionId]);
    expect(rows[0]).toEqual({ token_id: tokenId, link_version: 3 });
    const events = await t.db.query<{ type: string; token_id: string }>(`SELECT type, token_id FROM events WHERE product_id = $1 ORDER BY seq`, [p]);
    expect(events.map((e) => e.type)).toEqual(['product-registered', 'calculation-opened', 'revision-submitted']);
    expect(events.every((e) => e.token_id === tokenId)).toBe(true);
    await withTriggersOff('events', `UPDATE events SET token_id = $2 WHERE revision_id = $1`, [opened.revisionId, randomUUID()]);
    expect((await verify(p)).firstBrokenLink).toMatchObject({ kind: 'event', reason: 'content does not match its hash' });
  });

  it('refuses a decision by an admin token [POST /api/v1/revisions/:id/decisions]', async () => {
    const p = await product('ADMIN');
    const opened = await open(p, clearDesign);
    // an admin who is also a reviewer still cannot decide
    const boss = (await t.call('POST', '/api/v1/users', { name: 'Engineering manager (test)', roles: ['admin', 'reviewer'] }, { as: 'admin' })).body;
    const bossToken = (await t.call('POST', `/api/v1/users/${boss.id}/tokens`, {}, { as: 'admin' })).body.token;
    const before = await countRecords(t.db);
    for (const authorization of [`Bearer ${t.tokens.admin}`, `Bearer ${bossToken}`]) {
      const res = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'approve' }, { headers: { authorization } });
      expect(res.status).toBe(403);
    }
    expect(await countRecords(t.db)).toEqual(before);
    expect(await state(opened.revisionId)).toBe('submitted');
  });

  it('refuses a decision with a token the revision\'s author issued (an author who is also an admin)', async () => {
    const p = await product('MINT');
    const both = (await t.call('POST', '/api/v1/users', { name: 'Author with admin rights (test)', roles: ['author', 'admin'] }, { as: 'admin' })).body;
    const bothToken = (await t.call('POST', `/api/v1/users/${both.id}/tokens`, {}, { as: 'admin' })).body.token;
    const as = (token: string) => ({ headers: { authorization: `Bearer ${token}` } });
    const opened = (await t.call('POST', `/api/v1/products/${p}/calculations`, { title: 'minted', design: clearDesign }, as(bothToken))).body;
    // the author mints a token for a real reviewer and decides with it
    const minted = (await t.call('POST', `/api/v1/users/${t.users.reviewer}/tokens`, {}, as(bothToken))).body.token;
    const res = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'approve' }, as(minted));
    expect(res.status).toBe(403);
    expect(res.body.detail).toMatch(/issued by another person/);
    // the reviewer's own token (issued from their own session) decides
    const ok = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'approve' }, { as: 'reviewer' });
    expect(ok.status).toBe(201);
    expect((await verify(p)).valid).toBe(true);
  });

  it('refuses a revision appended to a colleague\'s calculation (403, nothing stored); an admin reassignment is chained and moves ownership [POST /api/v1/calculations/:id/reassignments]', async () => {
    const p = await product('OWNER');
    const opened = await open(p, clearDesign);
    const url = `/api/v1/calculations/${opened.calculationId}/revisions`;
    const before = await countRecords(t.db);
    const foreign = await t.call('POST', url, { design: clearDesign, note: 'taking it over' }, { as: 'author2' });
    expect(foreign.status).toBe(403);
    expect(foreign.headers['content-type']).toMatch(/problem\+json/);
    expect(await countRecords(t.db)).toEqual(before);
    expect(await state(opened.revisionId)).toBe('submitted');

    const reassignUrl = `/api/v1/calculations/${opened.calculationId}/reassignments`;
    expect((await t.call('POST', reassignUrl, { userId: t.users.author2 }, { as: 'author' })).status).toBe(403);
    const notAuthor = await t.call('POST', reassignUrl, { userId: t.users.reviewer }, { as: 'admin' });
    expect(notAuthor.status).toBe(422);
    expect(notAuthor.body.errors[0].path).toBe('userId');
    expect(await countRecords(t.db)).toEqual(before);

    const moved = await t.call('POST', reassignUrl, { userId: t.users.author2, reason: 'author on leave' }, { as: 'admin' });
    expect(moved.status).toBe(201);
    expect(moved.body).toMatchObject({ owner: { id: t.users.author2 }, previousOwner: { id: t.users.author } });
    const [event] = await t.db.query<{ type: string; actor_id: string; data: { to: { id: string } } }>(`SELECT type, actor_id, data FROM events WHERE id = $1`, [moved.body.eventId]);
    expect(event).toMatchObject({ type: 'calculation-reassigned', actor_id: t.users.admin, data: { to: { id: t.users.author2 } } });
    expect((await t.call('POST', url, { design: clearDesign }, { as: 'author' })).status).toBe(403);
    const taken = await t.call('POST', url, { design: changedDesign(clearDesign, 'continued'), note: 'continued' }, { as: 'author2' });
    expect(taken.status).toBe(201);
    expect(taken.body.revision).toBe(2);
    expect(await verify(p)).toMatchObject({ valid: true, firstBrokenLink: null });
    // the reassignment is in the audit trail
    const trail = await t.call('GET', `/api/v1/products/${p}/audit`, undefined, { as: 'reviewer' });
    expect(trail.body.items.map((i: { type: string }) => i.type)).toContain('calculation-reassigned');
  });
});

describe('links written before link formats 2 and 3', () => {
  const serverUrl = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';
  const name = `leadline_test_v1_${randomUUID().slice(0, 8)}`;
  const url = (() => {
    const u = new URL(serverUrl);
    u.pathname = `/${name}`;
    return u.toString();
  })();
  const admin = async (sql: string) => {
    const c = new Client({ connectionString: serverUrl });
    await c.connect();
    await c.query(sql).finally(() => c.end());
  };
  beforeAll(() => admin(`CREATE DATABASE ${name}`));
  afterAll(() => admin(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`));

  it('still verify after the new migrations, next to format-2 links appended after them', async () => {
    const firstWave = MIGRATIONS.findIndex((m) => m.name === 'AddedLinkVersionsAndTokenIds20261202100000');
    const old = new DataSource({ type: 'postgres', url, migrations: MIGRATIONS.slice(0, firstWave), migrationsTableName: 'schema_migrations' });
    await old.initialize();
    await old.runMigrations({ transaction: 'each' });
    // a product, a calculation and a revision as the service wrote them before format 2 (events hashed in TypeScript)
    const productId = randomUUID();
    const calculationId = randomUUID();
    const actor = { id: randomUUID(), name: 'Design author (test)' };
    const [now] = await old.query(`SELECT to_char(now() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') AS t`);
    await old.query(`INSERT INTO products (id, code, name, created_by) VALUES ($1, 'OLD-1', 'old product', $2)`, [productId, actor.id]);
    const event = (seq: number, type: string, calc: string | null, data: Record<string, unknown>, previousHash: string | null) => {
      const link = { kind: 'event', id: randomUUID(), productId, seq, type, calculationId: calc, revisionId: null, actor, data, createdAt: now.t };
      return { link, hash: linkHash(link, previousHash) };
    };
    const e1 = event(1, 'product-registered', null, { code: 'OLD-1', name: 'old product', description: null }, null);
    await old.query(`INSERT INTO calculations (id, product_id, title, created_by, created_at) VALUES ($1, $2, 'old screw', $3, $4::timestamptz)`, [calculationId, productId, actor.id, now.t]);
    const e2 = event(2, 'calculation-opened', calculationId, { title: 'old screw' }, e1.hash);
    for (const [e, prev] of [[e1, null], [e2, e1.hash]] as const) {
      await old.query(
        `INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash)
         VALUES ($1, $2, $3, $4, $5, NULL, $6, $7, $8, $9::timestamptz, $10, $11)`,
        [e.link.id, productId, e.link.seq, e.link.type, e.link.calculationId, actor.id, JSON.stringify(actor), JSON.stringify(e.link.data), now.t, e.hash, prev],
      );
    }
    await old.query(`INSERT INTO chain_heads (product_id, seq, hash) VALUES ($1, 2, $2)`, [productId, e2.hash]);
    await old.query(`INSERT INTO rule_sets (version, definition) VALUES ($1, $2)`, [DEFAULT_RULE_SET.version, JSON.stringify(DEFAULT_RULE_SET)]);
    const s = prepareSubmission({ input: clearDesign, normalized: { a: 1 }, evaluation: { b: 2 }, findings: [], verdict: 'clear', engineVersion: 'old', ruleSetVersion: DEFAULT_RULE_SET.version, note: 'before format 2' });
    await old.query(`SELECT * FROM leadline_append_revision($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15)`, [
      productId, calculationId, randomUUID(), randomUUID(), s.note, s.json.input, s.json.normalized, s.json.evaluation, s.json.findings, s.content,
      s.verdict, s.engineVersion, s.ruleSetVersion, actor.id, actor.name,
    ]);
    await old.destroy();

    const ds = new DataSource({ type: 'postgres', url, migrations: MIGRATIONS, migrationsTableName: 'schema_migrations' });
    await ds.initialize();
    try {
      await ds.runMigrations({ transaction: 'each' });
      const db = new Database(ds, false);
      const store = new RecordStore(db, new ServiceKeys(db, loadConfig({ LEADLINE_DATA_DIR: 'memory://' })));
      expect(await store.verify(productId)).toMatchObject({ valid: true, links: 4 });
      const [{ v }] = await ds.query(`SELECT array_agg(link_version ORDER BY seq) AS v FROM events WHERE product_id = $1`, [productId]);
      expect(v).toEqual([1, 1, 1]);
      // a sealed (format 3) revision appended after the migrations continues the same chain
      await store.appendRevision(db, productId, calculationId, s, Object.assign({ ...actor }, { tokenId: randomUUID() }));
      expect(await store.verify(productId)).toMatchObject({ valid: true, links: 6 });
      // an unsealed link (format 2, hash correct) written after the sealed ones is reported: from the first seal on, every link is sealed
      const [head] = await ds.query(`SELECT seq, hash, ${TS_TEXT('now()')} AS now FROM chain_heads WHERE product_id = $1`, [productId]);
      const late = { kind: 'event', id: randomUUID(), productId, seq: Number(head.seq) + 1, type: 'comment', calculationId, revisionId: null, actor, data: { text: 'late' }, createdAt: head.now, linkVersion: 2, tokenId: null };
      const lateHash = linkHash(late, head.hash);
      await ds.query(
        `INSERT INTO events (id, product_id, seq, type, calculation_id, actor_id, actor, data, created_at, hash, previous_hash, link_version)
         VALUES ($1, $2, $3, 'comment', $4, $5, $6, $7, $8::timestamptz, $9, $10, 2)`,
        [late.id, productId, late.seq, calculationId, actor.id, JSON.stringify(actor), JSON.stringify(late.data), head.now, lateHash, head.hash],
      );
      await ds.query(`UPDATE chain_heads SET seq = $2, hash = $3 WHERE product_id = $1`, [productId, late.seq, lateHash]);
      expect((await store.verify(productId)).firstBrokenLink).toMatchObject({ seq: late.seq, reason: expect.stringMatching(/unsealed link of format 2 after the sealed links/) });
      // a token id slipped onto an old link (which does not hash it) is reported
      await ds.query(`ALTER TABLE events DISABLE TRIGGER USER`);
      await ds.query(`UPDATE events SET token_id = gen_random_uuid() WHERE product_id = $1 AND seq = 2`, [productId]);
      await ds.query(`ALTER TABLE events ENABLE TRIGGER USER`);
      expect((await store.verify(productId)).firstBrokenLink).toMatchObject({ seq: 2, reason: 'a token id on a link whose format does not hash it' });
    } finally {
      await ds.destroy();
    }
  });
});

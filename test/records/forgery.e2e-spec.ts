/**
 * Records the database credential cannot forge (docs/reliability.md, "Threat model"), written as the attacks of an
 * attack review that held the runtime role's credentials: the service runs as a runtime role set up exactly as
 * docker/postgres-init and the migrations set it up (startTestApp(..., { roles: true })), and each attack connects
 * as that role on its own connection. Where the database refuses, the test shows the refusal; where an attack is
 * written around the database (as its superuser, who can write anything), verify names the first bad link, the API
 * and the report never show the forgery as approved or current, and no checkpoint is signed over it.
 */
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { Client } from 'pg';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { contentDigest, linkHash, TS_TEXT } from '../../apps/api/src/records/chain';
import { legacyTokenHash } from '../../apps/api/src/identities/identities.service';
import { RecordStore } from '../../apps/api/src/records/record-store';
import { ServiceKeys } from '../../apps/api/src/records/service-keys';
import { RuleSetsService } from '../../apps/api/src/rules/rule-sets.service';
import { blockedDesign, clearDesign, warningDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';
import { LEAD_SCREW } from '../support/sizing';
import { serverUrl, withDatabase } from '../support/run-resources';

let t: TestApp;
let runtime: Client;
let superuser: Client;

async function connect(url: string): Promise<Client> {
  const c = new Client({ connectionString: url });
  c.on('error', () => undefined);
  await c.connect();
  return c;
}

beforeAll(async () => {
  t = await startTestApp('postgres', {}, undefined, { roles: true });
  runtime = await connect(t.roles!.runtimeUrl);
  superuser = await connect(withDatabase(serverUrl, new URL(t.roles!.runtimeUrl).pathname.slice(1)));
});
afterAll(async () => {
  await runtime?.end();
  await superuser?.end();
  await t?.close();
});

const sha256 = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');

async function product(code: string): Promise<string> {
  const res = await t.call('POST', '/api/v1/products', { code, name: `${code} (test product)` });
  expect(res.status).toBe(201);
  return res.body.id;
}

async function open(productId: string, design: unknown): Promise<{ calculationId: string; revisionId: string }> {
  const res = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'lift screw', design });
  expect(res.status).toBe(201);
  return res.body;
}

/** The chain head and the transaction time, as the runtime role reads them. */
async function head(c: Client, productId: string): Promise<{ seq: number; hash: string; now: string }> {
  const { rows } = await c.query(`SELECT seq, hash, ${TS_TEXT('now()')} AS now FROM chain_heads WHERE product_id = $1`, [productId]);
  return { seq: Number(rows[0].seq), hash: rows[0].hash, now: rows[0].now };
}

describe('identity chain', () => {
  it('chains every user, role and token change; a user row or a link written around the functions is named by its verify [GET /api/v1/identity-events/verify]', async () => {
    const ok = await t.call('GET', '/api/v1/identity-events/verify', undefined, { as: 'admin' });
    expect(ok.body).toMatchObject({ valid: true, firstBrokenLink: null });
    // the harness's users (test/support/harness.ts): the admin (user-created, role-granted), 4 users with 5 roles between them,
    // an activation code and a password set for each of the 4, 5 tokens issued
    expect(ok.body.links).toBe(1 + 1 + 4 + 5 + 4 + 4 + 5);
    expect((await t.call('GET', '/api/v1/identity-events/verify')).status).toBe(403);
    const intruder = randomUUID();
    await superuser.query(`INSERT INTO users (id, name, roles) VALUES ($1, 'Intruder', '{reviewer}')`, [intruder]);
    const bad = await t.call('GET', '/api/v1/identity-events/verify', undefined, { as: 'admin' });
    expect(bad.body).toMatchObject({ valid: false, firstBrokenLink: { kind: 'user', id: intruder } });
    // a link with a correct hash but no MAC, head moved: named by its seq
    const [h] = (await superuser.query(`SELECT seq, hash, ${TS_TEXT('now()')} AS now FROM ledger_heads WHERE ledger = 'identity'`)).rows;
    const record = { kind: 'identity-event', id: randomUUID(), type: 'user-created', actorId: null, actorTokenId: null, subjectUserId: intruder, tokenId: null,
      data: { name: 'Intruder', roles: ['reviewer'] }, seq: Number(h.seq) + 1, createdAt: h.now, linkVersion: 3 };
    const hash = linkHash(record, h.hash);
    await superuser.query(
      `INSERT INTO identity_events (id, type, subject_user_id, data, created_at, seq, hash, previous_hash, mac) VALUES ($1, 'user-created', $2, $3, $4::timestamptz, $5, $6, $7, $8)`,
      [record.id, intruder, JSON.stringify(record.data), h.now, record.seq, hash, h.hash, sha256(hash)],
    );
    await superuser.query(`UPDATE ledger_heads SET seq = $1, hash = $2 WHERE ledger = 'identity'`, [record.seq, hash]);
    const named = await t.call('GET', '/api/v1/identity-events/verify', undefined, { as: 'admin' });
    expect(named.body).toMatchObject({ valid: false, firstBrokenLink: { seq: record.seq, kind: 'identity-event', id: record.id } });
    expect(named.body.firstBrokenLink.reason).toMatch(/MAC does not verify/);
  });
});

describe('tokens and identities', () => {
  it('attack: users, tokens and revocations inserted by the runtime role are refused, and a guessed credential moves no identity function', async () => {
    const known = `ll_${randomBytes(32).toString('base64url')}`;
    const refused: [string, unknown[]][] = [
      [`INSERT INTO users (id, name, roles) VALUES (gen_random_uuid(), 'Intruder', '{admin}')`, []],
      [`INSERT INTO tokens (id, user_id, token_hash) VALUES (gen_random_uuid(), $1, $2)`, [t.users.reviewer, sha256(known)]],
      [`INSERT INTO token_revocations (token_id) SELECT id FROM tokens WHERE user_id = $1`, [t.users.reviewer]],
      [`INSERT INTO identity_events (id, type, subject_user_id) VALUES (gen_random_uuid(), 'role-granted', $1)`, [t.users.author]],
      [`SELECT token_hash FROM tokens`, []],
    ];
    for (const [sql, params] of refused) await expect(runtime.query(sql, params)).rejects.toThrow(/permission denied/);
    // the identity functions want an admin's live credential: neither a guessed hash nor none will do
    for (const credential of [null, sha256(known), sha256(t.tokens.admin)]) {
      await expect(runtime.query(`SELECT leadline_create_user($1, gen_random_uuid(), 'Intruder', '{admin}', '[]')`, [credential])).rejects.toThrow(/needs an admin/);
      await expect(
        runtime.query(`SELECT leadline_issue_token($1, gen_random_uuid(), $2, $3, 'intruder', now() + interval '1 day', '[]')`, [credential, t.users.reviewer, sha256(known)]),
      ).rejects.toThrow(/needs an admin/);
      const { rows } = await runtime.query(`SELECT id FROM tokens WHERE user_id = $1`, [t.users.reviewer]);
      await expect(runtime.query(`SELECT leadline_revoke_token($1, $2, $3, '[]')`, [credential, t.users.reviewer, rows[0].id])).rejects.toThrow(/needs an admin/);
    }
    // the helpers those functions call with the owner's rights are not the runtime role's to call
    await expect(runtime.query(`SELECT leadline_put_identity_events(NULL, NULL, '[]')`)).rejects.toThrow(/permission denied/);
    await expect(runtime.query(`SELECT leadline_ledger_next('identity', 1, NULL, 'x', 'x')`)).rejects.toThrow(/permission denied/);
    expect((await t.call('GET', '/api/v1/me', undefined, { headers: { authorization: `Bearer ${known}` } })).status).toBe(401);
    expect((await t.call('GET', '/api/v1/me', undefined, { as: 'reviewer' })).status).toBe(200); // not revoked
  });

  it('attack: a token row written around the database functions (by its superuser) is unusable without the record key', async () => {
    const known = `ll_${randomBytes(32).toString('base64url')}`;
    await superuser.query(`INSERT INTO tokens (id, user_id, token_hash, hash_kind, expires_at) VALUES (gen_random_uuid(), $1, $2, 'hmac', now() + interval '1 day')`, [
      t.users.reviewer, sha256(known),
    ]);
    expect((await t.call('GET', '/api/v1/me', undefined, { headers: { authorization: `Bearer ${known}` } })).status).toBe(401);
  });
});

describe('forged approvals', () => {
  it('attack: an approval of a blocked revision is refused by the database, whatever credential the runtime role tries', async () => {
    const p = await product('FA-1');
    const opened = await open(p, blockedDesign);
    await expect(runtime.query(`INSERT INTO events (id, product_id, seq, type, data, created_at, hash) VALUES (gen_random_uuid(), $1, 99, 'approved', '{}', now(), 'x')`, [p])).rejects.toThrow(/permission denied/);
    await expect(runtime.query(`SELECT leadline_move_head($1, 1, 'x')`, [p])).rejects.toThrow(/does not exist/);
    const reviewer = { id: t.users.reviewer, name: 'Checking engineer (test)' };
    const { rows: [token] } = await runtime.query(`SELECT id FROM tokens WHERE user_id = $1`, [t.users.reviewer]);
    // even the service's own credential (someone holding the runtime credential and the record key) decides nothing
    const service = t.app.get(ServiceKeys).key.serviceCredential;
    for (const credential of [null, token.id, sha256(t.tokens.reviewer), legacyTokenHash(t.tokens.reviewer), service]) {
      await runtime.query('BEGIN');
      try {
        const h = await head(runtime, p);
        const link = {
          kind: 'event', id: randomUUID(), productId: p, seq: h.seq + 1, type: 'approved', calculationId: opened.calculationId, revisionId: opened.revisionId,
          actor: reviewer, data: { revision: 1, comment: null, acknowledgements: [], comments: [] }, createdAt: h.now, linkVersion: 3, tokenId: token.id,
        };
        const hash = linkHash(link, h.hash);
        await expect(
          runtime.query(`SELECT leadline_append_event($1, $2, $3, $4, 'approved', $5, $6, $7, $8, $9, $10, $11, $12, $13)`, [
            credential, link.id, p, link.seq, opened.calculationId, opened.revisionId, JSON.stringify(reviewer), token.id, JSON.stringify(link.data), h.now, hash, h.hash, 'f'.repeat(64),
          ]),
        ).rejects.toThrow(/no live token|needs the live token/);
      } finally {
        await runtime.query('ROLLBACK');
      }
    }
    expect((await t.call('GET', `/api/v1/revisions/${opened.revisionId}`)).body.review.state).toBe('submitted');
    expect((await t.call('GET', `/api/v1/products/${p}/verify`)).body).toMatchObject({ valid: true });
    // and the reviewer's own token, through the service, cannot approve it either
    expect((await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'approve' }, { as: 'reviewer' })).status).toBe(409);
  });

  it('attack: an approval written around the functions (superuser: correct hash, no valid MAC, head moved) is named by verify, shown as submitted, and gets no checkpoint', async () => {
    const p = await product('FA-2');
    const opened = await open(p, blockedDesign);
    const h = await head(superuser, p);
    const reviewer = { id: t.users.reviewer, name: 'Checking engineer (test)' };
    const link = {
      kind: 'event', id: randomUUID(), productId: p, seq: h.seq + 1, type: 'approved', calculationId: opened.calculationId, revisionId: opened.revisionId,
      actor: reviewer, data: { revision: 1, comment: 'forged', acknowledgements: [], comments: [], signature: { signerId: reviewer.id, printedName: reviewer.name, meaning: 'approved as checking engineer', method: 'password', revisionHash: 'forged' } }, createdAt: h.now, linkVersion: 3, tokenId: null,
    };
    const hash = linkHash(link, h.hash);
    await superuser.query(
      `INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash, link_version, mac)
       VALUES ($1, $2, $3, 'approved', $4, $5, $6, $7, $8, $9::timestamptz, $10, $11, 3, $12)`,
      [link.id, p, link.seq, opened.calculationId, opened.revisionId, reviewer.id, JSON.stringify(reviewer), JSON.stringify(link.data), h.now, hash, h.hash, sha256(hash)],
    );
    await superuser.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'approved', $2, $3)`, [opened.revisionId, link.id, reviewer.id]);
    await superuser.query(`UPDATE chain_heads SET seq = $2, hash = $3 WHERE product_id = $1`, [p, link.seq, hash]);

    const verify = await t.call('GET', `/api/v1/products/${p}/verify`);
    expect(verify.body).toMatchObject({ valid: false, firstBrokenLink: { seq: link.seq, kind: 'event', id: link.id } });
    expect(verify.body.firstBrokenLink.reason).toMatch(/MAC does not verify/);
    expect((await t.call('GET', `/api/v1/revisions/${opened.revisionId}`)).body.review.state).toBe('submitted');
    const mine = (await t.call('GET', '/api/v1/me/revisions')).body.items.find((i: { revisionId: string }) => i.revisionId === opened.revisionId);
    expect(mine).toMatchObject({ state: 'submitted', decidedBy: null, canWithdraw: true });
    const report = await t.call('GET', `/api/v1/revisions/${opened.revisionId}/report.html`);
    expect(report.status).toBe(200);
    expect(report.text).toMatch(/Submitted, awaiting review/);
    expect(report.text).not.toMatch(/Signed checkpoint/);
    const checkpoint = await t.call('POST', `/api/v1/products/${p}/checkpoints`, {});
    expect(checkpoint.status).toBe(409);
    expect(checkpoint.body.firstBrokenLink).toMatchObject({ seq: link.seq, id: link.id });
  });

  it('attack: a sealed-looking approval that breaks the review rules is named by verify (meaning, not only hashes)', async () => {
    // written with the service's own chain writer, as someone holding both the record key and the database would:
    // the hash and the MAC verify, the decision does not (a blocked revision approved by its author)
    const p = await product('FA-3');
    const opened = await open(p, blockedDesign);
    const store = t.app.get(RecordStore);
    const author = { id: t.users.author, name: 'Design author (test)' };
    await superuser.query('BEGIN');
    try {
      // the superuser turns the function's checks off for this one transaction by writing the rows itself, sealed with the key
      const h = await head(superuser, p);
      const link = {
        kind: 'event', id: randomUUID(), productId: p, seq: h.seq + 1, type: 'approved', calculationId: opened.calculationId, revisionId: opened.revisionId,
        actor: author, data: { revision: 1, comment: null, acknowledgements: [], comments: [], signature: { signerId: author.id, printedName: author.name, meaning: 'approved as checking engineer', method: 'password', revisionHash: 'forged' } }, createdAt: h.now, linkVersion: 3, tokenId: null,
      };
      const hash = linkHash(link, h.hash);
      await superuser.query(
        `INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash, link_version, mac)
         VALUES ($1, $2, $3, 'approved', $4, $5, $6, $7, $8, $9::timestamptz, $10, $11, 3, $12)`,
        [link.id, p, link.seq, opened.calculationId, opened.revisionId, author.id, JSON.stringify(author), JSON.stringify(link.data), h.now, hash, h.hash, store.keys.key.linkMac(hash)],
      );
      await superuser.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'approved', $2, $3)`, [opened.revisionId, link.id, author.id]);
      await superuser.query(`UPDATE chain_heads SET seq = $2, hash = $3 WHERE product_id = $1`, [p, link.seq, hash]);
      await superuser.query('COMMIT');
      const verify = await t.call('GET', `/api/v1/products/${p}/verify`);
      expect(verify.body).toMatchObject({ valid: false, firstBrokenLink: { seq: link.seq, kind: 'event', id: link.id } });
      expect(verify.body.firstBrokenLink.reason).toMatch(/without the reviewer role|own author|blocking findings/);
      expect((await t.call('POST', `/api/v1/products/${p}/checkpoints`, {})).status).toBe(409);
    } catch (err) {
      await superuser.query('ROLLBACK').catch(() => undefined);
      throw err;
    }
  });
});

describe('forged products', () => {
  it('attack: registering a product, its revision and an approval as the runtime role is refused by the database', async () => {
    await expect(runtime.query(`INSERT INTO products (id, code, name) VALUES (gen_random_uuid(), 'FORGED-1', 'forged')`)).rejects.toThrow(/permission denied/);
    await expect(runtime.query(`INSERT INTO chain_heads (product_id, seq, hash) VALUES (gen_random_uuid(), 1, 'x')`)).rejects.toThrow(/permission denied/);
    await expect(runtime.query(`INSERT INTO revisions (id) VALUES (gen_random_uuid())`)).rejects.toThrow(/permission denied/);
    await expect(runtime.query(`INSERT INTO calculations (id, product_id, title) SELECT gen_random_uuid(), id, 'x' FROM products LIMIT 1`)).rejects.toThrow(/permission denied/);
    const id = randomUUID();
    const author = { id: t.users.author, name: 'Design author (test)' };
    await expect(
      runtime.query(`SELECT leadline_register_product($1, $2, 'FORGED-1', 'forged', NULL, gen_random_uuid(), $3, NULL, $4, 'x', 'x', 'x')`, [
        sha256(t.tokens.author), id, JSON.stringify(author), JSON.stringify({ code: 'FORGED-1', name: 'forged', description: null }),
      ]),
    ).rejects.toThrow(/no live token/);
    expect((await runtime.query(`SELECT count(*)::int AS n FROM products WHERE code = 'FORGED-1'`)).rows[0].n).toBe(0);
  });

  it('attack: a whole product written around the functions (blocked findings, verdict "clear", approved) is named at its first link and never shown approved', async () => {
    const author = { id: t.users.author, name: 'Design author (test)' };
    const reviewer = { id: t.users.reviewer, name: 'Checking engineer (test)' };
    const real = await open(await product('FP-SRC'), blockedDesign);
    const { rows: [source] } = await superuser.query(`SELECT input::text, normalized::text, evaluation::text, findings::text FROM revisions WHERE id = $1`, [real.revisionId]);
    const ids = { product: randomUUID(), calculation: randomUUID(), revision: randomUUID() };
    const { rows: [{ now }] } = await superuser.query(`SELECT ${TS_TEXT('now()')} AS now`);
    const links: { row: Record<string, unknown>; hash: string }[] = [];
    let previous: string | null = null;
    const add = (record: Record<string, unknown>) => {
      const hash = linkHash(record, previous);
      links.push({ row: record, hash });
      previous = hash;
      return hash;
    };
    const base = { productId: ids.product, createdAt: now, linkVersion: 3, tokenId: null };
    add({ ...base, kind: 'event', id: randomUUID(), seq: 1, type: 'product-registered', calculationId: null, revisionId: null, actor: author, data: { code: 'FP-1', name: 'forged', description: null } });
    add({ ...base, kind: 'event', id: randomUUID(), seq: 2, type: 'calculation-opened', calculationId: ids.calculation, revisionId: null, actor: author, data: { title: 'forged screw' } });
    const revisionHash = add({
      ...base, kind: 'revision', id: ids.revision, calculationId: ids.calculation, revision: 1, seq: 3, note: null, content: contentDigest(source),
      verdict: 'clear', engineVersion: '1.1.0', ruleSetVersion: DEFAULT_RULE_SET.version, author,
    });
    add({ ...base, kind: 'event', id: randomUUID(), seq: 4, type: 'revision-submitted', calculationId: ids.calculation, revisionId: ids.revision, actor: author, data: { note: null, revision: 1, revisionHash, verdict: 'clear' } });
    const approval = { ...base, kind: 'event', id: randomUUID(), seq: 5, type: 'approved', calculationId: ids.calculation, revisionId: ids.revision, actor: reviewer, data: { revision: 1, comment: null, acknowledgements: [], comments: [], signature: { signerId: reviewer.id, printedName: reviewer.name, meaning: 'approved as checking engineer', method: 'password', revisionHash: 'forged' } } };
    add(approval);
    await superuser.query(`INSERT INTO products (id, code, name, created_by) VALUES ($1, 'FP-1', 'forged', $2)`, [ids.product, author.id]);
    await superuser.query(`INSERT INTO calculations (id, product_id, title, created_by, created_at) VALUES ($1, $2, 'forged screw', $3, $4::timestamptz)`, [ids.calculation, ids.product, author.id, now]);
    let prev: string | null = null;
    for (const { row, hash } of links) {
      if (row.kind === 'revision') {
        await superuser.query(
          `INSERT INTO revisions (id, calculation_id, product_id, revision, seq, input, normalized, evaluation, findings, verdict, engine_version, rule_set_version,
             author_id, author, created_at, hash, previous_hash, link_version, mac)
           VALUES ($1, $2, $3, 1, 3, $4, $5, $6, $7, 'clear', '1.1.0', $8, $9, $10, $11::timestamptz, $12, $13, 3, $14)`,
          [ids.revision, ids.calculation, ids.product, source.input, source.normalized, source.evaluation, source.findings, DEFAULT_RULE_SET.version, author.id, JSON.stringify(author), now, hash, prev, sha256(hash)],
        );
      } else {
        await superuser.query(
          `INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash, link_version, mac)
           VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10::timestamptz, $11, $12, 3, $13)`,
          [row.id, ids.product, row.seq, row.type, row.calculationId, row.revisionId, (row.actor as { id: string }).id, JSON.stringify(row.actor), JSON.stringify(row.data), now, hash, prev, sha256(hash)],
        );
      }
      prev = hash;
    }
    await superuser.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'approved', $2, $3)`, [ids.revision, approval.id, reviewer.id]);
    await superuser.query(`INSERT INTO chain_heads (product_id, seq, hash) VALUES ($1, 5, $2)`, [ids.product, prev]);

    const verify = await t.call('GET', `/api/v1/products/${ids.product}/verify`);
    expect(verify.body).toMatchObject({ valid: false, firstBrokenLink: { seq: 1, kind: 'event' } });
    expect(verify.body.firstBrokenLink.reason).toMatch(/MAC does not verify/);
    const shown = await t.call('GET', `/api/v1/revisions/${ids.revision}`);
    expect(shown.body.review.state).toBe('submitted');
    const report = await t.call('GET', `/api/v1/revisions/${ids.revision}/report.html`);
    expect(report.text).not.toMatch(/Approved/);
    expect((await t.call('POST', `/api/v1/products/${ids.product}/checkpoints`, {})).status).toBe(409);
  });
});

describe('lone closures', () => {
  it('attack: a closure row on a non-decision event is refused by the database, and the revision stays decidable', async () => {
    const p = await product('LC-1');
    const opened = await open(p, clearDesign);
    const { rows: [submitted] } = await runtime.query(`SELECT id FROM events WHERE revision_id = $1 AND type = 'revision-submitted'`, [opened.revisionId]);
    await expect(
      runtime.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'rejected', $2, $3)`, [opened.revisionId, submitted.id, t.users.reviewer]),
    ).rejects.toThrow(/permission denied/);
    const decided = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'approve' }, { as: 'reviewer' });
    expect(decided.status).toBe(201);
    expect(decided.body.checkpoint).toMatchObject({ seq: decided.body.seq });
  });
});

describe('rule sets', () => {
  const relaxed = {
    ...DEFAULT_RULE_SET,
    version: '2099.01-1',
    thresholds: Object.fromEntries(Object.entries(DEFAULT_RULE_SET.thresholds).map(([k, v]) => [k, typeof v === 'number' ? 0 : v])),
  };

  it('attack: a relaxed rule set and an adoption dated 2099 inserted by the runtime role are refused; the current set stays', async () => {
    await expect(runtime.query(`INSERT INTO rule_sets (version, definition) VALUES ($1, $2)`, [relaxed.version, JSON.stringify(relaxed)])).rejects.toThrow(/permission denied/);
    await expect(
      runtime.query(`INSERT INTO rule_set_adoptions (id, version, adopted_at) VALUES (gen_random_uuid(), $1, '2099-01-01')`, [DEFAULT_RULE_SET.version]),
    ).rejects.toThrow(/permission denied/);
    await expect(runtime.query(`SELECT leadline_store_rule_set($1, $2, $3, false)`, [sha256(t.tokens.admin), relaxed.version, JSON.stringify(relaxed)])).rejects.toThrow(/needs an admin/);
    await expect(
      runtime.query(`SELECT leadline_adopt_rule_set(NULL, gen_random_uuid(), $1, NULL, 1, 'x', 'x', NULL, 'x')`, [DEFAULT_RULE_SET.version]),
    ).rejects.toThrow(/needs an admin/);
    const sets = await t.call('GET', '/api/v1/rule-sets', undefined, { as: 'admin' });
    expect(sets.body.current).toBe(DEFAULT_RULE_SET.version);
    const judged = await t.call('POST', '/api/v1/evaluations', blockedDesign);
    expect(judged.body.verdict).toBe('blocked');
  });

  it('attack: a relaxed rule set adopted around the functions (a chained-looking adoption without a valid MAC) never becomes current', async () => {
    await superuser.query(`INSERT INTO rule_sets (version, definition) VALUES ($1, $2)`, [relaxed.version, JSON.stringify(relaxed)]);
    const [h] = (await superuser.query(`SELECT seq, hash, ${TS_TEXT('now()')} AS now FROM ledger_heads WHERE ledger = 'rule-adoption'`)).rows;
    const record = { kind: 'rule-adoption', id: randomUUID(), version: relaxed.version, adoptedBy: t.users.admin, note: null, seq: Number(h.seq) + 1, createdAt: h.now, linkVersion: 3 };
    const hash = linkHash(record, h.hash || null);
    await superuser.query(
      `INSERT INTO rule_set_adoptions (id, version, adopted_by, adopted_at, seq, hash, previous_hash, mac) VALUES ($1, $2, $3, $4::timestamptz, $5, $6, $7, $8)`,
      [record.id, relaxed.version, t.users.admin, h.now, record.seq, hash, h.hash || null, sha256(hash)],
    );
    await superuser.query(`UPDATE ledger_heads SET seq = $1, hash = $2 WHERE ledger = 'rule-adoption'`, [record.seq, hash]);
    // the service's periodic refresh of the current set (every ADOPTION_REFRESH_MS), run here at once
    await (t.app.get(RuleSetsService) as unknown as { refreshAdoption(): Promise<void> }).refreshAdoption();
    expect((await t.call('GET', '/api/v1/rule-sets', undefined, { as: 'admin' })).body.current).toBe(DEFAULT_RULE_SET.version);
    expect((await t.call('POST', '/api/v1/evaluations', blockedDesign)).body.verdict).toBe('blocked');
  });

  it('attack: a malformed definition and its adoption written around the functions are skipped and reported, never a 5xx', async () => {
    await superuser.query(`INSERT INTO rule_sets (version, definition) VALUES ('malformed-1', '{"version": "malformed-1", "thresholds": 7}')`);
    await superuser.query(`INSERT INTO rule_set_adoptions (id, version, adopted_at) VALUES (gen_random_uuid(), 'malformed-1', '2099-01-01')`);
    const sets = await t.call('GET', '/api/v1/rule-sets', undefined, { as: 'admin' });
    expect(sets.status).toBe(200);
    expect(sets.body.invalid).toEqual(expect.arrayContaining([expect.objectContaining({ version: 'malformed-1' })]));
    expect(sets.body.items.map((s: { version: string }) => s.version)).not.toContain('malformed-1');
    expect((await t.call('GET', '/api/v1/rule-sets/malformed-1', undefined, { as: 'admin' })).status).toBe(422);
    // the next refresh of the current set (here: an admin's adoption) skips the malformed latest adoption
    const adopted = await t.call('POST', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}/adopt`, { note: 'the real set' }, { as: 'admin' });
    expect(adopted.status).toBe(200);
    expect(adopted.body.current).toBe(DEFAULT_RULE_SET.version);
    const judged = await t.call('POST', '/api/v1/evaluations', warningDesign);
    expect(judged.status).toBe(200);
    expect(judged.body.verdict).toBe('needs-acknowledgement');
    const search = await t.call('POST', '/api/v1/sizing', { requirements: LEAD_SCREW });
    expect(search.status).toBeLessThan(500);
  });
});

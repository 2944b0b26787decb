/**
 * The record store through HTTP on real databases: PostgreSQL and embedded PGlite run the same suite.
 */
import { changedDesign } from '../support/designs';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { prepareSubmission, RecordStore } from '../../apps/api/src/records/record-store';
import { BACKENDS, countRecords, startTestApp, type TestApp } from '../support/harness';

const design = JSON.parse(readFileSync(join(__dirname, '../fixtures/ok/trapezoidal-jack.json'), 'utf8'));
const badDesign = JSON.parse(readFileSync(join(__dirname, '../fixtures/not-ok/pitch-in-megapascals.json'), 'utf8'));

describe.each(BACKENDS)('records on %s', (backend) => {
  let t: TestApp;
  let productId: string;

  beforeAll(async () => {
    t = await startTestApp(backend);
    const res = await t.call('POST', '/api/v1/products', { code: 'HX-1', name: 'Hexmoor HX-1 lift table (test product)' });
    expect(res.status).toBe(201);
    productId = res.body.id;
  });
  afterAll(() => t?.close());

  async function open(title = 'lift screw', body: unknown = { title, design }) {
    return t.call('POST', `/api/v1/products/${productId}/calculations`, body);
  }

  it('stores revision 1 and reads back the input exactly as submitted [POST /api/v1/products/:id/calculations]', async () => {
    const res = await open();
    expect(res.status).toBe(201);
    expect(res.body.revision).toBe(1);
    const rev = await t.call('GET', `/api/v1/revisions/${res.body.revisionId}`);
    expect(rev.status).toBe(200);
    expect(JSON.stringify(rev.body.input)).toBe(JSON.stringify(design));
    const stateless = await t.call('POST', '/api/v1/evaluations?trace=true', design);
    const { verdict, ruleSetVersion, checks, governing, ...statelessEvaluation } = stateless.body;
    expect(rev.body.evaluation).toEqual(statelessEvaluation);
    expect({ checks: rev.body.checks, governing: rev.body.governing }).toEqual({ checks, governing });
    expect(rev.body.verdict).toBe(verdict);
    expect(rev.body.findings).toEqual(stateless.body.findings);
    expect(rev.body.engineVersion).toBe(stateless.body.engineVersion);
    expect(rev.body.ruleSetVersion).toBe(stateless.body.ruleSetVersion);
    expect(rev.body.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(rev.body.normalized.thread.majorDiameter).toBeCloseTo(0.04, 12); // Tr 40x7: d = 40 mm (ISO 2904 designation)
  });

  it('numbers revisions contiguously [POST /api/v1/calculations/:id/revisions]', async () => {
    const first = await open('numbering');
    for (let i = 0; i < 3; i++) {
      const r = await t.call('POST', `/api/v1/calculations/${first.body.calculationId}/revisions`, { design: changedDesign(design, i), note: `change ${i}` });
      expect(r.status).toBe(201);
    }
    const list = await t.call('GET', `/api/v1/calculations/${first.body.calculationId}/revisions`);
    expect(list.body.items.map((r: { revision: number }) => r.revision)).toEqual([1, 2, 3, 4]);
  });

  it('hashes in the database exactly as verification does, whatever the note contains', async () => {
    const first = await open('awkward notes');
    const note = 'quote " backslash \\ tab \t newline \n control \u0001 \u001f DEL \u007f slash / \u2028 é 😀 日本';
    const r = await t.call('POST', `/api/v1/calculations/${first.body.calculationId}/revisions`, { design: changedDesign(design, 'notes'), note });
    expect(r.status).toBe(201);
    expect((await t.call('GET', `/api/v1/revisions/${r.body.revisionId}`)).body.note).toBe(note);
    expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body).toMatchObject({ valid: true, firstBrokenLink: null });
  });

  it('lands 50 concurrent submissions with contiguous revision numbers', async () => {
    const first = await open('concurrency');
    const results = await Promise.all(
      Array.from({ length: 50 }, (_, i) => t.call('POST', `/api/v1/calculations/${first.body.calculationId}/revisions`, { design: changedDesign(design, i), note: `burst ${i}` })),
    );
    expect(results.map((r) => r.status)).toEqual(Array(50).fill(201));
    const numbers = results.map((r) => r.body.revision).sort((a, b) => a - b);
    expect(numbers).toEqual(Array.from({ length: 50 }, (_, i) => i + 2));
    const list = await t.call('GET', `/api/v1/calculations/${first.body.calculationId}/revisions`);
    expect(list.body.items.map((r: { revision: number }) => r.revision)).toEqual(Array.from({ length: 51 }, (_, i) => i + 1));
    expect(new Set(list.body.items.map((r: { note: string }) => r.note)).size).toBe(51);
    const verify = await t.call('GET', `/api/v1/products/${productId}/verify`);
    expect(verify.body.valid).toBe(true);
  });

  it('refuses UPDATE, DELETE and TRUNCATE of records in the database itself', async () => {
    const r = await open('immutability');
    for (const sql of [
      `UPDATE revisions SET note = 'edited' WHERE id = '${r.body.revisionId}'`,
      `DELETE FROM revisions WHERE id = '${r.body.revisionId}'`,
      `UPDATE events SET data = '{}' WHERE revision_id = '${r.body.revisionId}'`,
      `DELETE FROM events WHERE revision_id = '${r.body.revisionId}'`,
      `TRUNCATE revisions CASCADE`,
      `UPDATE products SET name = 'renamed' WHERE id = '${productId}'`,
    ]) {
      await expect(t.db.query(sql)).rejects.toThrow(/records are immutable/);
    }
    const rev = await t.call('GET', `/api/v1/revisions/${r.body.revisionId}`);
    expect(rev.body.note).toBeNull();
    // the chain head may only move forward, and never disappear
    await expect(t.db.query(`DELETE FROM chain_heads WHERE product_id = $1`, [productId])).rejects.toThrow(/not allowed/);
    await expect(t.db.query(`UPDATE chain_heads SET seq = seq - 1 WHERE product_id = $1`, [productId])).rejects.toThrow(/only moves forward/);
    await expect(t.db.query(`TRUNCATE chain_heads CASCADE`)).rejects.toThrow(/immutable/);
    expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body.valid).toBe(true);
  });

  it('refuses a revision number that is not the next one', async () => {
    const r = await open('gap');
    await expect(
      t.db.query(
        `INSERT INTO revisions (id, calculation_id, product_id, revision, seq, input, normalized, evaluation, findings, verdict, engine_version, rule_set_version, created_at, hash)
         SELECT gen_random_uuid(), calculation_id, product_id, 3, 999999, input, normalized, evaluation, findings, verdict, engine_version, rule_set_version, now(), 'x'
           FROM revisions WHERE id = $1`,
        [r.body.revisionId],
      ),
    ).rejects.toThrow(/not contiguous/);
  });

  it('verifies the chain and names a tampered row written with the trigger disabled [GET /api/v1/products/:id/verify]', async () => {
    const ok = await t.call('GET', `/api/v1/products/${productId}/verify`);
    expect(ok.body).toMatchObject({ valid: true, firstBrokenLink: null });
    const r = await open('tamper target');
    const before = await t.call('GET', `/api/v1/products/${productId}/verify`);
    expect(before.body.valid).toBe(true);
    await t.db.query(`ALTER TABLE revisions DISABLE TRIGGER revisions_immutable`);
    await t.db.query(`UPDATE revisions SET evaluation = jsonb_set(evaluation::jsonb, '{torque,raise,atMaxFriction}', '1.0')::json WHERE id = $1`, [r.body.revisionId]);
    await t.db.query(`ALTER TABLE revisions ENABLE TRIGGER revisions_immutable`);
    const after = await t.call('GET', `/api/v1/products/${productId}/verify`);
    expect(after.body.valid).toBe(false);
    expect(after.body.firstBrokenLink).toMatchObject({ kind: 'revision', id: r.body.revisionId, reason: 'content does not match its hash' });
  });

  it('returns the first result for a retried submission with the same Idempotency-Key', async () => {
    const other = await t.call('POST', '/api/v1/products', { code: `IDEM-${backend}`, name: 'idempotency product' });
    const url = `/api/v1/products/${other.body.id}/calculations`;
    const body = { title: 'retry me', design };
    const first = await t.call('POST', url, body, { headers: { 'idempotency-key': 'k-123' } });
    const before = await countRecords(t.db);
    const again = await t.call('POST', url, body, { headers: { 'idempotency-key': 'k-123' } });
    expect(again.status).toBe(201);
    expect(again.body).toEqual(first.body);
    expect(await countRecords(t.db)).toEqual(before);
    const changed = await t.call('POST', url, { title: 'something else', design }, { headers: { 'idempotency-key': 'k-123' } });
    expect(changed.status).toBe(422);
    expect(await countRecords(t.db)).toEqual(before);
  });

  it('answers invalid input with problem+json naming the fields and stores nothing', async () => {
    const before = await countRecords(t.db);
    const res = await open('bad', { title: 'bad', design: badDesign });
    expect(res.status).toBe(422);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain('design.thread.pitch');
    const missing = await open('bad', { design });
    expect(missing.body.errors.map((e: { path: string }) => e.path)).toContain('title');
    const product = await t.call('POST', '/api/v1/products', { name: 'no code' });
    expect(product.status).toBe(422);
    expect(product.body.errors[0].path).toBe('code');
    const malformed = await t.call('POST', '/api/v1/products', '{"code": ', { headers: { 'content-type': 'application/json' } });
    expect(malformed.status).toBe(400);
    expect(await countRecords(t.db)).toEqual(before);
  });

  it('answers 413 for an oversized body and 404 for unknown ids', async () => {
    const huge = { title: 'x'.repeat(300 * 1024), design };
    const res = await open('huge', huge);
    expect(res.status).toBe(413);
    expect(res.headers['content-type']).toMatch(/problem\+json/);
    const missing = await t.call('GET', '/api/v1/revisions/00000000-0000-4000-8000-000000000000');
    expect(missing.status).toBe(404);
    const notUuid = await t.call('GET', '/api/v1/calculations/not-a-uuid');
    expect(notUuid.status).toBe(404);
  });

  it('answers 404 naming the calculation for a revision of one that does not exist, and files no revision under another product', async () => {
    const before = await countRecords(t.db);
    const unknown = '00000000-0000-4000-8000-000000000001';
    const res = await t.call('POST', `/api/v1/calculations/${unknown}/revisions`, { design });
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/problem\+json/);
    expect(res.body.detail).toContain(`calculation ${unknown}`);
    // The append reads the product from the calculation; a caller naming another product is refused
    const mine = await open('product guard');
    const other = await t.call('POST', '/api/v1/products', { code: `GUARD-${backend}`, name: 'another product' });
    const after = await countRecords(t.db);
    const s = prepareSubmission({ input: {}, normalized: {}, evaluation: {}, findings: [], verdict: 'clear', engineVersion: 'e', ruleSetVersion: DEFAULT_RULE_SET.version, note: null });
    await expect(t.app.get(RecordStore).appendRevision(t.db, other.body.id, mine.body.calculationId, s, null)).rejects.toMatchObject({ status: 404 });
    expect(await countRecords(t.db)).toEqual(after);
    expect(after.revisions).toBe(before.revisions + 1);
  });

  it('lists products with paging and serves the library and health', async () => {
    const page = await t.call('GET', '/api/v1/products?limit=1&offset=0');
    expect(page.body.items).toHaveLength(1);
    expect(page.body.total).toBeGreaterThanOrEqual(2);
    const sizes = await t.call('GET', '/api/v1/thread-sizes?form=trapezoidal');
    // ISO 2904 Tr 40x7: d = 40 mm, P = 7 mm (the designation states both)
    const tr40 = sizes.body.items.find((s: { designation: string }) => s.designation === 'Tr 40x7');
    expect(tr40).toMatchObject({ form: 'trapezoidal', majorDiameter: 0.04, pitch: 0.007 });
    expect(sizes.body.items.every((s: { form: string }) => s.form === 'trapezoidal')).toBe(true);
    const friction = await t.call('GET', '/api/v1/friction-sources');
    expect(friction.body.items.every((e: { source: { reference: string } }) => e.source.reference.length > 0)).toBe(true);
    const health = await t.call('GET', '/health');
    expect(health.body.status).toBe('ok');
    const docs = await t.call('GET', '/api/docs-json');
    const schema = docs.body.paths['/api/v1/evaluations'].post.requestBody.content['application/json'].schema;
    expect(schema.properties.thread).toMatchObject({ type: 'object' });
    expect(schema.properties.thread.required).toEqual(['form']);
    expect(schema.required).toEqual(expect.arrayContaining(['thread', 'load', 'friction', 'collar', 'nut', 'screw', 'duty']));
  });
});

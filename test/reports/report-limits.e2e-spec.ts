/**
 * Bounded work per request and per record, written as the attacks:
 * - flood a revision with comments: the comment rate is limited (429 with Retry-After), and a revision that holds
 *   1,000 comments anyway (limits raised) still renders its PDF, printing the record up to a bound and pointing to
 *   the audit download for the rest;
 * - flood the PDF route: the queue has a length limit (503 problem+json with Retry-After when full), and a client
 *   that disconnects while queued has its work cancelled;
 * - building a report's HTML and charts yields to the event loop between steps.
 */
import { request as httpRequest } from 'node:http';
import { PdfRenderer } from '../../apps/api/src/infra/pdf/browser-pool';
import { ReportInputService } from '../../apps/api/src/reports/report-input.service';
import { ReportRenderer } from '../../apps/api/src/reports/report-renderer';
import { changedDesign, warningDesign } from '../support/designs';
import { countRecords, startTestApp, type TestApp } from '../support/harness';
import { pdfText } from '../support/pdf-text';
import { appendComments } from '../support/seed-records';

async function openRevision(t: TestApp, code: string) {
  const product = (await t.call('POST', '/api/v1/products', { code, name: `${code} (test product)` })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: `${code} calc`, design: warningDesign });
  return { product, calculation: opened.body.calculationId as string, revision: opened.body.revisionId as string };
}

describe('comment rate limits', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp('postgres', { LEADLINE_COMMENTS_PER_REVISION_PER_MINUTE: '5', LEADLINE_COMMENTS_PER_USER_PER_MINUTE: '8' });
  });
  afterAll(() => t?.close());

  it('limits comments per revision per minute: 429 with Retry-After, nothing stored [POST /api/v1/revisions/:id/comments]', async () => {
    const { revision } = await openRevision(t, 'CR-1');
    for (let i = 0; i < 5; i++) expect((await t.call('POST', `/api/v1/revisions/${revision}/comments`, { text: `comment ${i}` })).status).toBe(201);
    const before = await countRecords(t.db);
    const refused = await t.call('POST', `/api/v1/revisions/${revision}/comments`, { text: 'one too many' });
    expect(refused.status).toBe(429);
    expect(refused.headers['content-type']).toMatch(/application\/problem\+json/);
    const retry = Number(refused.headers['retry-after']);
    expect(retry).toBeGreaterThanOrEqual(1);
    expect(retry).toBeLessThanOrEqual(60);
    expect(refused.body.detail).toMatch(/this revision/);
    // the limit is the revision's: another user is refused on it too
    expect((await t.call('POST', `/api/v1/revisions/${revision}/comments`, { text: 'me too' }, { as: 'reviewer' })).status).toBe(429);
    expect(await countRecords(t.db)).toEqual(before);
  });

  it('limits comments per user per minute over all revisions; other users are unaffected', async () => {
    const a = await openRevision(t, 'CR-2');
    const b = await openRevision(t, 'CR-3');
    // the author wrote 5 above; 3 more reach the user limit of 8
    for (let i = 0; i < 3; i++) expect((await t.call('POST', `/api/v1/revisions/${a.revision}/comments`, { text: `more ${i}` })).status).toBe(201);
    const refused = await t.call('POST', `/api/v1/revisions/${b.revision}/comments`, { text: 'elsewhere' });
    expect(refused.status).toBe(429);
    expect(refused.body.detail).toMatch(/you have written 8 comments/);
    expect(Number(refused.headers['retry-after'])).toBeGreaterThanOrEqual(1);
    expect((await t.call('POST', `/api/v1/revisions/${b.revision}/comments`, { text: 'the checker may' }, { as: 'reviewer' })).status).toBe(201);
  });
});

describe('a revision with 1,000 comments, and the PDF queue', () => {
  let t: TestApp;
  let ids: Awaited<ReturnType<typeof openRevision>>;
  const COMMENTS = 1000;
  beforeAll(async () => {
    t = await startTestApp(
      'postgres',
      { LEADLINE_COMMENTS_PER_REVISION_PER_MINUTE: '5000', LEADLINE_COMMENTS_PER_USER_PER_MINUTE: '5000', LEADLINE_PDF_QUEUE_LIMIT: '1' },
      undefined,
      { listen: true },
    );
    ids = await openRevision(t, 'CM-1');
    const long = 'This comment is long on purpose. '.repeat(30);
    // the first ten through the route itself, the rest through the same record functions in one transaction
    for (let i = 0; i < 10; i++) {
      const res = await t.call('POST', `/api/v1/revisions/${ids.revision}/comments`, { text: `Comment number ${i + 1}. ${long}` }, { as: i % 2 ? 'reviewer' : 'author' });
      expect(res.status).toBe(201);
    }
    await appendComments(t, ids.revision, Array.from({ length: COMMENTS - 10 }, (_, k) => ({ text: `Comment number ${k + 11}. ${long}`, as: (k + 10) % 2 ? 'reviewer' as const : 'author' as const })));
    expect((await t.call('GET', `/api/v1/products/${ids.product}/verify`)).body.valid).toBe(true);
    const decided = await t.call('POST', `/api/v1/revisions/${ids.revision}/decisions`, { decision: 'reject', comment: 'Rejected after the long discussion: friction must be tested.' }, { as: 'reviewer' });
    expect(decided.status).toBe(201);
  }, 300_000);
  afterAll(() => t?.close());

  it('renders the PDF: the review record in full up to the bound, the rest counted and pointed to the audit download', async () => {
    const res = await t.call('GET', `/api/v1/revisions/${ids.revision}/report.pdf`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const { text } = await pdfText(res.raw);
    expect(text).toContain('Comment number 1.');
    expect(text).toContain('Comment number 50.');
    expect(text).not.toContain('Comment number 51.');
    expect(text).toContain('950 further comments on this revision');
    expect(text).toContain(`/api/v1/products/${ids.product}/audit`);
    // the decision comes after all the comments and is printed all the same
    expect(text).toContain('Rejected after the long discussion');
    // every comment is still in the record the audit download reads
    const [stored] = await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM events WHERE revision_id = $1 AND type = 'comment'`, [ids.revision]);
    expect(Number(stored.n)).toBe(COMMENTS);
  });

  it('answers 503 problem+json with Retry-After when the PDF queue is full, and cancels a queued request whose client disconnected', async () => {
    const pdf = t.app.get(PdfRenderer);
    // occupy both pages (the pool holds 2) until released
    const gates: (() => void)[] = [];
    const held = [0, 1].map(() => pdf.withPage(() => new Promise<void>((release) => gates.push(release))));
    while (gates.length < 2) await new Promise((r) => setTimeout(r, 10));
    // one client waits in the queue (its limit is 1) over a real socket
    const url = new URL(`${t.baseUrl}/api/v1/revisions/${ids.revision}/report.pdf`);
    const waiting = httpRequest(url, { headers: { authorization: `Bearer ${t.tokens.author}` } });
    waiting.on('error', () => undefined);
    waiting.end();
    while (pdf.queued < 1) await new Promise((r) => setTimeout(r, 10));
    // the next one finds the queue full
    const refused = await t.call('GET', `/api/v1/revisions/${ids.revision}/report.pdf`);
    expect(refused.status).toBe(503);
    expect(refused.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(Number(refused.headers['retry-after'])).toBeGreaterThanOrEqual(1);
    expect(refused.body).toMatchObject({ status: 503, title: 'PDF rendering busy' });
    // /health is served meanwhile
    expect((await t.call('GET', '/health', undefined, { as: 'anonymous' })).status).toBe(200);
    // the waiting client goes away: its work leaves the queue without being rendered
    const cancelledBefore = pdf.cancelled;
    waiting.destroy();
    while (pdf.queued > 0) await new Promise((r) => setTimeout(r, 10));
    expect(pdf.cancelled).toBe(cancelledBefore + 1);
    for (const release of gates) release();
    await Promise.all(held);
    expect((await t.call('GET', `/api/v1/revisions/${ids.revision}/report.pdf`)).status).toBe(200);
  });

  it('lists a bounded window of a long revision history and counts the rest [GET /api/v1/revisions/:id/report.html]', async () => {
    const long = await openRevision(t, 'CM-2');
    const revisionIds = [long.revision];
    for (let i = 2; i <= 60; i++) {
      const res = await t.call('POST', `/api/v1/calculations/${long.calculation}/revisions`, { design: changedDesign(warningDesign, i), note: `revision ${i}` });
      expect(res.status).toBe(201);
      revisionIds.push(res.body.revisionId);
    }
    const html = (await t.call('GET', `/api/v1/revisions/${revisionIds[29]}/report.html`)).text;
    const history = html.slice(html.indexOf('<table class="history">'), html.indexOf('</table>', html.indexOf('<table class="history">')));
    const listed = [...history.matchAll(/<td class="num">(\d+)/g)].map((m) => Number(m[1]));
    // revision 30 of 60: 25 on each side (5..55), the others counted (4 earlier, 5 later)
    expect(listed).toEqual(Array.from({ length: 51 }, (_, i) => i + 5));
    expect(html).toContain('Not listed: 4 earlier and 5 later revisions');
    expect(html).toContain(`/api/v1/calculations/${long.calculation}/revisions`);
    const first = (await t.call('GET', `/api/v1/revisions/${revisionIds[0]}/report.html`)).text;
    expect(first).toContain('Not listed: 0 earlier and 34 later revisions');
  });

  it('builds the report in steps that let the event loop run between them', async () => {
    const input = await t.app.get(ReportInputService).forRevision(ids.revision);
    let ticks = 0;
    let done = false;
    const tick = () => {
      ticks++;
      if (!done) setImmediate(tick);
    };
    setImmediate(tick);
    const rendered = await t.app.get(ReportRenderer).render(input);
    done = true;
    expect(rendered.html).toContain('950 further comments');
    // the render yields before building the view, between the view and each chart, and before the HTML
    expect(ticks).toBeGreaterThanOrEqual(6);
  });
});

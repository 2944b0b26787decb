/**
 * The reviewer pages in real Chromium against the real service on real PostgreSQL: sign-in, queue, one revision
 * with its report and a warning, a refused and then an accepted approval, the audit trail with its chain check,
 * downloads, the four-eyes refusal, the signature at the decision, sign-in through the sign-in page and sign-out,
 * and where credentials may (an HttpOnly session cookie) and may not (URL, script storage, log) go. The run's one browser, in a context of this file's own; screenshots with ARTIFACTS=1.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Writable } from 'node:stream';
import type { CDPSession, Frame, Page } from 'puppeteer-core';
import { CAUTION_TEXT } from '../../apps/api/src/reports/report-model';
import { screenshot } from '../support/artifacts';
import { seriousViolations } from '../support/axe';
import { testBrowser, type TestBrowser } from '../support/browser';
import { fitsWidth } from '../support/page-checks';
import { clearDesign, warningDesign } from '../support/designs';
import { startPagesApp, type PagesApp } from './pages-app';

const WARNING = 'friction-source-assumed';
// Markup in a stored name must come out as text, never as elements.
const PRODUCT_NAME = 'Kestrel KL-8 vehicle lift <img src=x> (test product)';

const logLines: string[] = [];
const capture = new Writable({
  write(chunk, _enc, done) {
    logLines.push(String(chunk));
    done();
  },
});

let t: PagesApp;
let browser: TestBrowser;
let productId: string;
let revisionId: string; // the warning design, authored by the author
let ownRevisionId: string; // a clear design authored by the checker who also designs
const visitedUrls: string[] = [];
const documentHeaders: { url: string; csp: string | undefined }[] = [];
const consoleProblems: string[] = [];
const downloadDirs: string[] = [];

/** A tab that records every URL it requests or navigates to, the CSP of each page, and console errors. */
async function newTab(): Promise<Page> {
  const page = await browser.newPage();
  page.on('request', (r) => visitedUrls.push(r.url()));
  page.on('framenavigated', (f) => visitedUrls.push(f.url()));
  page.on('response', (r) => {
    if (r.request().resourceType() === 'document') documentHeaders.push({ url: r.url(), csp: r.headers()['content-security-policy'] });
  });
  page.on('console', (m) => {
    if (m.type() === 'error' || /Content Security Policy/i.test(m.text())) consoleProblems.push(m.text());
  });
  page.on('pageerror', (e) => consoleProblems.push(String(e)));
  return page;
}

/** Signs in on the sign-in page the app sent this tab to, and waits for the page it came from. */
async function signIn(page: Page, who: 'reviewer' | 'checkerAuthor'): Promise<void> {
  await page.waitForSelector('#sign-in-form');
  await page.type('#email-input', t.accounts[who].email);
  await page.type('#password-input', t.accounts[who].password);
  await Promise.all([page.waitForNavigation(), page.click('#sign-in-form button[type=submit]')]);
  await page.waitForSelector('#content:not([hidden])');
}

const text = (page: Page | Frame, selector: string) => page.$eval(selector, (e) => (e as HTMLElement).innerText);

/** Downloads land in a fresh folder; resolves with the file's bytes once Chromium reports it complete. */
async function downloadsTo(page: Page): Promise<{ cdp: CDPSession; dir: string; next(): Promise<{ name: string; bytes: Buffer }> }> {
  const dir = mkdtempSync(join(tmpdir(), 'leadline-pages-'));
  downloadDirs.push(dir);
  const cdp = await page.createCDPSession();
  await cdp.send('Browser.setDownloadBehavior', { behavior: 'allowAndName', downloadPath: dir, eventsEnabled: true, browserContextId: page.browserContext().id });
  return {
    cdp,
    dir,
    next: () =>
      new Promise((resolve, reject) => {
        let suggested = '';
        const begin = (e: { suggestedFilename: string }) => (suggested = e.suggestedFilename);
        const progress = (e: { guid: string; state: string }) => {
          if (e.state === 'inProgress') return;
          cdp.off('Browser.downloadWillBegin', begin);
          cdp.off('Browser.downloadProgress', progress);
          if (e.state !== 'completed') return reject(new Error(`download ${e.state}`));
          resolve({ name: suggested, bytes: readFileSync(join(dir, e.guid)) });
        };
        cdp.on('Browser.downloadWillBegin', begin);
        cdp.on('Browser.downloadProgress', progress);
      }),
  };
}

beforeAll(async () => {
  t = await startPagesApp({ LOG_LEVEL: 'info', LEADLINE_CHROMIUM_PATH: '/usr/bin/chromium' }, capture);
  productId = (await t.call('POST', '/api/v1/products', { code: 'KL-8', name: PRODUCT_NAME })).body.id;
  revisionId = (await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Column screw', design: warningDesign })).body.revisionId;
  ownRevisionId = (await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Platform screw', design: clearDesign }, 'checkerAuthor')).body.revisionId;
  // enough comments that the trail needs a second page (the page loads 25 entries at a time)
  for (let i = 1; i <= 20; i++) {
    expect((await t.call('POST', `/api/v1/revisions/${revisionId}/comments`, { text: `Checked sheet ${i} of the drawing set.` }, 'reviewer')).status).toBe(201);
  }
  browser = await testBrowser();
});

afterAll(async () => {
  await browser?.close();
  for (const dir of downloadDirs) rmSync(dir, { recursive: true, force: true });
  await t?.close();
});

it('serves the page shells without data, with a strict Content-Security-Policy and the safety caution [GET /review/**]', async () => {
  for (const path of ['/review', `/review/revisions/${revisionId}`, `/review/products/${productId}/audit`]) {
    const res = await fetch(t.baseUrl + path);
    const html = await res.text();
    expect({ path, status: res.status, type: res.headers.get('content-type') }).toEqual({ path, status: 200, type: 'text/html; charset=utf-8' });
    const csp = res.headers.get('content-security-policy') ?? '';
    for (const directive of ["default-src 'self'", "script-src 'self'", "img-src 'self' data:", "frame-src 'none'", "font-src 'none'", "form-action 'none'"]) {
      expect(csp).toContain(directive);
    }
    expect(csp).toMatch(/style-src 'self'( 'nonce-[0-9a-f]{32}')?;/);
    expect(csp).not.toMatch(/unsafe-inline|unsafe-eval|https?:/);
    expect(res.headers.get('referrer-policy')).toBe('no-referrer');
    expect(html).not.toContain('KL-8'); // data comes from the API, never with the shell
    expect(html).not.toMatch(/<style|style=|<script>|https?:\/\//);
    for (const sentence of CAUTION_TEXT) expect(html).toContain(sentence);
  }
  const nonces = await Promise.all([1, 2].map(async () => (await fetch(`${t.baseUrl}/review/revisions/${revisionId}`)).headers.get('content-security-policy')));
  expect(nonces[0]).not.toBe(nonces[1]); // a fresh nonce per response
  for (const name of ['lib-api.js', 'lib-dom.js', 'lib-problem.js', 'lib-format.js', 'lib-session.js', 'review-queue.js', 'review-revision.js', 'review-remarks.js', 'review-audit.js']) {
    const script = await fetch(`${t.baseUrl}/review/assets/${name}`);
    expect(script.headers.get('content-type')).toBe('text/javascript; charset=utf-8');
    expect(await script.text()).not.toMatch(/innerHTML|insertAdjacentHTML|document\.write|localStorage|document\.cookie/);
  }
  expect((await fetch(`${t.baseUrl}/review/assets/review.css`)).headers.get('content-type')).toBe('text/css; charset=utf-8');
  expect((await fetch(`${t.baseUrl}/review/assets/app.js`)).status).toBe(404);
  expect((await fetch(`${t.baseUrl}/review/revisions/not-a-uuid`)).status).toBe(404);
});

it('lets a checking engineer sign in, find the revision in the queue, read its report, and approve it once the warning is acknowledged [POST /api/v1/revisions/:id/decisions]', async () => {
  const page = await newTab();
  await page.goto(`${t.baseUrl}/review`);
  // no session: the page sends the tab to the sign-in page, which will bring it back here
  await page.waitForSelector('#sign-in-form');
  expect(page.url()).toBe(`${t.baseUrl}/sign-in?next=${encodeURIComponent('/review')}`);
  expect(await seriousViolations(page)).toEqual([]);
  await page.type('#email-input', t.accounts.reviewer.email);
  await page.type('#password-input', 'not the password of anyone');
  await page.click('#sign-in-form button[type=submit]');
  await page.waitForSelector('#sign-in-problem .problem');
  expect(await text(page, '#sign-in-problem')).toMatch(/Sign-in refused[\s\S]*HTTP 401/);
  expect(await page.$eval('#password-input', (e) => (e as HTMLInputElement).value)).toBe('');
  await page.$eval('#email-input', (e) => ((e as HTMLInputElement).value = ''));
  await signIn(page, 'reviewer');
  expect(page.url()).toBe(`${t.baseUrl}/review`);

  // the queue, oldest first
  await page.waitForSelector(`#queue tr[data-revision="${revisionId}"]`);
  const rows = await page.$$eval('#queue tbody tr', (trs) => trs.map((tr) => ({ id: tr.getAttribute('data-revision'), cells: Array.from(tr.cells).map((c) => c.innerText) })));
  expect(rows.map((r) => r.id)).toEqual([revisionId, ownRevisionId]);
  expect(rows[0].cells[0]).toContain('KL-8');
  expect(rows[0].cells[0]).toContain('<img src=x>');
  expect(rows[0].cells.slice(1, 4)).toEqual(['Column screw', '1', 'Needs acknowledgement']);
  expect(rows[0].cells[4]).toMatch(/0 blocking\s*1 warning/);
  expect(rows[0].cells[5]).toBe('Design author (test)');
  expect(await page.$$eval('main img', (imgs) => imgs.length)).toBe(0);
  expect(await fitsWidth(page)).toBe(true);
  await screenshot(page, 'review/pages-queue', { fullPage: true });
  expect(await seriousViolations(page)).toEqual([]);

  // one revision: header, report in its frame, findings
  await Promise.all([page.waitForNavigation(), page.click(`#queue tr[data-revision="${revisionId}"] a[href$="${revisionId}"]`)]);
  expect(page.url()).toBe(`${t.baseUrl}/review/revisions/${revisionId}`);
  await page.waitForSelector('#revision:not([hidden])');
  expect(await text(page, '#revision-heading')).toBe('KL-8 · Column screw · revision 1');
  const header = await text(page, '#revision-header');
  expect(header).toContain(PRODUCT_NAME);
  expect(header).toMatch(/Review state\s+Awaiting review/);
  expect(header).toMatch(/Author\s+Design author \(test\)/);
  const record = (await t.call('GET', `/api/v1/revisions/${revisionId}`)).body;
  expect(header).toContain(record.hash);
  // the report in the page itself, at the main column's full width, as the service rendered it for this page
  await page.waitForSelector('#report-body .report-doc h2');
  expect(await text(page, '#report-body')).toContain('Column screw');
  // the report's own styles apply inside its box only: the service put the page's nonce on its <style>, its rules are
  // nested under .report-doc (the page's own headings keep the page's look), its column widths are classes of that
  // style block (no style attribute, which the page's policy would refuse), its ids are prefixed, and nothing in it runs
  const styled = await page.evaluate(() => {
    const box = document.getElementById('report-body')!;
    const main = document.querySelector('main')!;
    const reportH2 = box.querySelector('h2')!;
    const pageH2 = document.getElementById('findings-heading')!;
    return {
      nonce: box.querySelector('style')!.nonce === document.querySelector<HTMLMetaElement>('meta[name="leadline-style-nonce"]')!.content,
      reportH2Size: getComputedStyle(reportH2).fontSize,
      pageH2Size: getComputedStyle(pageH2).fontSize,
      widths: Array.from(box.querySelectorAll('col[class^="w"]')).filter((c) => parseFloat(getComputedStyle(c).width) > 0).length,
      styleAttributes: box.querySelectorAll('[style]').length,
      scripts: box.querySelectorAll('script').length,
      unprefixedIds: Array.from(box.querySelectorAll('[id]')).filter((e) => !e.id.startsWith('report-')).map((e) => e.id),
      fullWidth: Math.abs(box.getBoundingClientRect().width - (main.clientWidth - parseFloat(getComputedStyle(main).paddingLeft) - parseFloat(getComputedStyle(main).paddingRight))) <= 1,
    };
  });
  expect(styled).toEqual({ nonce: true, reportH2Size: expect.any(String), pageH2Size: expect.any(String), widths: expect.any(Number), styleAttributes: 0, scripts: 0, unprefixedIds: [], fullWidth: true });
  expect(styled.reportH2Size).not.toBe(styled.pageH2Size);
  expect(styled.widths).toBeGreaterThan(10);
  expect(await page.$('iframe')).toBeNull();
  // revision 1 changes nothing against an earlier one: the comment list offers every input as entered, by its label
  await page.waitForSelector('#comment-target optgroup[label="Inputs"] option[value="field:load.axial"]');
  expect(await text(page, '#comment-target option[value="field:load.axial"]')).toBe(
    `Input: Axial load (${record.input.load.axial})`,
  );
  const warning = await text(page, `#findings li[data-rule="${WARNING}"]`);
  expect(warning).toMatch(/^Warning/);
  expect(warning).toContain('assumed');

  // the PDF report, fetched with the token and saved from a blob: address
  const downloads = await downloadsTo(page);
  const pdfDone = downloads.next();
  await page.click('#download-pdf');
  const pdf = await pdfDone;
  expect(pdf.name).toBe('KL-8-Column-screw-rev1.pdf');
  expect(pdf.bytes.subarray(0, 5).toString()).toBe('%PDF-');
  expect(await fitsWidth(page)).toBe(true);
  await screenshot(page, 'review/pages-revision', { fullPage: true });
  expect(await seriousViolations(page)).toEqual([]);

  // no decision is preset; approving without acknowledging the warning is refused at the field, in words, with the focus there
  expect(await page.$$eval('input[name="decision"]:checked', (r) => r.length)).toBe(0);
  await page.click('input[name="decision"][value="approve"]');
  await page.type('#decision-comment', 'Checked at both ends of the friction range.');
  await page.click('#decision-submit');
  await page.waitForSelector('#decision-problem .problem');
  let refusal = await text(page, '#decision-problem');
  expect(refusal).toMatch(/Not recorded: 1 field to complete\s+Acknowledge warning friction-source-assumed: give the reason for accepting this warning in at least 20 characters/);
  expect(refusal).not.toMatch(/HTTP/);
  expect(await page.$eval('#ack-0', (e) => e.getAttribute('aria-invalid'))).toBe('true');
  expect(await page.evaluate(() => document.activeElement?.id)).toBe('ack-0');
  // "ok" is not a reason: refused the same way (and by the service: test/reviews/review-workflow.e2e-spec.ts)
  await page.type('#ack-0', 'ok');
  await page.click('#decision-submit');
  await page.waitForFunction(() => document.getElementById('ack-0-error') !== null);
  expect(await text(page, '#ack-0-error')).toMatch(/at least 20 characters/);
  expect((await t.call('GET', `/api/v1/revisions/${revisionId}`)).body.review.state).toBe('submitted');
  const decisionPanel = await page.$('#decision');
  await screenshot(decisionPanel!, 'review/pages-approve-refused');
  expect(await seriousViolations(page)).toEqual([]);

  // acknowledged, but without a signature: the service refuses it, naming the signature in words
  await page.type('#ack-0', ': friction test scheduled with the nut supplier; the range covers it.');
  await page.click('#decision-submit');
  await page.waitForSelector('#decision-problem .problem');
  refusal = await text(page, '#decision-problem');
  expect(refusal).toMatch(/Signature not accepted[\s\S]*Electronic signature: a decision is an electronic signature/);
  expect(refusal).not.toMatch(/HTTP/);
  expect(await page.$eval('#signature-password', (e) => e.getAttribute('aria-invalid'))).toBe('true');
  expect(await page.evaluate(() => document.activeElement?.id)).toBe('signature-password');

  // acknowledged and signed with the reviewer's own password: approved, the signature shown
  await page.type('#signature-password', t.accounts.reviewer.password);
  await page.click('#decision-submit');
  await page.waitForSelector('#decision-done:not([hidden])');
  expect(await text(page, '#decision-done')).toMatch(/^Revision 1 approved at .* UTC, signed by Checking engineer \(test\) \(approved as checking engineer; signature [0-9a-f]{16}\)/);
  expect(await page.$eval('#signature-password', (e) => (e as HTMLInputElement).value)).toBe('');
  await page.waitForFunction(() => document.getElementById('revision-header')!.innerText.includes('Approved by Checking engineer (test)'));
  const after = (await t.call('GET', `/api/v1/revisions/${revisionId}`)).body;
  expect(after.review).toMatchObject({ state: 'approved', decidedBy: { name: 'Checking engineer (test)' } });
  await screenshot(page, 'review/pages-approved', { fullPage: false });

  // the product's audit trail: second page, the approval, an intact chain, and the CSV download
  await Promise.all([page.waitForNavigation(), page.click('#audit-link')]);
  await page.waitForSelector('#audit:not([hidden])');
  const links = (await t.call('GET', `/api/v1/products/${productId}/audit?limit=500`)).body.items.length;
  expect(links).toBeGreaterThan(25);
  await page.waitForSelector('#chain[data-valid]');
  expect(await page.$eval('#chain', (e) => (e as HTMLElement).dataset.valid)).toBe('true');
  expect(await text(page, '#chain')).toMatch(new RegExp(`^Hash chain intact: ${links} links recomputed`));
  await page.waitForSelector('#trail tbody tr');
  expect(await page.$$eval('#trail tbody tr', (trs) => trs.length)).toBe(25);
  expect(await page.$('#trail tr[data-type="approved"]')).toBeNull();
  await page.click('#load-more');
  await page.waitForSelector('#trail tr[data-type="approved"]');
  expect(await page.$$eval('#trail tbody tr', (trs) => trs.map((tr) => Number(tr.getAttribute('data-seq'))))).toEqual(Array.from({ length: links }, (_, i) => i + 1));
  expect(await page.$eval('#load-more', (b) => (b as HTMLElement).hidden)).toBe(true);
  const approvedRow = await text(page, '#trail tr[data-type="approved"]');
  expect(approvedRow).toContain('Checking engineer (test)');
  expect(approvedRow).toContain('revision 1 approved acknowledging friction-source-assumed');
  const audit = await downloadsTo(page);
  const csvDone = audit.next();
  await page.click('#download-csv');
  const csv = await csvDone;
  expect(csv.name).toBe('audit-KL-8.csv');
  expect(csv.bytes.toString('utf8')).toMatch(new RegExp(`\r\n${links},[^,]+,event,approved,Checking engineer \\(test\\),`));
  expect(await fitsWidth(page)).toBe(true);
  await screenshot(page, 'review/pages-audit', { fullPage: true });
  expect(await seriousViolations(page)).toEqual([]);
});

it('shows the four-eyes refusal when a checker tries to approve their own revision [POST /api/v1/revisions/:id/decisions]', async () => {
  const page = await newTab();
  await page.goto(`${t.baseUrl}/review/revisions/${ownRevisionId}`);
  await signIn(page, 'checkerAuthor'); // every page sends to the sign-in page and back
  await page.waitForSelector('#decision:not([hidden])');
  expect(await text(page, '#revision-header')).toMatch(/Author\s+Second checker \(test\)/);
  expect(await page.$$('#acknowledgements textarea')).toHaveLength(0); // a clear design has no warning
  await page.click('input[name="decision"][value="approve"]');
  await page.type('#signature-password', t.accounts.checkerAuthor.password);
  await page.click('#decision-submit');
  await page.waitForSelector('#decision-problem .problem');
  const refusal = await text(page, '#decision-problem');
  expect(refusal).toContain('Four-eyes rule');
  expect(refusal).toContain('a revision must be decided by a reviewer other than its author');
  expect((await t.call('GET', `/api/v1/revisions/${ownRevisionId}`)).body.review.state).toBe('submitted');
  await screenshot((await page.$('#decision'))!, 'review/pages-four-eyes');
  expect(await seriousViolations(page)).toEqual([]);
  // no credential in script storage: the session is an HttpOnly cookie that scripts cannot read
  const storage = await page.evaluate(() => ({ session: sessionStorage.length, local: localStorage.length, cookie: document.cookie }));
  expect(storage).toEqual({ session: 0, local: 0, cookie: '' });
  // signing out ends the session: the page goes to the sign-in page and the old cookie is refused
  const cookie = (await page.cookies()).find((c) => c.name === 'leadline_session')!;
  await Promise.all([page.waitForNavigation(), page.click('#sign-out')]);
  expect(new URL(page.url()).pathname).toBe('/sign-in');
  const reuse = await fetch(`${t.baseUrl}/api/v1/me`, { headers: { cookie: `leadline_session=${cookie.value}` } });
  expect(reuse.status).toBe(401);
});

it('never puts a token or a password in a URL or a log line, keeps the session in an HttpOnly SameSite=Strict cookie, sends the CSP with every page, and violates none of it', async () => {
  expect(visitedUrls.length).toBeGreaterThan(20);
  const tokens = [...Object.values(t.tokens), ...Object.values(t.accounts).map((a) => a.password)];
  const leaks = visitedUrls.filter((u) => tokens.some((tok) => u.includes(tok) || u.includes(encodeURIComponent(tok))));
  expect(leaks).toEqual([]);
  const foreign = visitedUrls.filter((u) => !u.startsWith(t.baseUrl + '/') && !/^(about:|blob:http:\/\/127\.0\.0\.1|data:)/.test(u));
  expect(foreign).toEqual([]);
  const cookies = await browser.cookies();
  expect(cookies.length).toBeGreaterThan(0);
  for (const c of cookies) expect({ name: c.name, httpOnly: c.httpOnly, sameSite: c.sameSite, path: c.path }).toEqual({ name: 'leadline_session', httpOnly: true, sameSite: 'Strict', path: '/' });
  const pages = documentHeaders.filter((d) => d.url.startsWith(`${t.baseUrl}/review`) || d.url.startsWith(`${t.baseUrl}/sign-in`));
  expect(pages.length).toBeGreaterThanOrEqual(4);
  for (const d of pages) expect({ url: d.url, csp: d.csp }).toEqual({ url: d.url, csp: expect.stringContaining("default-src 'self'") });
  // the refused sign-in and the 422/403 refusals are logged by Chromium as failed loads; nothing else may be
  expect(consoleProblems.filter((m) => !/status of (401|403|422)/.test(m))).toEqual([]);
  const logs = logLines.join('');
  expect(logs).toContain('/api/v1/revisions/'); // requests were logged
  for (const tok of tokens) expect(logs.includes(tok)).toBe(false);
});

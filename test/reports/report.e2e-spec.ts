/**
 * Calculation reports through the real service: PostgreSQL records, HTTP routes, Debian's Chromium.
 * The PDF's text is extracted with pdf-parse and checked against the stored evaluation.
 */
import { PdfRenderer } from '../../apps/api/src/infra/pdf/browser-pool';
import { formatQuantity, sig } from '@leadline/presentation';
import { saveArtifact, screenshot } from '../support/artifacts';
import { testBrowser } from '../support/browser';
import { warningDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';
import { pdfText } from '../support/pdf-text';
import { softPasskey } from '../support/soft-passkey';



let t: TestApp;
let revisionId: string;
let productId: string;
let record: any;

beforeAll(async () => {
  // The queue's wait is raised: ten PDFs wait behind each other on a loaded 2-core machine for longer than the
  // default 20 s, and this suite is about sharing one browser, not the time-out (test/hardening/pdf-queue.e2e-spec.ts)
  t = await startTestApp('postgres', { LEADLINE_CHROMIUM_PATH: '/usr/bin/chromium', LEADLINE_PDF_QUEUE_WAIT_MS: '300000' });
  const product = (await t.call('POST', '/api/v1/products', { code: 'KL-8', name: 'Kestrel KL-8 vehicle lift (test product)' })).body.id;
  productId = product;
  const opened = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'Column screw', design: warningDesign });
  revisionId = opened.body.revisionId;
  await t.call('POST', `/api/v1/revisions/${revisionId}/decisions`, {
    decision: 'approve',
    comment: 'Checked at both ends of the friction range.',
    acknowledgements: [{ finding: 'friction-source-assumed', comment: 'Friction test scheduled with the nut supplier.' }],
  }, { as: 'reviewer' });
  record = (await t.call('GET', `/api/v1/revisions/${revisionId}`)).body;
});
afterAll(() => t?.close());

it('prints the signature block of the approval in the design file [GET /api/v1/products/:id/design-file.pdf]', async () => {
  const res = await t.call('GET', `/api/v1/products/${productId}/design-file.pdf`);
  expect(res.status).toBe(200);
  const flat = (await pdfText(res.raw)).text.replace(/\s+/g, ' ');
  const signed = record.review.signature;
  // the date, then the time with its offset (signedAt printed on two lines)
  for (const part of ['Electronic signatures', 'Checking engineer (test)', 'approved as checking engineer', `${signed.signedAt.slice(0, 10)} ${signed.signedAt.slice(11)}`, 'password, given again at signing', signed.fingerprint]) {
    expect(flat).toContain(part);
  }
});

it('renders a stored revision to PDF whose text carries the inputs, results, findings, caution and hash [GET /api/v1/revisions/:id/report.pdf]', async () => {
  const res = await t.call('GET', `/api/v1/revisions/${revisionId}/report.pdf`);
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toBe('application/pdf');
  expect(res.raw.subarray(0, 5).toString()).toBe('%PDF-');
  saveArtifact('service-report-a4.pdf', res.raw);
  const { text } = await pdfText(res.raw);
  const e = record.evaluation;
  // inputs as entered
  expect(text).toContain('Tr 40x7');
  expect(text).toContain('18 kN');
  expect(text).toContain('KL-8');
  expect(text).toContain('Column screw');
  // the signature block: printed name, meaning, date and time with its offset, method, fingerprint
  const signed = record.review.signature;
  const flat = text.replace(/\s+/g, ' ');
  expect(flat).toContain('Electronic signatures');
  expect(flat).toContain('Checking engineer (test)');
  expect(flat).toContain('approved as checking engineer');
  expect(flat).toContain(`${signed.signedAt.slice(0, 10)} ${signed.signedAt.slice(11)}`);
  expect(signed.signedAt).toMatch(/\+00:00$/);
  expect(flat).toContain('password, given again at signing');
  expect(flat).toContain(signed.fingerprint);
  // Wiring test: the PDF served by the real service carries the stored record's results, formatted as the report formats
  // them (the formatter is checked on literal values in apps/api/src/reports/format.spec.ts, the figures in the engine specs)
  for (const [si, kind] of [
    [e.torque.raise.atMaxFriction, 'torque'],
    [e.torque.lower.atMinFriction, 'torque'],
    [e.stresses.body.vonMises, 'stress'],
    [e.buckling.criticalLoad, 'force'],
  ] as const) {
    expect(text).toContain(formatQuantity(si, kind, 'SI').replace(/\s+/g, ' '));
  }
  expect(text).toContain(sig(e.selfLocking.margin));
  // findings, review, caution and record hash
  for (const f of record.findings.filter((x: { severity: string }) => x.severity !== 'info')) expect(text).toContain(f.message.slice(0, 40));
  expect(text).toContain('Friction test scheduled with the nut supplier.');
  expect(text).toMatch(/does not replace/);
  expect(text).toMatch(/no substitute for a brake/);
  expect(text.replace(/\s/g, '')).toContain(record.hash);
  // safety factors stand against the minimums of the rule set the revision was judged by (lifting duty)
  expect(text).toMatch(/Screw body, Sy \/ von Mises [\d.]+ ≥ 3\.00 meets the limit screw-body-yield/); // default rule set: 3.0 on lifting
  expect(text).toMatch(/Column buckling, Pcr \/ F [\d.]+ ≥ 3\.50 meets the limit column-buckling/);
  expect(text).not.toContain('no minimum recorded');
  const letter = await t.call('GET', `/api/v1/revisions/${revisionId}/report.pdf?paper=Letter`);
  expect(letter.status).toBe(200);
  expect((await t.call('GET', `/api/v1/revisions/${revisionId}/report.pdf?paper=A3`)).status).toBe(422);
});

it('renders the HTML report in Chromium at A4 width without overflow (screenshot with ARTIFACTS=1) [GET /api/v1/revisions/:id/report.html]', async () => {
  const res = await t.call('GET', `/api/v1/revisions/${revisionId}/report.html`);
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toMatch(/text\/html/);
  expect(res.text).not.toMatch(/https?:\/\/(?!leadline\.invalid)[^"' ]*\.(css|js|woff2?|ttf)/); // nothing fetched from outside
  const browser = await testBrowser();
  try {
    const page = await browser.newPage({ width: 794, height: 1123 });
    await page.setContent(res.text, { waitUntil: 'load' });
    const widths = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, client: document.documentElement.clientWidth }));
    expect(widths.scroll).toBeLessThanOrEqual(widths.client);
    expect(await page.$$eval('svg', (s) => s.length)).toBeGreaterThanOrEqual(2);
    await screenshot(page, 'service-report-a4', { fullPage: false });
  } finally {
    await browser.close();
  }
});

it('serves 10 concurrent PDF requests with one browser process', async () => {
  const pdf = t.app.get(PdfRenderer);
  const launchesBefore = pdf.browserLaunches;
  const results = await Promise.all(Array.from({ length: 10 }, () => t.call('GET', `/api/v1/revisions/${revisionId}/report.pdf`)));
  expect(results.map((r) => r.status)).toEqual(Array(10).fill(200));
  for (const r of results) expect(r.raw.subarray(0, 5).toString()).toBe('%PDF-');
  expect(pdf.browserLaunches).toBe(Math.max(launchesBefore, 1));
});

it('prints the signature block of a decision signed with a passkey: its method and fingerprint [GET /api/v1/revisions/:id/report.pdf]', async () => {
  const key = softPasskey();
  const session = await t.signIn(t.emails.reviewer, t.passwords.reviewer);
  const options = await t.call('POST', '/api/v1/account/passkeys/options', undefined, { session });
  expect((await t.call('POST', '/api/v1/account/passkeys', { challengeId: options.body.challengeId, response: key.register(options.body.options, 'http://localhost') }, { session })).status).toBe(201);
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Passkey-signed screw', design: warningDesign });
  const challenge = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/passkey-challenges`, undefined, { session });
  key.counter = 1;
  const decided = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, {
    decision: 'reject', comment: 'Measure the friction first.',
    signature: { method: 'passkey', challengeId: challenge.body.challengeId, response: key.assert(challenge.body.options, 'http://localhost') },
  }, { session });
  expect(decided.status).toBe(201);
  const signed = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body.review.signature;
  const res = await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.pdf`);
  expect(res.status).toBe(200);
  const flat = (await pdfText(res.raw)).text.replace(/\s+/g, ' ');
  for (const part of ['Electronic signatures', 'Checking engineer (test)', 'rejected as checking engineer', `${signed.signedAt.slice(0, 10)} ${signed.signedAt.slice(11)}`, 'passkey, used at signing over the record hash', signed.fingerprint]) {
    expect(flat).toContain(part);
  }
});

it('answers a fragment for a page to embed: the styles nested under the report\'s box with the page\'s nonce, then the body with every id prefixed [GET /api/v1/revisions/:id/report.html?part=embedded]', async () => {
  const nonce = 'bm9uY2Utb2YtdGhlLXBhZ2U';
  const res = await t.call('GET', `/api/v1/revisions/${revisionId}/report.html?part=embedded&idPrefix=report-&styleNonce=${nonce}`);
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toBe('text/html; charset=utf-8');
  const html = res.text;
  expect(html).not.toMatch(/<!DOCTYPE|<html|<head>|<body|<script|style=/i);
  expect(html.match(/<style[^>]*>/g)).toEqual([`<style nonce="${nonce}">`]);
  // every rule sits inside the one .report-doc block, so none reaches the embedding page
  const css = html.slice(html.indexOf('>', html.indexOf('<style')) + 1, html.indexOf('</style>')).replace(/\/\*[\s\S]*?\*\//g, '').trim();
  expect(css.startsWith('.report-doc {')).toBe(true);
  expect(css.endsWith('}')).toBe(true);
  const depths: number[] = [];
  for (const c of css) depths.push((depths.at(-1) ?? 0) + (c === '{' ? 1 : c === '}' ? -1 : 0));
  expect(depths.slice(css.indexOf('{'), -1).every((d) => d > 0)).toBe(true);
  expect(depths.at(-1)).toBe(0);
  expect(html).toContain('<div class="report-doc">');
  const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
  expect(ids.length).toBeGreaterThan(5);
  expect(ids.filter((id) => !id.startsWith('report-'))).toEqual([]);
  expect(html).toContain('Column screw');
  // the whole document is still the default, and a bad prefix is refused naming it
  expect((await t.call('GET', `/api/v1/revisions/${revisionId}/report.html`)).text).toMatch(/^<!DOCTYPE html>/);
  const bad = await t.call('GET', `/api/v1/revisions/${revisionId}/report.html?part=embedded&idPrefix=1"x`);
  expect(bad.status).toBe(422);
  expect(bad.body.errors[0].path).toBe('idPrefix');
});

/**
 * The screw-selection page (/design/sizing) in real Chromium against the real service on real PostgreSQL, by
 * keyboard only: sign in, see the caution, get a field error at the field and fix it, read the ranked screws with
 * the governing check of each row (the same as POST /api/v1/sizing answers for the request the page sent), and open
 * one as a new calculation of a product: the design form's page starts with that screw's complete design input
 * handed over in sessionStorage (never in a web address). axe-core and the width check on each state
 * (test/support/page-checks.ts); screenshots with ARTIFACTS=1.
 */
import type { Page } from 'puppeteer-core';
import { CAUTION_TEXT } from '../../apps/api/src/reports/report-model';
import { testBrowser, type TestBrowser } from '../support/browser';
import { checkPage as checkPageAt } from '../support/page-checks';
import { chooseOption, signInByKeyboard, tabTo, typeInto } from '../support/keyboard';
import { startPagesApp, type PagesApp } from './pages-app';

let t: PagesApp;
let browser: TestBrowser;
let productId: string;
const consoleProblems: string[] = [];
const visitedUrls: string[] = [];
const sizingBodies: string[] = [];

beforeAll(async () => {
  t = await startPagesApp();
  const product = await t.call('POST', '/api/v1/products', { code: 'HJ-20', name: 'Hollin Works 2 t bench jack (test product)' });
  expect(product.status).toBe(201);
  productId = product.body.id;
  browser = await testBrowser();
});

afterAll(async () => {
  await browser?.close();
  await t?.close();
});

async function newTab(): Promise<Page> {
  const page = await browser.newPage();
  page.on('request', (r) => {
    visitedUrls.push(r.url());
    if (r.url().endsWith('/api/v1/sizing') && r.method() === 'POST') sizingBodies.push(r.postData() ?? '');
  });
  page.on('framenavigated', (f) => visitedUrls.push(f.url()));
  page.on('console', (m) => {
    if (m.type() === 'error' || /Content Security Policy/i.test(m.text())) consoleProblems.push(m.text());
  });
  page.on('pageerror', (e) => consoleProblems.push(String(e)));
  return page;
}

const text = (page: Page, selector: string) => page.$eval(selector, (e) => (e as HTMLElement).innerText);

const checkPage = (page: Page, name: string) => checkPageAt(page, `sizing/${name}`);

it('finds a screw for a stated duty and opens it as a new calculation, by keyboard only [GET /design/sizing]', async () => {
  const page = await newTab();
  // What the next document finds in sessionStorage before any of its scripts run: the hand-over to the design form.
  await page.evaluateOnNewDocument(() => {
    (window as unknown as { draftAtLoad: string | null }).draftAtLoad = sessionStorage.getItem('leadline.designDraft');
  });
  const response = await page.goto(`${t.baseUrl}/design/sizing`);
  const csp = response?.headers()['content-security-policy'] ?? '';
  expect(csp).toContain("script-src 'self'");
  expect(csp).toContain("style-src 'self'");
  expect(csp).toContain("form-action 'none'");
  expect(csp).not.toContain('unsafe-inline');

  await signInByKeyboard(page, t.accounts.author.email, t.accounts.author.password);
  await page.waitForFunction(() => (document.getElementById('s-thread-friction') as HTMLSelectElement).options.length > 0);
  expect(await text(page, '.caution')).toContain(CAUTION_TEXT[0]);
  expect(await page.$eval('nav.pages a[aria-current="page"]', (a) => a.getAttribute('href')).catch(() => null)).toBe('/design/sizing');
  // Every input, select and checkbox of the form has a label.
  const unlabelled = await page.$$eval('#sizing-form input, #sizing-form select', (inputs) =>
    inputs.filter((i) => !(i as HTMLInputElement).labels?.length).map((i) => i.id || i.outerHTML.slice(0, 80)));
  expect(unlabelled).toEqual([]);
  await checkPage(page, 'sizing-form');

  // A unit of the wrong kind: the refusal is shown at the field and the field gets the focus.
  await typeInto(page, '#s-load', '20 kg');
  await typeInto(page, '#s-length', '800 mm');
  await chooseOption(page, '#s-ends', 'fixed-free');
  await chooseOption(page, '#s-duty', 'lifting');
  await typeInto(page, '#s-torque', '200 N*m');
  await typeInto(page, '#s-limit', '12');
  await tabTo(page, '#sizing-submit');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#s-load[aria-invalid="true"]');
  expect(await page.evaluate(() => document.activeElement?.id)).toBe('s-load');
  const fieldMessage = await page.$eval('#s-load', (input) => document.getElementById(input.getAttribute('aria-describedby')!.split(' ').find((id) => id.endsWith('-error'))!)!.textContent);
  expect(fieldMessage).toMatch(/Error:.*kg/);
  expect(await text(page, '#sizing-problem')).toContain('requirements.load.axial');
  await checkPage(page, 'sizing-field-error');

  await page.keyboard.down('Control');
  await page.keyboard.press('a');
  await page.keyboard.up('Control');
  await page.keyboard.type('20 kN');
  await tabTo(page, '#sizing-submit');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#candidates:not([hidden])');
  expect(await page.$('#s-load[aria-invalid="true"]')).toBeNull();

  // The table is the API's answer to the request the page sent: same screws, verdicts in words, governing checks.
  const sent = JSON.parse(sizingBodies[sizingBodies.length - 1]);
  expect(sent.requirements.load.axial).toBe('20 kN');
  expect(sent.search.limit).toBe(12);
  const answer = (await t.call('POST', '/api/v1/sizing', sent)).body;
  expect(answer.candidates.length).toBeGreaterThan(0);
  const rows = await page.$$eval('#candidates tbody tr', (trs) =>
    trs.map((tr) => Array.from(tr.children).map((td) => (td as HTMLElement).innerText.trim())));
  expect(rows).toHaveLength(answer.candidates.length);
  const VERDICT_WORDS: Record<string, string> = { clear: 'Clear', 'needs-acknowledgement': 'Needs acknowledgement' };
  answer.candidates.forEach((c: any, i: number) => {
    expect(rows[i].slice(0, 5)).toEqual([String(c.rank), c.size, String(c.starts), c.nutLength, VERDICT_WORDS[c.verdict]]);
    expect(rows[i][5]).toContain(c.governing.check);
    expect(rows[i][5]).toContain(c.governing.ruleId);
  });
  expect(await text(page, '#answer-status')).toContain(`${answer.passed} of ${answer.searched} candidates pass`);
  const rejectedRows = await page.$$eval('#rejected tbody tr', (trs) => trs.map((tr) => [tr.getAttribute('data-rule'), (tr.lastElementChild as HTMLElement).innerText]));
  expect(Object.fromEntries(rejectedRows)).toEqual(Object.fromEntries(Object.entries(answer.rejected).map(([k, v]) => [k, String(v)])));
  expect(await page.$$eval('#headroom li', (lis) => lis.length)).toBe(answer.headroom.length);
  await checkPage(page, 'sizing-answer');

  // Open the second-ranked screw as a new calculation of the product, by keyboard.
  const chosen = answer.candidates[Math.min(1, answer.candidates.length - 1)];
  await tabTo(page, `#candidates tbody tr[data-rank="${chosen.rank}"] button`);
  await page.keyboard.press('Enter');
  await page.waitForSelector('#open:not([hidden])');
  await page.waitForFunction(() => (document.getElementById('open-product') as HTMLSelectElement).options.length > 0);
  expect(await page.evaluate(() => document.activeElement?.id)).toBe('open-product');
  expect(await text(page, '#open-what')).toContain(chosen.size);
  await checkPage(page, 'sizing-open');
  await chooseOption(page, '#open-product', productId);
  await tabTo(page, '#open-submit');
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  expect(new URL(page.url()).pathname).toBe(`/design/products/${productId}/new`);
  const handed = await page.evaluate(() => (window as unknown as { draftAtLoad: string | null }).draftAtLoad);
  expect(handed).not.toBeNull();
  const draft = JSON.parse(handed as string);
  expect(draft.design).toEqual(chosen.design);
  expect(draft.origin).toContain(chosen.size);
  // The handed-over design is complete: the API evaluates it to the verdict the table showed.
  const evaluation = await t.call('POST', '/api/v1/evaluations', draft.design);
  expect(evaluation.body.verdict).toBe(chosen.verdict);
  // The design form took it (once) and filled its fields; its live results show the same verdict.
  await page.waitForSelector('#design:not([hidden])');
  const value = (id: string) => page.$eval(`#${id}`, (e) => (e as HTMLInputElement).value);
  expect(await value('f-size')).toBe(chosen.design.thread.size);
  expect(await value('f-starts')).toBe(String(chosen.starts));
  expect(await value('f-nut-length')).toBe(chosen.design.nut.length);
  expect(await value('f-load')).toBe('20 kN');
  expect(await value('f-collar-mean')).toBe(chosen.design.collar.meanDiameter);
  expect(await text(page, '#design-context')).toContain(chosen.size);
  expect(await page.evaluate(() => sessionStorage.getItem('leadline.designDraft'))).toBeNull();
  const VERDICT_LINE: Record<string, string> = { clear: 'Clear', 'needs-acknowledgement': 'Needs acknowledgement' };
  await page.waitForFunction((w) => (document.getElementById('verdict')?.textContent ?? '').includes(w), {}, VERDICT_LINE[chosen.verdict]);
  await checkPage(page, 'sizing-design-form');

  for (const token of Object.values(t.tokens)) expect(visitedUrls.filter((u) => u.includes(token))).toEqual([]);
  // 422 while a field is wrong; 401 for the first GET /api/v1/me without a session (it sends the tab to sign in)
  expect(consoleProblems.filter((m) => !/status of (401|422)/.test(m))).toEqual([]);
  await page.close();
});

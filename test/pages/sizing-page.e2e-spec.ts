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
let newProductId: string;
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

/** The product chooser has the focus and is what the window shows at its own position: nothing is drawn over it. */
async function expectChooserInSight(page: Page): Promise<void> {
  await page.waitForFunction(() => document.activeElement?.id === 'open-product');
  const seen = await page.$eval('#open-product', (select) => {
    const r = select.getBoundingClientRect();
    const x = r.left + r.width / 2;
    const y = r.top + r.height / 2;
    const inWindow = r.top >= 0 && r.bottom <= window.innerHeight && r.left >= 0 && r.right <= window.innerWidth;
    return { inWindow, atPoint: document.elementFromPoint(x, y)?.id ?? null };
  });
  expect(seen).toEqual({ inWindow: true, atPoint: 'open-product' });
}

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
  await typeInto(page, '#s-length', '600 mm');
  await chooseOption(page, '#s-ends', 'fixed-free');
  await chooseOption(page, '#s-duty', 'lifting');
  // a quenched and tempered screw for a lifting jack of the form's 10 000 load cycles: the root fatigue check of rule set
  // 2026.12-3 stops the cold-drawn sizes of this duty
  await chooseOption(page, '#s-screw-material', 'steel-4140-qt650');
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
  await page.keyboard.type('18 kN');
  await tabTo(page, '#sizing-submit');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#candidates:not([hidden])');
  expect(await page.$('#s-load[aria-invalid="true"]')).toBeNull();

  // The table is the API's answer to the request the page sent: same screws, verdicts in words, governing checks.
  const sent = JSON.parse(sizingBodies[sizingBodies.length - 1]);
  expect(sent.requirements.load.axial).toBe('18 kN');
  expect(sent.search.limit).toBe(12);
  const answer = (await t.call('POST', '/api/v1/sizing', sent)).body;
  expect(answer.candidates.length).toBeGreaterThan(0);
  const rows = await page.$$eval('#candidates tbody tr', (trs) =>
    trs.map((tr) => Array.from(tr.children).map((td) => (td as HTMLElement).innerText.trim())));
  expect(rows).toHaveLength(answer.candidates.length);
  const VERDICT_WORDS: Record<string, string> = { clear: 'Clear', 'needs-acknowledgement': 'Needs acknowledgement' };
  // Some listed screws pass only with a warning: their rows must name the check that warns
  expect(answer.candidates.some((c: any) => c.verdict === 'needs-acknowledgement')).toBe(true);
  answer.candidates.forEach((c: any, i: number) => {
    expect(rows[i][0]).toBe(String(c.rank));
    expect(rows[i][1].split('\n')).toEqual([c.size, `${c.starts} start${c.starts > 1 ? 's' : ''}, nut ${c.nutLength}`]);
    expect(rows[i][2]).toBe(VERDICT_WORDS[c.verdict]);
    expect(rows[i][3]).toContain(c.governing.check);
    expect(rows[i][3]).toContain(c.governing.ruleId);
    // The check that warns: every check of the candidate's own `checks` past its warning level, by its label
    const warned = c.checks.filter((k: any) => k.status === 'warning');
    if (warned.length === 0) expect(rows[i][4]).toBe('none');
    for (const k of warned) expect(rows[i][4]).toContain(k.label);
    if (c.verdict === 'needs-acknowledgement') expect(rows[i][4]).not.toBe('none');
  });
  // Compact: the list fits the panel at 1280 px without a sideways scroll of its own
  expect(await page.$eval('#candidates-box', (b) => [b.scrollWidth, b.clientWidth])).toEqual(await page.$eval('#candidates-box', (b) => [b.clientWidth, b.clientWidth]));
  expect(await text(page, '#answer-status')).toContain(`${answer.passed} of ${answer.searched} candidates pass`);
  const rejectedRows = await page.$$eval('#rejected tbody tr', (trs) => trs.map((tr) => [tr.getAttribute('data-rule'), (tr.lastElementChild as HTMLElement).innerText]));
  expect(Object.fromEntries(rejectedRows)).toEqual(Object.fromEntries(Object.entries(answer.rejected).map(([k, v]) => [k, String(v)])));
  expect(await page.$$eval('#headroom li', (lis) => lis.length)).toBe(answer.headroom.length);
  await checkPage(page, 'sizing-answer');

  // Sorting by a column, by keyboard: by raise torque, smallest first; the rows are the same candidates
  await tabTo(page, '#candidates th[data-sort="raiseTorque"] button');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#candidates th[data-sort="raiseTorque"][aria-sort="ascending"]');
  const byTorque = await page.$$eval('#candidates tbody tr', (trs) => trs.map((tr) => Number(tr.getAttribute('data-rank'))));
  expect(byTorque).toEqual([...answer.candidates].sort((a: any, b: any) => a.figures.raiseTorque - b.figures.raiseTorque || a.rank - b.rank).map((c: any) => c.rank));
  await tabTo(page, '#candidates th[data-sort="rank"] button');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#candidates th[data-sort="rank"][aria-sort="ascending"]');

  // Open the second-ranked screw as a new calculation of a product registered on the spot, by keyboard.
  const chosen = answer.candidates[Math.min(1, answer.candidates.length - 1)];
  await tabTo(page, `#candidates tbody tr[data-rank="${chosen.rank}"] button`);
  await page.keyboard.press('Enter');
  await page.waitForSelector('#open:not([hidden])');
  await page.waitForFunction(() => (document.getElementById('open-product') as HTMLSelectElement).options.length > 1);
  await expectChooserInSight(page);
  expect(await text(page, '#open-what')).toContain(chosen.size);
  // Nothing used yet in this browser: the newest product is offered, not the first by name
  expect(await page.$eval('#open-product', (s) => (s as HTMLSelectElement).value)).toBe(productId);
  await checkPage(page, 'sizing-open');
  await chooseOption(page, '#open-product', '(new)');
  await page.waitForSelector('#open-new:not([hidden])');
  // A code already in use is refused at its field, and nothing is opened
  await typeInto(page, '#open-code', 'HJ-20');
  await typeInto(page, '#open-name', 'Ostmark 3 t trench jack');
  await tabTo(page, '#open-submit');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#open-code[aria-invalid="true"]');
  expect(await page.evaluate(() => document.activeElement?.id)).toBe('open-code');
  await typeInto(page, '#open-code', 'TJ-3');
  await tabTo(page, '#open-submit');
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  const registered = (await t.call('GET', '/api/v1/products?q=TJ-3')).body.items;
  expect(registered.map((p: any) => [p.code, p.name])).toEqual([['TJ-3', 'Ostmark 3 t trench jack']]);
  newProductId = registered[0].id;
  expect(new URL(page.url()).pathname).toBe(`/design/products/${newProductId}/new`);
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
  expect(await value('f-load')).toBe('18 kN');
  expect(await value('f-collar-mean')).toBe(chosen.design.collar.meanDiameter);
  expect(await text(page, '#design-context')).toContain(chosen.size);
  expect(await page.evaluate(() => sessionStorage.getItem('leadline.designDraft'))).toBeNull();
  const VERDICT_LINE: Record<string, string> = { clear: 'Clear', 'needs-acknowledgement': 'Needs acknowledgement' };
  await page.waitForFunction((w) => (document.getElementById('verdict')?.textContent ?? '').includes(w), {}, VERDICT_LINE[chosen.verdict]);
  await checkPage(page, 'sizing-design-form');

  for (const token of Object.values(t.tokens)) expect(visitedUrls.filter((u) => u.includes(token))).toEqual([]);
  // 422 while a field is wrong; 401 for the first GET /api/v1/me without a session (it sends the tab to sign in)
  // 409 for the product code already in use
  expect(consoleProblems.filter((m) => !/status of (401|409|422)/.test(m))).toEqual([]);
  await page.close();
});

it.each([
  [1920, 1080],
  [390, 844],
])('at %i px: only clear screws, the duty kept across pages, the product last used chosen first, the chooser in sight [GET /design/sizing]', async (width, height) => {
  // A product newer than the one this test will use, so that "last used" and "newest" differ
  expect((await t.call('POST', '/api/v1/products', { code: `ZW-${width}`, name: `Zellner Werk lifting table ${width} (test product)` })).status).toBe(201);
  const page = await newTab();
  await page.setViewport({ width, height });
  await page.goto(`${t.baseUrl}/design/sizing`);
  await signInByKeyboard(page, t.accounts.author.email, t.accounts.author.password);
  await page.waitForFunction(() => (document.getElementById('s-thread-friction') as HTMLSelectElement).options.length > 0);
  await typeInto(page, '#s-load', '18 kN');
  await typeInto(page, '#s-limit', '8');
  await tabTo(page, '#s-only-clear');
  await page.keyboard.press('Space');
  await tabTo(page, '#sizing-submit');
  const before = sizingBodies.length;
  await page.keyboard.press('Enter');
  await page.waitForSelector('#candidates:not([hidden])');
  const sent = JSON.parse(sizingBodies[before]);
  expect(sent.search.verdicts).toEqual(['clear']);
  expect(sent.requirements.load.axial).toBe('18 kN');
  const answer = (await t.call('POST', '/api/v1/sizing', sent)).body;
  expect(answer.candidates.length).toBeGreaterThan(0);
  const verdicts = await page.$$eval('#candidates tbody tr td.verdict', (tds) => tds.map((td) => (td as HTMLElement).innerText.trim()));
  expect(verdicts).toEqual(answer.candidates.map(() => 'Clear'));
  expect(await text(page, '#answer-status')).toContain('only clear ones');
  await checkPageAt(page, `sizing/sizing-only-clear-${width}`, [width]);

  // To the products, into one product (it becomes the one last used), and back to the search by the navigation
  await tabTo(page, 'nav.pages a[href="/design"]');
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  await page.waitForSelector(`#products tr[data-product="${productId}"] a`);
  await tabTo(page, `#products tr[data-product="${productId}"] a`);
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  await page.waitForFunction(() => (document.getElementById('product-heading')?.textContent ?? '').includes('HJ-20'));
  await tabTo(page, 'nav.pages a[href="/design/sizing"]');
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  // The duty as it was left, and its answer again
  await page.waitForSelector('#candidates:not([hidden])');
  expect(await page.$eval('#s-load', (i) => (i as HTMLInputElement).value)).toBe('18 kN');
  expect(await page.$eval('#s-limit', (i) => (i as HTMLInputElement).value)).toBe('8');
  expect(await page.$eval('#s-only-clear', (i) => (i as HTMLInputElement).checked)).toBe(true);
  expect(JSON.parse(sizingBodies[sizingBodies.length - 1])).toEqual(sent);
  expect(await page.$$eval('#candidates tbody tr', (trs) => trs.length)).toBe(answer.candidates.length);

  const chosen = answer.candidates[0];
  await tabTo(page, `#candidates tbody tr[data-rank="${chosen.rank}"] button`);
  await page.keyboard.press('Enter');
  await page.waitForSelector('#open:not([hidden])');
  await expectChooserInSight(page);
  expect(await page.$eval('#open-product', (s) => (s as HTMLSelectElement).value)).toBe(productId);
  await checkPageAt(page, `sizing/sizing-open-${width}`, [width]);
  await tabTo(page, '#open-submit');
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  expect(new URL(page.url()).pathname).toBe(`/design/products/${productId}/new`);
  await page.waitForSelector('#design:not([hidden])');
  expect(await page.$eval('#f-size', (e) => (e as HTMLInputElement).value)).toBe(chosen.design.thread.size);
  await page.close();
});

/**
 * Every page at the four widths people use (390 px phone, 768 px tablet, 1280 and 1920 px desktop), in real Chromium
 * against the real service on PostgreSQL with stored work on it: no page scrolls sideways
 * (document.documentElement.scrollWidth <= innerWidth), no table heading breaks into a letter per line, no cell's
 * content spills over its neighbour, the navigation stays on one line at desktop widths, and the skip link leads to
 * the main content; axe's needs-review items explained or measured at every width. Screenshots of each page at each width with ARTIFACTS=1 (artifacts/widths/<page>-<width>.png).
 */
import type { Page } from 'puppeteer-core';
import { screenshot } from '../support/artifacts';
import { testBrowser, type TestBrowser } from '../support/browser';
import { changedDesign, clearDesign, warningDesign } from '../support/designs';
import { signInByKeyboard } from '../support/keyboard';
import { unexplainedReview } from '../support/axe';
import { EXPLAINED_REVIEW, overflowing } from '../support/page-checks';
import { startPagesApp, type PagesApp } from './pages-app';

const WIDTHS = [390, 768, 1280, 1920] as const;
const HEIGHT: Record<number, number> = { 390: 844, 768: 1024, 1280: 800, 1920: 1080 };

let t: PagesApp;
let browser: TestBrowser;
let productId: string;
let calculationId: string;
let revisionId: string;
const admin = { email: 'administrator@widths.example.com', password: 'the administrator password (widths test)' };

beforeAll(async () => {
  t = await startPagesApp();
  productId = (await t.call('POST', '/api/v1/products', { code: 'GW-12-LIFT-STATION-NORTH', name: 'Gorsefield Works twin-column vehicle lift with a long name (test product)' })).body.id;
  const opened = (await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Carriage lift screw, left column, with a title that runs long', design: clearDesign })).body;
  calculationId = opened.calculationId;
  expect((await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'approve', comment: 'Checked against the supplier sheet.' }, 'reviewer')).status).toBe(201);
  for (const [i, note] of ['friction from an estimate until the supplier answers', 'the estimate replaced by the supplier sheet\'s value'].entries()) {
    // each revision changes the design: a submission equal to the previous revision is refused (409)
    const r = await t.call('POST', `/api/v1/calculations/${calculationId}/revisions`, { design: changedDesign(warningDesign, `widths ${i + 1}`), note });
    expect(r.status).toBe(201);
    revisionId = r.body.revisionId;
  }
  const created = await t.call('POST', '/api/v1/users', { name: 'Administrator (widths test)', email: admin.email, roles: ['admin'] }, 'admin');
  expect((await fetch(`${t.baseUrl}/api/v1/account/activate`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ activationCode: created.body.activationCode, password: admin.password }) })).status).toBe(200);
  browser = await testBrowser();
}, 60_000);

afterAll(async () => {
  await browser?.close();
  await t?.close();
});

interface Layout {
  scrollWidth: number;
  innerWidth: number;
  /** Table headings that take more lines than they have words (a letter or two per line) */
  squeezedHeadings: string[];
  /** Cells whose content reaches past the cell's own box (over its neighbour) */
  spilling: string[];
  /** Distinct tops of the navigation's visible links (1 = one line) */
  navLines: number;
}

const layoutOf = (page: Page): Promise<Layout> =>
  page.evaluate(() => {
    const visible = (e: Element) => (e as HTMLElement).offsetParent !== null;
    const squeezedHeadings = Array.from(document.querySelectorAll('th'))
      .filter(visible)
      .filter((th) => {
        const words = (th.textContent ?? '').trim().split(/\s+/).filter(Boolean).length;
        const lineHeight = parseFloat(getComputedStyle(th).lineHeight) || 20;
        const padding = parseFloat(getComputedStyle(th).paddingTop) + parseFloat(getComputedStyle(th).paddingBottom);
        const lines = Math.round((th.clientHeight - padding) / lineHeight);
        return words > 0 && lines > words + 1;
      })
      .map((th) => (th.textContent ?? '').trim());
    const spilling: string[] = [];
    for (const cell of Array.from(document.querySelectorAll('td, th')).filter(visible)) {
      const box = cell.getBoundingClientRect();
      for (const child of Array.from(cell.children)) {
        const r = child.getBoundingClientRect();
        if (r.width > 0 && (r.right > box.right + 1 || r.left < box.left - 1)) spilling.push(`${cell.tagName} "${(cell.textContent ?? '').trim().slice(0, 40)}"`);
      }
    }
    const links = Array.from(document.querySelectorAll('nav.pages a')).filter(visible);
    const navLines = new Set(links.map((a) => Math.round(a.getBoundingClientRect().top))).size;
    return { scrollWidth: document.documentElement.scrollWidth, innerWidth: window.innerWidth, squeezedHeadings, spilling, navLines };
  });

/**
 * Opens `path` at each width, waits for `ready`, and holds the page to the layout rules; what breaks a rule is added
 * to `problems` (every page and width is seen before a test fails).
 */
async function atEveryWidth(page: Page, name: string, path: string, ready: string, problems: unknown[]): Promise<void> {
  for (const width of WIDTHS) {
    await page.setViewport({ width, height: HEIGHT[width] });
    await page.goto(`${t.baseUrl}${path}`);
    await page.waitForSelector(ready);
    const layout = await layoutOf(page);
    const fits = layout.scrollWidth <= layout.innerWidth;
    if (!fits) problems.push({ name, width, scrollWidth: layout.scrollWidth, overflowing: await overflowing(page) });
    if (layout.squeezedHeadings.length) problems.push({ name, width, squeezed: layout.squeezedHeadings });
    if (layout.spilling.length) problems.push({ name, width, spilling: layout.spilling });
    // the navigation on one line from a desktop width on (the sign-in page has none)
    if (width >= 1280 && layout.navLines > 1) problems.push({ name, width, navLines: layout.navLines });
    // axe's needs-review items at every width: explained (EXPLAINED_REVIEW), or contrast measured to reach 4.5:1 (the
    // review page's embedded report leaves about a hundred text nodes over tables and charts to measure)
    const review = await unexplainedReview(page, EXPLAINED_REVIEW);
    if (review.length) problems.push({ name, width, needsReview: review });
    await screenshot(page, `widths/${name}-${width}`);
  }
}

async function signedIn(email: string, password: string, path: string): Promise<Page> {
  const page = await browser.newPage();
  await page.setViewport({ width: 1280, height: 800 });
  await page.goto(`${t.baseUrl}${path}`);
  await signInByKeyboard(page, email, password);
  return page;
}

it('the design pages fit 390, 768, 1280 and 1920 px [GET /design...]', async () => {
  const problems: unknown[] = [];
  const page = await signedIn(t.accounts.author.email, t.accounts.author.password, '/design');
  await atEveryWidth(page, 'products', '/design', '#products tbody tr', problems);
  await atEveryWidth(page, 'product', `/design/products/${productId}`, '#calculations tbody tr', problems);
  await atEveryWidth(page, 'calculation', `/design/calculations/${calculationId}`, '#revisions tbody tr', problems);
  await atEveryWidth(page, 'my-work', '/design/my-work', '#work-submitted li', problems);
  await atEveryWidth(page, 'sizing', '/design/sizing', '#s-thread-friction option', problems);
  await atEveryWidth(page, 'design-form', `/design/products/${productId}/new`, '#design:not([hidden])', problems);
  await page.close();
  expect(problems).toEqual([]);
});

it('the review pages fit 390, 768, 1280 and 1920 px [GET /review...]', async () => {
  const problems: unknown[] = [];
  const page = await signedIn(t.accounts.reviewer.email, t.accounts.reviewer.password, '/review');
  await atEveryWidth(page, 'queue', '/review', '#queue tbody tr', problems);
  // the revision page with its report in the page itself (wide tables scroll inside their own labelled boxes)
  await atEveryWidth(page, 'revision', `/review/revisions/${revisionId}`, '#report-body .report-doc h2', problems);
  await atEveryWidth(page, 'audit', `/review/products/${productId}/audit`, '#trail tbody tr', problems);
  await page.close();
  expect(problems).toEqual([]);
});

it('the users page and the sign-in page fit 390, 768, 1280 and 1920 px [GET /admin/users, /sign-in]', async () => {
  const problems: unknown[] = [];
  const page = await signedIn(admin.email, admin.password, '/admin/users');
  await atEveryWidth(page, 'users', '/admin/users', '#users tbody tr', problems);
  await page.close();
  const anonymous = await browser.newPage();
  await atEveryWidth(anonymous, 'sign-in', '/sign-in', '#sign-in-form', problems);
  await anonymous.close();
  expect(problems).toEqual([]);
});

it('the skip link is the first stop of the keyboard and moves the focus to the main content', async () => {
  const page = await signedIn(t.accounts.author.email, t.accounts.author.password, '/design');
  await page.waitForSelector('#products tbody tr');
  await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
  await page.keyboard.press('Tab');
  expect(await page.evaluate(() => [document.activeElement?.className, document.activeElement?.textContent])).toEqual(['skip-link', 'Skip to the main content']);
  // shown while it has the focus
  const box = await page.$eval('.skip-link', (a) => { const r = a.getBoundingClientRect(); return r.top >= 0 && r.bottom <= window.innerHeight; });
  expect(box).toBe(true);
  await page.keyboard.press('Enter');
  await page.waitForFunction(() => document.activeElement?.id === 'main');
  await page.close();
});

/**
 * Drafts, deliberate submission and the review of what changed, in real Chromium against the real service on real
 * PostgreSQL, by keyboard only, at 1280 and 390 px: the author saves a draft, finds it again, changes it and submits
 * it through the confirmation that names what changed and asks for a note; an unchanged design is not offered for
 * submission and, written differently, is refused by the service (409) naming the revision it equals; the checking
 * engineer sees the changes since the previous revision with that revision's decision and comments, comments on a
 * result (one of the revision's checks) and on a changed input, each shown beside what it is on, decides, and reads
 * their own comments on the page; a blocked revision says it cannot be approved and offers only Reject.
 * Every page state: axe-core and no sideways scrolling at its width (test/support/page-checks.ts).
 */
import type { Page } from 'puppeteer-core';
import { testBrowser, type TestBrowser } from '../support/browser';
import { blockedDesign, changedDesign, warningDesign } from '../support/designs';
import { checkPage as checkPageAt } from '../support/page-checks';
import { chooseOption, signInByKeyboard, tabTo, typeInto } from '../support/keyboard';
import { startPagesApp, type PagesApp } from './pages-app';

const WIDTHS = [1280, 390] as const;
const HEIGHT = 900;

let t: PagesApp;
let browser: TestBrowser;
const problems: string[] = [];

beforeAll(async () => {
  t = await startPagesApp({ LEADLINE_CHROMIUM_PATH: '/usr/bin/chromium' });
  browser = await testBrowser();
}, 60_000);

afterAll(async () => {
  await browser?.close();
  await t?.close();
  // no page raised a script or policy error in any story
  expect(problems).toEqual([]);
});

async function tab(width: number): Promise<Page> {
  const page = await browser.newPage({ width, height: HEIGHT });
  page.on('console', (m) => {
    if (m.type() === 'error' && !/status of 4\d\d/.test(m.text())) problems.push(m.text());
    if (/Content Security Policy/i.test(m.text())) problems.push(m.text());
  });
  page.on('pageerror', (e) => problems.push(String(e)));
  return page;
}

const text = (page: Page, selector: string) => page.$eval(selector, (e) => (e as HTMLElement).innerText);
const focusedId = (page: Page) => page.evaluate(() => document.activeElement?.id ?? '');

/** Presses Enter on the element, reached by Tab. */
async function enterOn(page: Page, selector: string): Promise<void> {
  await tabTo(page, selector);
  await page.keyboard.press('Enter');
}

/** Waits until the results panel shows an evaluation of what the form holds now. */
async function waitForCurrentEvaluation(page: Page, after: number): Promise<number> {
  await page.waitForFunction(
    (k) => {
      const s = document.getElementById('results-status')!;
      return Number(s.dataset.evaluation ?? 0) > k && s.dataset.current === 'true';
    },
    {},
    after,
  );
  return page.$eval('#results-status', (e) => Number((e as HTMLElement).dataset.evaluation));
}

/** A calculation with revision 1 (the warning design) rejected with comments on an input and on a finding. */
async function rejectedFirstRevision(code: string) {
  const product = (await t.call('POST', '/api/v1/products', { code, name: `Fernhollow ${code} platform lift (test product)` })).body;
  const opened = (await t.call('POST', `/api/v1/products/${product.id}/calculations`, { title: 'Lift screw', design: warningDesign })).body;
  const rejected = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, {
    decision: 'reject',
    comment: 'The nut is short for this load; lengthen it.',
    comments: [
      { text: 'At least 70 mm of engagement, please.', target: { field: 'nut.length' } },
      { text: 'Book the friction test before the next revision.', target: { finding: 'friction-source-assumed' } },
    ],
  }, 'reviewer');
  expect(rejected.status).toBe(201);
  return { productId: product.id as string, calculationId: opened.calculationId as string, revision1: opened.revisionId as string };
}

describe.each(WIDTHS)('at %i px', (width) => {
  const checkPage = (page: Page, name: string) => checkPageAt(page, `drafts/${name}`, [width]);
  let ids: Awaited<ReturnType<typeof rejectedFirstRevision>>;
  let revision2: string;

  /** A draft saved, restored, changed and submitted through the confirmation that names the changes and needs a note. */
  async function draftSavedChangedSubmitted() {
    const page = await tab(width);
    await page.goto(`${t.baseUrl}/design/calculations/${ids.calculationId}/revise`);
    await signInByKeyboard(page, t.accounts.author.email, t.accounts.author.password);
    await page.waitForSelector('#design:not([hidden])');
    expect(await text(page, '#design-heading')).toBe(`DS-${width} · Lift screw · revision 2`);
    expect(await text(page, '#design-context')).toMatch(/^Prefilled from revision 1\./);
    let n = await waitForCurrentEvaluation(page, 0);

    // a draft: saved for the author alone, not submitted
    await typeInto(page, '#f-nut-length', '70 mm');
    n = await waitForCurrentEvaluation(page, n);
    await enterOn(page, '#save-draft');
    await page.waitForFunction(() => /^Draft saved/.test(document.getElementById('draft-status')!.textContent ?? ''));
    expect(await text(page, '#draft-status')).toMatch(/It is not submitted\.$/);
    const draft = await t.call('GET', `/api/v1/calculations/${ids.calculationId}/draft`);
    expect(draft.body.design.nut.length).toBe('70 mm');
    expect((await t.call('GET', `/api/v1/calculations/${ids.calculationId}/revisions`)).body.items).toHaveLength(1);
    await checkPage(page, 'draft-saved');

    // opening the form again restores the draft
    await page.goto(`${t.baseUrl}/design/calculations/${ids.calculationId}/revise`);
    await page.waitForSelector('#design:not([hidden])');
    expect(await text(page, '#design-context')).toMatch(/^Restored your draft saved .* UTC \(not submitted\)\./);
    expect(await page.$eval('#f-nut-length', (i) => (i as HTMLInputElement).value)).toBe('70 mm');
    n = await waitForCurrentEvaluation(page, 0);

    // changed again, then submitted: the confirmation names each changed input with its label and the governing check
    await typeInto(page, '#f-load', '19 kN');
    n = await waitForCurrentEvaluation(page, n);
    await enterOn(page, '#save-submit');
    await page.waitForSelector('#confirm:not([hidden])');
    expect(await focusedId(page)).toBe('confirm-heading');
    expect(await text(page, '#confirm-heading')).toBe('Submit revision 2 for review');
    expect(await text(page, '#confirm-summary')).toMatch(/^2 inputs changed since revision 1\./);
    expect(await text(page, '#confirm-changes tr[data-path="nut.length"]')).toMatch(/Engaged nut length\s+60 mm\s+70 mm/);
    expect(await text(page, '#confirm-changes tr[data-path="load.axial"]')).toMatch(/Axial load\s+18 kN\s+19 kN/);
    expect(await text(page, '#confirm-governing')).toMatch(/^Governing check: .+ \(revision 1: .+\)/);
    await checkPage(page, 'confirm');

    // the note is required: the message at the field, which takes the focus; nothing is stored
    await enterOn(page, '#confirm-submit');
    await page.waitForSelector('#f-note[aria-invalid="true"]');
    expect(await text(page, '#f-note-error')).toMatch(/^Error: Say what changed and why/);
    expect(await focusedId(page)).toBe('f-note');
    expect((await t.call('GET', `/api/v1/calculations/${ids.calculationId}/revisions`)).body.items).toHaveLength(1);
    await page.keyboard.type('Nut lengthened to 70 mm as asked; load raised to 19 kN.');
    await enterOn(page, '#confirm-submit');
    await page.waitForSelector('#saved:not([hidden])');
    expect(await text(page, '#saved')).toContain('Stored as revision 2.');
    revision2 = await page.$eval('#saved', (e) => (e as HTMLElement).dataset.revision!);
    const stored = (await t.call('GET', `/api/v1/revisions/${revision2}`)).body;
    expect(stored).toMatchObject({ revision: 2, note: 'Nut lengthened to 70 mm as asked; load raised to 19 kN.' });
    expect(stored.input.nut.length).toBe('70 mm');
    expect(stored.input.load.axial).toBe('19 kN');
    expect(stored.verdict).not.toBe('blocked'); // the story's revision 2 is one a reviewer may approve

    // after the submission: the note is cleared, the confirmation closed, and no submission is offered until the design changes
    expect(await page.$eval('#f-note', (e) => (e as HTMLTextAreaElement).value)).toBe('');
    expect(await page.$eval('#confirm', (e) => (e as HTMLElement).hidden)).toBe(true);
    expect(await page.$eval('#save-submit', (b) => (b as HTMLButtonElement).disabled)).toBe(true);
    expect(await text(page, '#draft-status')).toBe('Revision 2 is submitted. Change the design to prepare revision 3.');
    await checkPage(page, 'submitted');
  }

  /** No submission of an unchanged design is offered; written differently, the service refuses it (409 naming the revision). */
  async function unchangedSubmissionRefused() {
    const page = await tab(width);
    await page.goto(`${t.baseUrl}/design/calculations/${ids.calculationId}/revise`);
    await signInByKeyboard(page, t.accounts.author.email, t.accounts.author.password);
    await page.waitForSelector('#design:not([hidden])');
    // the draft was overtaken by revision 2: the form starts from revision 2
    expect(await text(page, '#design-context')).toMatch(/^Prefilled from revision 2\./);
    let n = await waitForCurrentEvaluation(page, 0);
    await enterOn(page, '#save-submit');
    await page.waitForSelector('#confirm:not([hidden])');
    expect(await text(page, '#confirm-summary')).toBe('Nothing has changed since revision 2: there is nothing to submit. Change the design, or keep editing.');
    expect(await page.$eval('#confirm-submit', (b) => (b as HTMLElement).hidden)).toBe(true);
    await checkPage(page, 'unchanged');
    await enterOn(page, '#confirm-cancel');
    expect(await focusedId(page)).toBe('save-submit');

    // the same load in newtons is the same design: the page sees a change of text, the service sees none
    await typeInto(page, '#f-load', '19000 N');
    n = await waitForCurrentEvaluation(page, n);
    await enterOn(page, '#save-submit');
    await page.waitForSelector('#confirm:not([hidden])');
    expect(await text(page, '#confirm-changes tr[data-path="load.axial"]')).toMatch(/Axial load\s+19 kN\s+19000 N/);
    await typeInto(page, '#f-note', 'Load restated in newtons.');
    await enterOn(page, '#confirm-submit');
    await page.waitForSelector('#confirm-problem .problem');
    const refusal = await text(page, '#confirm-problem');
    expect(refusal).toContain('Unchanged design');
    expect(refusal).toContain(`equals revision 2 (${revision2})`);
    expect(await focusedId(page)).toBe('confirm-problem');
    expect((await t.call('GET', `/api/v1/calculations/${ids.calculationId}/revisions`)).body.items).toHaveLength(2);
    await checkPage(page, 'unchanged-refused');
  }

  /** The reviewer sees the changes since revision 1 with its decision and comments, chooses a decision, reads their own comment. */
  async function reviewerSeesChanges() {
    const page = await tab(width);
    await page.goto(`${t.baseUrl}/review/revisions/${revision2}`);
    await signInByKeyboard(page, t.accounts.reviewer.email, t.accounts.reviewer.password);
    await page.waitForSelector('#changes:not([hidden])');
    expect(await text(page, '#changes-heading')).toBe('Changes since revision 1');
    expect(await text(page, '#previous-review')).toMatch(/^Revision 1: Rejected by Checking engineer \(test\) at .* UTC\./);
    const said = await text(page, '#previous-remarks');
    expect(said).toContain('Decision comment — Checking engineer (test)');
    expect(said).toContain('The nut is short for this load; lengthen it.');
    expect(said).toMatch(/Comment on input “Nut length” — Checking engineer \(test\), .* UTC: At least 70 mm of engagement, please\./);
    expect(said).toMatch(/Comment on finding friction-source-assumed — .*Book the friction test before the next revision\./);
    // inputs by their names with the values as entered (units included); results with labels and units
    expect(await text(page, '#changes-inputs tr[data-path="nut.length"]')).toMatch(/^Nut length[\s\S]*At least 70 mm of engagement[\s\S]*60 mm\s+70 mm$/);
    expect(await text(page, '#changes-inputs tr[data-path="load.axial"]')).toMatch(/^Axial load\s+18 kN\s+19 kN$/);
    const results = await page.$$eval('#changes-results tbody tr', (rows) => rows.map((r) => (r as HTMLElement).innerText));
    expect(results.length).toBeGreaterThan(0);
    expect(results.some((r) => /\d (N·m|MPa|kN|mm)\b/.test(r))).toBe(true);
    expect(await text(page, '#changes-governing')).toMatch(/^Governing check: .+ \(revision 1: .+\)\. Verdict of the rules:/);
    expect(await page.$eval('#compare-link', (a) => a.getAttribute('href'))).toBe(`/design/calculations/${ids.calculationId}#compare`);
    expect(await page.$$eval('input[name="decision"]:checked', (r) => r.length)).toBe(0);
    await page.waitForSelector('#decision:not([hidden])');
    await page.waitForSelector('#report-body .report-doc h2');
    await checkPage(page, 'review-changes');

    // a comment on a result, by keyboard: the button beside the check's row chooses it in the labelled list
    const stored = (await t.call('GET', `/api/v1/revisions/${revision2}`)).body;
    const result = stored.governing as { id: string; label: string };
    await enterOn(page, `#results tr[data-result="${result.id}"] button.comment-on`);
    expect(await focusedId(page)).toBe('comment-text');
    expect(await page.$eval('#comment-target', (s) => (s as HTMLSelectElement).value)).toBe(`result:${result.id}`);
    await page.keyboard.type('Governing margin: say what it rests on.');
    await enterOn(page, '#comment-submit');
    await page.waitForFunction(() => /^Comment added/.test(document.getElementById('comment-status')!.textContent ?? ''));
    expect(await text(page, '#comment-status')).toBe(`Comment added on result “${result.label}”.`);
    await page.waitForSelector(`#results tr[data-result="${result.id}"] ul.remarks`);
    expect(await text(page, `#results tr[data-result="${result.id}"] th`)).toMatch(/Comment on result .+ — Checking engineer \(test\), .* UTC: Governing margin: say what it rests on\./);
    // a comment on a changed input, chosen in the list by keyboard: shown beside the input in the changes
    await chooseOption(page, '#comment-target', 'field:nut.length');
    await typeInto(page, '#comment-text', '70 mm noted.');
    await enterOn(page, '#comment-submit');
    await page.waitForFunction(() => /70 mm noted\./.test((document.querySelector('#changes-inputs tr[data-path="nut.length"] th') as HTMLElement).innerText));
    // a comment without text is refused at its field, before anything is sent
    await enterOn(page, '#comment-submit');
    await page.waitForSelector('#comment-problem .problem');
    expect(await text(page, '#comment-problem')).toMatch(/Comment: write the comment first/);
    expect(await focusedId(page)).toBe('comment-text');
    const remarks = (await t.call('GET', `/api/v1/revisions/${revision2}`)).body.remarks;
    expect(remarks.map((r: { target: unknown }) => r.target)).toEqual([{ result: result.id }, { field: 'nut.length' }]);
    await checkPage(page, 'review-commented');

    // deciding without choosing: the decision is named in words and takes the focus
    await typeInto(page, '#decision-comment', 'Friction test report still missing.');
    await enterOn(page, '#decision-submit');
    await page.waitForSelector('#decision-problem .problem');
    expect(await text(page, '#decision-problem')).toMatch(/Decision: choose Approve or Reject/);
    expect(await page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.name)).toBe('decision');
    await page.keyboard.press('ArrowDown'); // from Approve to Reject
    expect(await page.$eval('input[value="reject"]', (r) => (r as HTMLInputElement).checked)).toBe(true);
    await typeInto(page, '#signature-password', t.accounts.reviewer.password);
    await enterOn(page, '#decision-submit');
    await page.waitForSelector('#decision-done:not([hidden])');
    expect(await text(page, '#decision-done')).toMatch(/^Revision 2 rejected at .* UTC, signed by Checking engineer \(test\)/);
    // the reviewer's own comment, readable on the page
    await page.waitForFunction(() => !document.getElementById('remarks-section')!.hidden);
    await page.waitForFunction(() => document.querySelectorAll('#remarks li').length === 3);
    expect(await text(page, '#remarks li:last-child')).toMatch(/^Decision comment — Checking engineer \(test\), .* UTC: Friction test report still missing\.$/);
    expect(await text(page, '#remarks li:first-child')).toMatch(new RegExp(`^Comment on result “${result.label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}” — `));
    await checkPage(page, 'review-decided');
  }

  it('a draft saved, changed and submitted; an unchanged submission refused; the reviewer sees the changes since the previous revision and its comments, comments on a result and an input by keyboard [PUT /api/v1/calculations/:id/draft, POST /api/v1/calculations/:id/revisions, POST /api/v1/revisions/:id/decisions]', async () => {
    ids = await rejectedFirstRevision(`DS-${width}`);
    await draftSavedChangedSubmitted();
    await unchangedSubmissionRefused();
    await reviewerSeesChanges();
  });

  it('says a blocked revision cannot be approved, lists its blocking findings first and offers only Reject', async () => {
    const product = (await t.call('POST', '/api/v1/products', { code: `DB-${width}`, name: 'Fernhollow fast lift (test product)' })).body;
    const opened = (await t.call('POST', `/api/v1/products/${product.id}/calculations`, { title: 'Fast lift screw', design: blockedDesign })).body;
    expect(opened.verdict).toBe('blocked');
    const page = await tab(width);
    await page.goto(`${t.baseUrl}/review/revisions/${opened.revisionId}`);
    await signInByKeyboard(page, t.accounts.reviewer.email, t.accounts.reviewer.password);
    await page.waitForSelector('#decision:not([hidden])');
    expect(await text(page, '#blocked-notice')).toMatch(/^This revision cannot be approved: \d+ blocking findings? \(.*lifting-self-locking.*\)\. Only a rejection can be recorded/);
    expect(await page.$('input[name="decision"][value="approve"]')).toBeNull();
    expect(await page.$eval('input[value="reject"]', (r) => (r as HTMLInputElement).checked)).toBe(true);
    expect(await text(page, '#decision-submit')).toBe('Reject revision 1');
    const severities = await page.$$eval('#findings li[data-rule]', (items) => items.map((li) => li.className));
    expect(severities[0]).toContain('finding-blocking');
    await checkPage(page, 'review-blocked');
    await typeInto(page, '#decision-comment', 'Not self-locking on lifting duty: add a brake or a single-start thread.');
    await typeInto(page, '#signature-password', t.accounts.reviewer.password);
    await enterOn(page, '#decision-submit');
    await page.waitForSelector('#decision-done:not([hidden])');
    expect((await t.call('GET', `/api/v1/revisions/${opened.revisionId}`)).body.review.state).toBe('rejected');
  });
});


it('keeps an approved revision in sight on the product page when a later one is withdrawn [GET /design/products/:id]', async () => {
  const product = (await t.call('POST', '/api/v1/products', { code: 'DW-1', name: 'Fernhollow service lift (test product)' })).body;
  const opened = (await t.call('POST', `/api/v1/products/${product.id}/calculations`, { title: 'Service screw', design: warningDesign })).body;
  const approved = await t.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, {
    decision: 'approve', acknowledgements: [{ finding: 'friction-source-assumed', comment: 'Range brackets the handbook values.' }],
  }, 'reviewer');
  expect(approved.status).toBe(201);
  const second = (await t.call('POST', `/api/v1/calculations/${opened.calculationId}/revisions`, { design: changedDesign(warningDesign, 'second'), note: 'to be withdrawn' })).body;
  expect((await t.call('POST', `/api/v1/revisions/${second.revisionId}/withdraw`, {})).status).toBe(200);
  const page = await tab(1280);
  await page.goto(`${t.baseUrl}/design/products/${product.id}`);
  await signInByKeyboard(page, t.accounts.author.email, t.accounts.author.password);
  await page.waitForSelector(`#calculations tr[data-calculation="${opened.calculationId}"]`);
  expect(await text(page, `#calculations tr[data-calculation="${opened.calculationId}"]`)).toMatch(/^Service screw\s+2\s+Withdrawn\s+Revision 1: Approved/);
  await checkPageAt(page, 'drafts/product-approved-earlier', [1280]);
});

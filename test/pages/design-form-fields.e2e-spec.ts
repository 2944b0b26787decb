/**
 * The design form's fields as a reader meets them, in real Chromium against the real service: no placeholder text
 * that looks entered; a library default shown under its field as a labelled default with its value and source (the
 * material library's own, as GET /api/v1/materials answers it); the library material by name with its id; the
 * results dimmed with the reason while a field is marked wrong; the caution once; printing shows the inputs with the
 * results.
 */
import type { Page } from 'puppeteer-core';
import { formatQuantity } from '@leadline/presentation';
import { screenshot } from '../support/artifacts';
import { testBrowser, type TestBrowser } from '../support/browser';
import { readmeJack } from '../support/designs';
import { signInByKeyboard, tabTo, typeInto } from '../support/keyboard';
import { startPagesApp, type PagesApp } from './pages-app';

let t: PagesApp;
let browser: TestBrowser;
let productId: string;
let materials: { nuts: any[]; screws: any[] };

beforeAll(async () => {
  t = await startPagesApp();
  productId = (await t.call('POST', '/api/v1/products', { code: 'FF-1', name: 'Fenwold bench jack (test product)' })).body.id;
  materials = (await t.call('GET', '/api/v1/materials')).body;
  browser = await testBrowser();
}, 60_000);

afterAll(async () => {
  await browser?.close();
  await t?.close();
});

const text = (page: Page, selector: string) => page.$eval(selector, (e) => (e as HTMLElement).innerText.trim());

it('shows library defaults as labelled defaults, materials by name, dimmed results while a field is wrong, one caution, and prints inputs with results [GET /design/products/:id/new]', async () => {
  const page = await browser.newPage();
  await page.setViewport({ width: 1280, height: 900 });
  // the README jack handed over as the screw search hands over a design (lib-draft.js)
  await page.evaluateOnNewDocument((design: string) => {
    if (!sessionStorage.getItem('handed')) {
      sessionStorage.setItem('leadline.designDraft', JSON.stringify({ design: JSON.parse(design), origin: 'test' }));
      sessionStorage.setItem('handed', '1');
    }
  }, JSON.stringify(readmeJack));
  await page.goto(`${t.baseUrl}/design/products/${productId}/new`);
  await signInByKeyboard(page, t.accounts.author.email, t.accounts.author.password);
  await page.waitForSelector('#design:not([hidden])');
  await page.waitForFunction(() => (document.getElementById('f-size') as HTMLInputElement).value === 'Tr 40x7');
  await page.waitForSelector('#results-body:not([hidden])');

  // No field carries placeholder text
  expect(await page.$$eval('#design-form input, #design-form textarea', (xs) => xs.filter((x) => x.hasAttribute('placeholder')).map((x) => x.id))).toEqual([]);

  // The materials by name, with the library id as the detail
  const bronze = materials.nuts.find((m) => m.id === 'bronze');
  const steel = materials.screws.find((m) => m.id === 'steel-1045-cd');
  expect(await text(page, '#f-nut-material-name')).toBe(`Library material: ${bronze.name} (id bronze).`);
  expect(await text(page, '#f-screw-material-name')).toBe(`Library material: ${steel.name} (id steel-1045-cd).`);

  // Defaults: the library's value and source, labelled as the default of an empty field
  const screwYield = await text(page, '#f-screw-yield-default');
  expect(screwYield).toBe(`Default (left empty): ${formatQuantity(steel.yieldStrength, 'stress', 'SI')} · source: ${steel.source} (${steel.name})`);
  const nutPressure = await text(page, '#f-nut-p-default');
  expect(nutPressure.startsWith('Default (left empty): ')).toBe(true);
  for (const step of bronze.pressureBySpeed.filter((s: any) => s.allowablePressure !== null)) {
    expect(nutPressure).toContain(formatQuantity(step.allowablePressure, 'pressure', 'SI'));
  }
  expect(nutPressure).toContain(bronze.pressureBySpeed[0].source);
  // the described fields name their default line
  expect(await page.$eval('#f-screw-yield', (i) => i.getAttribute('aria-describedby'))).toContain('f-screw-yield-default');
  // a value typed replaces the default, and the line says so
  await typeInto(page, '#f-screw-yield', '480 MPa');
  await page.waitForFunction(() => document.getElementById('f-screw-yield-default')!.textContent!.startsWith('Library value, replaced by yours: '));

  // The caution once on the page
  expect(await page.$$eval('.caution', (xs) => xs.length)).toBe(1);

  // A wrong entry: marked at its field, the results dimmed with the reason
  await typeInto(page, '#f-load', '18 kg');
  await tabTo(page, '#f-sense');
  await page.waitForSelector('#f-load[aria-invalid="true"]');
  // dimmed by a grey ground (the text keeps its contrast), with the reason after the status line
  expect(await page.$eval('#results-body', (b) => getComputedStyle(b).backgroundColor)).toBe('rgb(236, 239, 242)');
  expect(await page.$eval('#results-status', (s) => getComputedStyle(s, '::after').content)).toContain('dimmed');
  expect(await text(page, '#results-status')).toMatch(/^Not evaluated: 1 field to correct/);
  await screenshot(page, 'design/form-field-wrong');
  await typeInto(page, '#f-load', '18 kN');
  await tabTo(page, '#f-sense');
  await page.waitForFunction(() => document.querySelector('#f-load[aria-invalid="true"]') === null);
  expect(await page.$eval('#results-body', (b) => getComputedStyle(b).backgroundColor)).toBe('rgba(0, 0, 0, 0)');

  // Printing: the inputs and the results together, without the buttons
  await page.emulateMediaType('print');
  const printed = await page.evaluate(() => ({
    form: getComputedStyle(document.getElementById('design-form')!).display,
    results: getComputedStyle(document.getElementById('results-body')!).display,
    load: (document.getElementById('f-load') as HTMLInputElement).offsetParent !== null,
    buttons: Array.from(document.querySelectorAll('#design-form button')).filter((b) => (b as HTMLElement).offsetParent !== null).length,
  }));
  expect(printed).toEqual({ form: 'block', results: expect.not.stringMatching(/^none$/), load: true, buttons: 0 });
  await screenshot(page, 'design/form-print');
  await page.emulateMediaType('screen');
  await page.close();
});

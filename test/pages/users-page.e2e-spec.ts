/**
 * The admins' users page in real Chromium, by keyboard only: sign in through the sign-in page, create a user (the
 * activation code shown once, never a password), set roles, deactivate and reactivate, start a password reset,
 * issue and revoke a token; every change is an identity event. axe-core and the no-sideways-scroll check at 390, 768,
 * 1280 and 1920 px. A user without the admin role is refused by the API the page reads.
 */
import type { Page } from 'puppeteer-core';
import { seriousViolations } from '../support/axe';
import { testBrowser, type TestBrowser } from '../support/browser';
import { signInByKeyboard, tabTo, typeInto } from '../support/keyboard';
import { checkPage, fitsWidth } from '../support/page-checks';
import { startPagesApp, type PagesApp } from './pages-app';

let t: PagesApp;
let browser: TestBrowser;
const admin = { email: 'administrator@pages.example.com', password: 'the administrator password (test)' };

beforeAll(async () => {
  t = await startPagesApp();
  browser = await testBrowser();
  // an admin with an account: created by the bootstrap admin, activated by themselves
  const created = await t.call('POST', '/api/v1/users', { name: 'Administrator (test account)', email: admin.email, roles: ['admin'] }, 'admin');
  expect((await fetch(`${t.baseUrl}/api/v1/account/activate`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ activationCode: created.body.activationCode, password: admin.password }) })).status).toBe(200);
});
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

const text = (page: Page, selector: string) => page.$eval(selector, (e) => (e as HTMLElement).innerText);
const user = async (email: string) => (await t.call('GET', '/api/v1/users', undefined, 'admin')).body.items.find((u: { email: string }) => u.email === email);

async function press(page: Page, selector: string): Promise<void> {
  await tabTo(page, selector);
  await page.keyboard.press('Enter');
}

it('lets an admin manage users by keyboard only, each change an identity event [GET /admin/users]', async () => {
  const page = await browser.newPage();
  await page.goto(`${t.baseUrl}/admin/users`);
  await signInByKeyboard(page, admin.email, admin.password);
  await page.waitForSelector('#users:not([hidden])');
  expect(await page.$eval('#nav-users', (a) => (a as HTMLElement).hidden)).toBe(false);
  await checkPage(page, 'admin/users', [1280, 390, 768, 1920]);

  // create: a refused email is named at its field; then the activation code appears, once
  await typeInto(page, '#u-name', 'Third checker (page test)');
  await typeInto(page, '#u-email', 'not an email');
  await tabTo(page, '#create-form input[value="reviewer"]');
  await page.keyboard.press('Space');
  await press(page, '#create-submit');
  await page.waitForSelector('#u-email[aria-invalid="true"]');
  await typeInto(page, '#u-email', 'third.checker@pages.example.com');
  await press(page, '#create-submit');
  await page.waitForSelector('#activation-code');
  expect(await text(page, '#activation-code')).toMatch(/^act_/);
  expect(await text(page, '#create-done')).toContain('shown once');
  const created = await user('third.checker@pages.example.com');
  expect(created).toMatchObject({ name: 'Third checker (page test)', roles: ['reviewer'], active: true, hasPassword: false });
  await page.waitForSelector(`#users tr[data-user="${created.id}"]`);

  // manage: roles, deactivation, reactivation, password reset, a token issued and revoked
  await press(page, `#users button[data-user="${created.id}"]`);
  await page.waitForSelector('#manage:not([hidden])');
  expect(await text(page, '#manage-heading')).toBe('Third checker (page test) (third.checker@pages.example.com)');
  await tabTo(page, '#roles-form input[value="author"]');
  await page.keyboard.press('Space');
  await press(page, '#roles-save');
  await page.waitForFunction(() => document.getElementById('manage-status')!.textContent!.startsWith('Roles saved'));
  expect((await user('third.checker@pages.example.com')).roles).toEqual(['author', 'reviewer']);
  // the status line changes once the panel shows the new state
  const status = (starts: string) => page.waitForFunction((s) => document.getElementById('manage-status')!.textContent!.startsWith(s), {}, starts);
  await press(page, '#toggle-active');
  await status('Deactivated');
  expect(await text(page, '#toggle-active')).toBe('Reactivate');
  expect((await user('third.checker@pages.example.com')).active).toBe(false);
  await press(page, '#toggle-active');
  await status('Reactivated');
  expect(await text(page, '#toggle-active')).toBe('Deactivate');
  await press(page, '#password-reset');
  await page.waitForSelector('#reset-code');
  expect(await text(page, '#reset-code')).toMatch(/^act_/);
  await press(page, '#issue-token');
  await page.waitForSelector('#issued-token');
  expect(await text(page, '#issued-token')).toMatch(/^ll_/);
  await page.waitForSelector('#tokens:not([hidden])');
  await press(page, '#tokens tbody button');
  await page.waitForFunction(() => document.getElementById('manage-status')!.textContent === 'Token revoked.');
  await page.waitForFunction(() => document.querySelector('#tokens tbody')!.textContent!.includes('Revoked'));
  const events = (await t.call('GET', `/api/v1/identity-events?user=${created.id}`, undefined, 'admin')).body.items.map((e: { type: string }) => e.type);
  expect(events.sort()).toEqual(['activation-issued', 'password-reset-issued', 'role-granted', 'role-granted', 'token-issued', 'token-revoked', 'user-created', 'user-deactivated', 'user-reactivated']);
  expect(await text(page, '#events')).toContain('user-deactivated');
  await checkPage(page, 'admin/users-manage', [1280, 390, 768, 1920]);
  // an admin cannot deactivate themselves: the button is disabled on their own row
  const me = await user(admin.email);
  await press(page, `#users button[data-user="${me.id}"]`);
  await page.waitForFunction((name) => document.getElementById('manage-heading')!.textContent!.startsWith(name), {}, 'Administrator (test account)');
  expect(await page.$eval('#toggle-active', (b) => (b as HTMLButtonElement).disabled)).toBe(true);
});

it('shows a user without the admin role the refusal, and no Users link', async () => {
  const page = await browser.newPage({ width: 390, height: 844 });
  await page.goto(`${t.baseUrl}/admin/users`);
  await signInByKeyboard(page, t.accounts.author.email, t.accounts.author.password);
  await page.waitForSelector('#users-problem .problem');
  expect(await text(page, '#users-problem')).toMatch(/Not permitted[\s\S]*HTTP 403/);
  expect(await page.$eval('#nav-users', (a) => (a as HTMLElement).hidden)).toBe(true);
  expect(await seriousViolations(page)).toEqual([]);
  expect(await fitsWidth(page)).toBe(true);
});

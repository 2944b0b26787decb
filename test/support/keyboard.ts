/** Keyboard-only driving of a page in the Chromium tests: reach a field by Tab, type into it, choose an option. */
import type { Page } from 'puppeteer-core';

/** Presses Tab until the focused element matches `selector`; names the focus path when it is never reached. */
export async function tabTo(page: Page, selector: string, max = 200): Promise<void> {
  for (let i = 0; i < max; i++) {
    if (await page.evaluate((s) => document.activeElement?.matches(s) ?? false, selector)) return;
    await page.keyboard.press('Tab');
  }
  const seen: string[] = [];
  for (let i = 0; i < 60; i++) {
    seen.push(await page.evaluate(() => document.activeElement?.id || document.activeElement?.tagName || '?'));
    await page.keyboard.press('Tab');
  }
  throw new Error(`${selector} not reached by Tab; focus went through ${[...new Set(seen)].join(' ')}`);
}

/** Tabs to a field, selects what it holds and types the new text. */
export async function typeInto(page: Page, selector: string, text: string): Promise<void> {
  await tabTo(page, selector);
  await page.keyboard.down('Control');
  await page.keyboard.press('a');
  await page.keyboard.up('Control');
  await page.keyboard.press('Backspace');
  await page.keyboard.type(text);
}

/** Chooses an option of a select by keyboard (Home, then ArrowDown to its index). */
export async function chooseOption(page: Page, selector: string, value: string): Promise<void> {
  await tabTo(page, selector);
  const index = await page.$eval(selector, (s, v) => Array.from((s as HTMLSelectElement).options).findIndex((o) => o.value === v), value);
  expect(index).toBeGreaterThanOrEqual(0);
  await page.keyboard.press('Home');
  for (let i = 0; i < index; i++) await page.keyboard.press('ArrowDown');
  expect(await page.$eval(selector, (s) => (s as HTMLSelectElement).value)).toBe(value);
}

/**
 * Signs in on the sign-in page a page sent this tab to (its own /sign-in?next=...), by keyboard only, and waits for
 * the page it came from to show its content.
 */
export async function signInByKeyboard(page: Page, email: string, password: string): Promise<void> {
  await page.waitForSelector('#sign-in-form');
  expect(new URL(page.url()).pathname).toBe('/sign-in');
  await typeInto(page, '#email-input', email);
  await typeInto(page, '#password-input', password);
  await Promise.all([page.waitForNavigation(), page.keyboard.press('Enter')]);
  await page.waitForSelector('#content:not([hidden])');
}

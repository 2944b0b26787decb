/**
 * Chromium for a test file: the integration run's one browser (test/support/global-setup.ts), in a browser context of
 * the file's own (its own cookies and storage), or a browser launched for the file when the file runs without the
 * global setup. Closing disconnects from the shared browser and leaves it running.
 */
import puppeteer, { type Browser, type BrowserContext, type Page } from 'puppeteer-core';
import { CHROMIUM_FLAGS } from '../../apps/api/src/infra/pdf/browser-pool';
import { chromiumEndpoint } from './run-resources';

export interface TestBrowser {
  readonly browser: Browser;
  /** The file's own context: pages opened here share cookies and storage with each other only */
  readonly context: BrowserContext;
  newPage(viewport?: { width: number; height: number }): Promise<Page>;
  close(): Promise<void>;
}

export async function testBrowser(): Promise<TestBrowser> {
  const endpoint = chromiumEndpoint();
  const browser = endpoint
    ? await puppeteer.connect({ browserWSEndpoint: endpoint })
    : await puppeteer.launch({ executablePath: process.env.LEADLINE_CHROMIUM_PATH ?? '/usr/bin/chromium', args: [...CHROMIUM_FLAGS], headless: true });
  const context = await browser.createBrowserContext();
  return {
    browser,
    context,
    async newPage(viewport = { width: 1280, height: 900 }) {
      const page = await context.newPage();
      await page.setViewport(viewport);
      return page;
    },
    async close() {
      await context.close().catch(() => undefined);
      if (endpoint) await browser.disconnect();
      else await browser.close();
    },
  };
}

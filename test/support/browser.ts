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
  /** The file's first context (pages opened with { shared: true } share it) */
  readonly context: BrowserContext;
  /**
   * A tab in a browser context of its own (its own cookies, so each signed-in user has their own session), or with
   * { shared: true } in the file's first context
   */
  newPage(viewport?: { width: number; height: number }, options?: { shared?: boolean }): Promise<Page>;
  /** Every cookie of every context this file opened */
  cookies(): Promise<Awaited<ReturnType<BrowserContext['cookies']>>>;
  close(): Promise<void>;
}

export async function testBrowser(): Promise<TestBrowser> {
  const endpoint = chromiumEndpoint();
  const browser = endpoint
    ? await puppeteer.connect({ browserWSEndpoint: endpoint })
    : await puppeteer.launch({ executablePath: process.env.LEADLINE_CHROMIUM_PATH ?? '/usr/bin/chromium', args: [...CHROMIUM_FLAGS], headless: true });
  const context = await browser.createBrowserContext();
  const contexts = [context];
  return {
    browser,
    context,
    async newPage(viewport = { width: 1280, height: 900 }, options = {}) {
      let own = context;
      if (!options.shared) {
        own = await browser.createBrowserContext();
        contexts.push(own);
      }
      const page = await own.newPage();
      await page.setViewport(viewport);
      return page;
    },
    async cookies() {
      return (await Promise.all(contexts.map((c) => c.cookies()))).flat();
    },
    async close() {
      for (const c of contexts) await c.close().catch(() => undefined);
      if (endpoint) await browser.disconnect();
      else await browser.close();
    },
  };
}

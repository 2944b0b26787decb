/**
 * Waiting on a page's requests by events, never by time: which requests a page started, and a barrier that returns
 * once every request the page started before it has finished (or failed).
 */
import type { HTTPRequest, Page } from 'puppeteer-core';

export interface RequestLog {
  /** Requests started so far that match */
  readonly started: readonly HTTPRequest[];
  /**
   * Resolves once every matching request the page started before this call has finished or failed. The page itself
   * sends one more request first (GET /health), so a request started by an earlier event of the page (a key press
   * that was already dispatched) has been seen by then.
   */
  settle(): Promise<void>;
  stop(): void;
}

export function logRequests(page: Page, match: (r: HTTPRequest) => boolean): RequestLog {
  const started: HTTPRequest[] = [];
  const settled = new Set<HTTPRequest>();
  let wake: (() => void) | null = null;
  const onRequest = (r: HTTPRequest) => {
    if (match(r)) started.push(r);
  };
  const onSettled = (r: HTTPRequest) => {
    settled.add(r);
    wake?.();
  };
  page.on('request', onRequest);
  page.on('requestfinished', onSettled);
  page.on('requestfailed', onSettled);
  return {
    started,
    async settle() {
      await page.evaluate(() => fetch('/health', { cache: 'no-store' }).then(() => undefined));
      while (started.some((r) => !settled.has(r))) await new Promise<void>((resolve) => (wake = resolve));
      wake = null;
    },
    stop() {
      page.off('request', onRequest);
      page.off('requestfinished', onSettled);
      page.off('requestfailed', onSettled);
    },
  };
}

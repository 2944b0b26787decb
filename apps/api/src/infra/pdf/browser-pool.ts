/**
 * HTML -> PDF with one shared headless Chromium and a small pool of pages.
 *
 * The browser is launched on first use and reused; at most `pageCount` pages render at once and further
 * requests wait in a queue, so load never launches more browsers. If the browser crashes or disconnects,
 * the next request launches a new one (and a request caught mid-render by the crash is retried once).
 * Pages run without JavaScript and with every network request blocked except data: URLs, so a report
 * can fetch nothing from anywhere.
 */
import puppeteer, { type Browser, type BrowserContext, type HTTPRequest, type Page } from 'puppeteer-core';

/**
 * Launch flags for Debian's chromium in a container (see docs/STACK-NOTES: never download a browser).
 * `--no-sandbox` is added only where the sandbox cannot run (as root, or LEADLINE_CHROMIUM_SANDBOX=false).
 */
export const CHROMIUM_BASE_FLAGS: readonly string[] = [
  '--headless',
  '--disable-gpu',
  '--disable-dev-shm-usage',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

/** The flags for this process by default: the sandbox is kept unless running as root (where Chromium refuses it). */
export const CHROMIUM_FLAGS: readonly string[] = [...CHROMIUM_BASE_FLAGS, ...(process.getuid?.() === 0 ? ['--no-sandbox'] : [])];

export interface PdfRendererOptions {
  /** Chromium binary, e.g. /usr/bin/chromium */
  readonly executablePath: string;
  /** Pages rendering at once (default 2) */
  readonly pageCount?: number;
  /** Timeout of one page operation (setContent, pdf) [ms], default 30 000 */
  readonly timeoutMs?: number;
  /** Requests that may wait for a free page; one more is refused with PdfBusyError (default unbounded) */
  readonly queueLimit?: number;
  /** Longest wait for a free page before PdfBusyError [ms] (default unbounded) */
  readonly queueWaitMs?: number;
  /**
   * Chromium's sandbox: true keeps it (launch fails where the kernel or root forbids it), false adds --no-sandbox,
   * 'auto' (default) keeps it unless running as root, and falls back to --no-sandbox if a sandboxed launch fails.
   */
  readonly sandbox?: boolean | 'auto';
  /**
   * DevTools WebSocket address of a Chromium that runs already (a browser container, or the test run's one browser):
   * the renderer connects to it instead of launching one, renders in a browser context of its own and, when closed,
   * closes that context and disconnects, leaving the browser running.
   */
  readonly browserWSEndpoint?: string;
}

/** The pool cannot take the request now: its queue is full or the wait ran out. Try again after `retryAfterSeconds`. */
export class PdfBusyError extends Error {
  constructor(
    readonly reason: 'queue-full' | 'wait-exceeded',
    readonly retryAfterSeconds: number,
  ) {
    super(reason === 'queue-full' ? 'the PDF queue is full' : 'no page became free in time');
  }
}

/** The caller gave up (its AbortSignal fired, e.g. the client disconnected): the work was not done or was stopped. */
export class PdfCancelledError extends Error {
  constructor() {
    super('the PDF request was cancelled');
  }
}

interface Waiter {
  wake(): void;
  fail(err: Error): void;
}

export interface PdfRenderOptions {
  readonly format: 'A4' | 'Letter';
  /** Printed at the top of every page, e.g. product, calculation id and revision */
  readonly headerLabel: string;
  /** Printed at the bottom left of every page (a caution line, for instance) */
  readonly footerNote?: string;
  /** Abandons the request: removed from the queue, or its page closed mid-render (PdfCancelledError) */
  readonly signal?: AbortSignal;
}

/** Page margins; the running header and footer are drawn inside the top and bottom margins. */
export const PDF_MARGIN = { top: '17mm', bottom: '16mm', left: '15mm', right: '15mm' } as const;

const escapeHtml = (s: string): string =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

const RUNNING_STYLE =
  "width:100%;margin:0 15mm;font-family:'Liberation Sans','DejaVu Sans',sans-serif;font-size:7.2pt;color:#3d4650;" +
  'display:flex;justify-content:space-between;gap:6mm;-webkit-print-color-adjust:exact;';

function headerTemplate(label: string): string {
  return (
    `<div style="${RUNNING_STYLE}padding-bottom:1.5mm;border-bottom:0.5pt solid #9aa3ad;">` +
    `<span style="overflow:hidden;text-overflow:ellipsis;white-space:nowrap;">${escapeHtml(label)}</span>` +
    `<span style="white-space:nowrap;">Page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`
  );
}

function footerTemplate(label: string, note: string | undefined): string {
  return (
    `<div style="${RUNNING_STYLE}padding-top:1.5mm;border-top:0.5pt solid #9aa3ad;">` +
    `<span style="flex:1 1 auto;">${escapeHtml(note ?? label)}</span>` +
    `<span style="white-space:nowrap;flex:0 0 auto;">Page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`
  );
}

export class PdfRenderer {
  private readonly executablePath: string;
  private readonly pageCount: number;
  private readonly timeoutMs: number;
  private browser: Browser | null = null;
  private launching: Promise<Browser> | null = null;
  private idle: Page[] = [];
  private slotsInUse = 0;
  private readonly waiting: Waiter[] = [];
  private readonly queueLimit: number;
  private readonly queueWaitMs: number;
  private readonly sandboxMode: boolean | 'auto';
  private sandboxFailed = false;
  private sandboxedLaunch: boolean | null = null;
  private launches = 0;
  private closed = false;
  private cancellations = 0;
  private readonly endpoint: string | null;
  /** The renderer's own context in a browser it connected to (null when it launched the browser) */
  private context: BrowserContext | null = null;
  /** Running mean of one job's duration [ms], for Retry-After */
  private meanJobMs = 2000;

  constructor(options: PdfRendererOptions) {
    this.executablePath = options.executablePath;
    this.pageCount = Math.max(1, Math.floor(options.pageCount ?? 2));
    this.timeoutMs = options.timeoutMs ?? 30_000;
    this.queueLimit = Math.max(0, Math.floor(options.queueLimit ?? Number.POSITIVE_INFINITY));
    this.queueWaitMs = options.queueWaitMs ?? Number.POSITIVE_INFINITY;
    this.sandboxMode = options.sandbox ?? 'auto';
    this.endpoint = options.browserWSEndpoint ?? null;
  }

  /** Whether the current browser runs with Chromium's sandbox (null before the first launch). */
  get sandboxed(): boolean | null {
    return this.sandboxedLaunch;
  }

  /** The flags the next launch uses. */
  launchArgs(): string[] {
    const keep = this.sandboxMode === true || (this.sandboxMode === 'auto' && !this.sandboxFailed && process.getuid?.() !== 0);
    return [...CHROMIUM_BASE_FLAGS, ...(keep ? [] : ['--no-sandbox'])];
  }

  /** Requests given up by their caller (while waiting or mid-render). */
  get cancelled(): number {
    return this.cancellations;
  }

  /** Whether a request arriving now would be refused because the queue is full (check before costly preparation). */
  get full(): boolean {
    return this.slotsInUse >= this.pageCount && this.waiting.length >= this.queueLimit;
  }

  /** Seconds after which a refused request may expect a free page. */
  retryAfterSeconds(): number {
    return Math.max(1, Math.ceil((this.meanJobMs * (this.waiting.length / this.pageCount + 1)) / 1000));
  }

  /** How many times a browser was launched (1 unless one crashed). */
  get browserLaunches(): number {
    return this.launches;
  }

  /** Process id of the current browser, or null before the first launch and after a crash or close. */
  get pid(): number | null {
    return this.browser?.connected ? (this.browser.process()?.pid ?? null) : null;
  }

  /** Requests waiting for a free page. */
  get queued(): number {
    return this.waiting.length;
  }

  /** Prints HTML to PDF with running header and footer ("page X of Y"). */
  async render(html: string, options: PdfRenderOptions): Promise<Buffer> {
    return this.withPage(async (page) => {
      await page.setContent(html, { waitUntil: 'load', timeout: this.timeoutMs });
      const pdf = await page.pdf({
        format: options.format,
        printBackground: true,
        displayHeaderFooter: true,
        headerTemplate: headerTemplate(options.headerLabel),
        footerTemplate: footerTemplate(options.headerLabel, options.footerNote),
        margin: PDF_MARGIN,
        timeout: this.timeoutMs,
      });
      return Buffer.from(pdf);
    }, options.signal);
  }

  /**
   * Runs `work` on a pooled page (JavaScript off, network blocked except data: URLs). Waits for a free page
   * when all are busy. If the browser dies during `work`, `work` runs once more on a fresh browser, so it
   * must be safe to repeat. For tests and benchmarks; leave the page as you found it (viewport, content).
   */
  async withPage<T>(work: (page: Page) => Promise<T>, signal?: AbortSignal): Promise<T> {
    this.assertOpen();
    if (signal?.aborted) throw this.cancel();
    await this.acquireSlot(signal);
    const started = Date.now();
    try {
      for (let attempt = 0; ; attempt++) {
        this.assertOpen();
        if (signal?.aborted) throw this.cancel();
        const page = await this.takePage();
        if (signal?.aborted) {
          this.returnPage(page);
          throw this.cancel();
        }
        // A caller that goes away mid-render closes its page: Chromium stops, the slot frees at once.
        const stop = () => void page.close().catch(() => undefined);
        signal?.addEventListener('abort', stop, { once: true });
        try {
          const result = await work(page);
          if (signal?.aborted) throw new PdfCancelledError();
          this.returnPage(page);
          return result;
        } catch (err) {
          if (signal?.aborted) {
            await page.close().catch(() => undefined);
            throw this.cancel();
          }
          const browser = page.browser();
          const gone = !browser.connected || page.isClosed() || this.processExited(browser);
          if (gone) this.forget(browser);
          else await page.close().catch(() => undefined);
          if (gone && attempt === 0 && !this.closed) continue;
          throw err;
        } finally {
          signal?.removeEventListener('abort', stop);
        }
      }
    } finally {
      this.meanJobMs = 0.8 * this.meanJobMs + 0.2 * (Date.now() - started);
      this.releaseSlot();
    }
  }

  private cancel(): PdfCancelledError {
    this.cancellations++;
    return new PdfCancelledError();
  }

  /** Closes the browser; later renders are refused. */
  async close(): Promise<void> {
    this.closed = true;
    const browser = this.browser ?? (await this.launching?.catch(() => null)) ?? null;
    this.browser = null;
    this.idle = [];
    for (const waiter of this.waiting.splice(0)) waiter.wake();
    if (browser && this.endpoint) {
      await this.context?.close().catch(() => undefined);
      this.context = null;
      await browser.disconnect().catch(() => undefined);
    } else if (browser) await browser.close().catch(() => browser.process()?.kill('SIGKILL'));
  }

  // -------------------------------------------------------------------------------------------------------

  private assertOpen(): void {
    if (this.closed) throw new Error('PdfRenderer is closed');
  }

  private async acquireSlot(signal?: AbortSignal): Promise<void> {
    if (this.slotsInUse < this.pageCount) {
      this.slotsInUse++;
      return;
    }
    if (this.waiting.length >= this.queueLimit) throw new PdfBusyError('queue-full', this.retryAfterSeconds());
    // The releasing request hands its slot over directly, so the count stays put.
    await new Promise<void>((resolve, reject) => {
      let timer: NodeJS.Timeout | undefined;
      const leave = () => {
        const i = this.waiting.indexOf(waiter);
        if (i >= 0) this.waiting.splice(i, 1);
        if (timer) clearTimeout(timer);
        signal?.removeEventListener('abort', onAbort);
      };
      const waiter: Waiter = {
        wake: () => {
          leave();
          resolve();
        },
        fail: (err) => {
          leave();
          reject(err);
        },
      };
      const onAbort = () => waiter.fail(this.cancel());
      if (Number.isFinite(this.queueWaitMs)) timer = setTimeout(() => waiter.fail(new PdfBusyError('wait-exceeded', this.retryAfterSeconds())), this.queueWaitMs);
      signal?.addEventListener('abort', onAbort, { once: true });
      this.waiting.push(waiter);
    });
  }

  private releaseSlot(): void {
    const next = this.waiting.shift();
    if (next) next.wake();
    else this.slotsInUse = Math.max(0, this.slotsInUse - 1);
  }

  private processExited(browser: Browser): boolean {
    const proc = browser.process();
    return proc !== null && (proc.exitCode !== null || proc.signalCode !== null);
  }

  private async ensureBrowser(): Promise<Browser> {
    const current = this.browser;
    if (current && current.connected && !this.processExited(current)) return current;
    if (current) this.forget(current);
    this.launching ??= this.launch().finally(() => (this.launching = null));
    return this.launching;
  }

  private async launch(): Promise<Browser> {
    if (this.endpoint) return this.connect(this.endpoint);
    const args = this.launchArgs();
    const sandboxed = !args.includes('--no-sandbox');
    let browser: Browser;
    try {
      browser = await puppeteer.launch({
        executablePath: this.executablePath,
        headless: true,
        args,
        protocolTimeout: Math.max(this.timeoutMs * 2, 60_000),
      });
    } catch (err) {
      // 'auto': the kernel refused the sandbox (no user namespaces, seccomp): run without it rather than not at all
      if (this.sandboxMode === 'auto' && sandboxed) {
        this.sandboxFailed = true;
        return this.launch();
      }
      throw err;
    }
    this.sandboxedLaunch = sandboxed;
    this.launches++;
    browser.once('disconnected', () => this.forget(browser));
    if (this.closed) {
      await browser.close().catch(() => undefined);
      throw new Error('PdfRenderer is closed');
    }
    this.browser = browser;
    return browser;
  }

  /** Connects to a running browser and opens this renderer's own context in it. */
  private async connect(endpoint: string): Promise<Browser> {
    const browser = await puppeteer.connect({ browserWSEndpoint: endpoint, protocolTimeout: Math.max(this.timeoutMs * 2, 60_000) });
    const context = await browser.createBrowserContext();
    this.launches++;
    browser.once('disconnected', () => this.forget(browser));
    if (this.closed) {
      await context.close().catch(() => undefined);
      await browser.disconnect().catch(() => undefined);
      throw new Error('PdfRenderer is closed');
    }
    this.context = context;
    this.browser = browser;
    return browser;
  }

  /** Drops a dead (or dying) browser and its pages; the next request launches a new one. */
  private forget(browser: Browser): void {
    if (this.browser !== browser) return;
    this.browser = null;
    this.idle = [];
    if (this.endpoint) {
      // a browser this renderer does not own: leave it running, drop only the connection
      this.context = null;
      if (browser.connected) void browser.disconnect().catch(() => undefined);
      return;
    }
    if (browser.connected) void browser.close().catch(() => undefined);
    const proc = browser.process();
    if (proc && proc.exitCode === null && proc.signalCode === null) proc.kill('SIGKILL');
  }

  private async takePage(): Promise<Page> {
    const browser = await this.ensureBrowser();
    while (this.idle.length > 0) {
      const page = this.idle.pop() as Page;
      if (!page.isClosed() && page.browser() === browser) return page;
    }
    const page = await (this.context ?? browser).newPage();
    page.setDefaultTimeout(this.timeoutMs);
    await page.setJavaScriptEnabled(false);
    await page.setRequestInterception(true);
    page.on('request', (request: HTTPRequest) => {
      if (request.url().startsWith('data:')) void request.continue();
      else void request.abort('blockedbyclient');
    });
    return page;
  }

  private returnPage(page: Page): void {
    if (!this.closed && !page.isClosed() && page.browser() === this.browser) this.idle.push(page);
    else void page.close().catch(() => undefined);
  }
}

import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { existsSync } from 'node:fs';
import puppeteer from 'puppeteer-core';
import { CHROMIUM_FLAGS, PdfBusyError, PdfCancelledError, PdfRenderer } from '../../apps/api/src/infra/pdf/browser-pool';
import { pdfText } from '../support/pdf-text';

const CHROMIUM = '/usr/bin/chromium';


/** Page size in points from the first MediaBox of the file. */
function mediaBox(pdf: Buffer): [number, number] {
  const m = /\/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]/.exec(pdf.toString('latin1'));
  if (!m) throw new Error('no MediaBox');
  return [Number(m[1]), Number(m[2])];
}

const page = (title: string, extra = ''): string =>
  `<!DOCTYPE html><html><head><meta charset="utf-8"><title>${title}</title></head><body style="font-family:'DejaVu Sans'"><h1>${title}</h1><p>Body text of ${title}.</p>${extra}</body></html>`;

describe('PdfRenderer (real Chromium)', () => {
  let renderer: PdfRenderer;
  let server: Server;
  let hits: string[] = [];
  let origin = '';

  beforeAll(async () => {
    if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is not installed`);
    renderer = new PdfRenderer({ executablePath: CHROMIUM, pageCount: 2 });
    server = createServer((req, res) => {
      hits.push(req.url ?? '');
      res.writeHead(200, { 'content-type': 'text/css' });
      res.end('body { background: red }');
    });
    await new Promise<void>((done) => server.listen(0, '127.0.0.1', done));
    origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  });

  afterAll(async () => {
    await renderer?.close();
    await new Promise<void>((done) => server.close(() => done()));
  });

  it('launches lazily: no browser before the first render', () => {
    expect(renderer.browserLaunches).toBe(0);
    expect(renderer.pid).toBeNull();
  });

  it('prints A4 and Letter pages with the header label and "page X of Y" on every page', async () => {
    const long = page('Long document', '<p>line</p>'.repeat(160));
    const a4 = await renderer.render(long, { format: 'A4', headerLabel: 'CALC-77 · revision 4', footerNote: 'Footer caution line' });
    const letter = await renderer.render(page('Letter document'), { format: 'Letter', headerLabel: 'CALC-77 · revision 4' });
    expect(a4.subarray(0, 5).toString()).toBe('%PDF-');
    const [w, h] = mediaBox(a4);
    // 210 x 297 mm = 595.3 x 841.9 pt; Chromium rounds the paper to 8.27 x 11.7 in (595.9 x 842.4 pt)
    expect(Math.abs(w - 595.3)).toBeLessThan(1);
    expect(Math.abs(h - 841.9)).toBeLessThan(1);
    expect(mediaBox(letter).map(Math.round)).toEqual([612, 792]);
    const { text, pages } = await pdfText(a4);
    expect(pages).toBeGreaterThan(1);
    for (let p = 1; p <= pages; p++) expect(text).toContain(`Page ${p} of ${pages}`);
    expect(text.split('CALC-77 · revision 4').length - 1).toBe(pages);
    expect(text).toContain('Footer caution line');
  });

  it('fetches nothing from the network: only data: URLs load', async () => {
    // The server counts requests; prove it does before relying on a zero count.
    await fetch(`${origin}/probe`);
    expect(hits).toEqual(['/probe']);
    hits = [];
    const html = page(
      'Offline',
      `<link rel="stylesheet" href="${origin}/style.css"><img src="${origin}/pixel.png"><iframe src="${origin}/frame"></iframe>` +
        `<img src="data:image/gif;base64,R0lGODlhAQABAIAAAP///wAAACwAAAAAAQABAAACAkQBADs=">`,
    );
    const pdf = await renderer.render(html, { format: 'A4', headerLabel: 'offline' });
    expect(pdf.length).toBeGreaterThan(1000);
    expect(hits).toEqual([]);
  });

  it('serves 10 concurrent renders from one browser, queueing on its page pool', async () => {
    let active = 0;
    let peak = 0;
    const slow = Array.from({ length: 5 }, () =>
      renderer.withPage(async () => {
        active++;
        peak = Math.max(peak, active);
        await new Promise((r) => setTimeout(r, 50));
        active--;
      }),
    );
    const pdfs = await Promise.all([
      ...Array.from({ length: 10 }, (_, i) => renderer.render(page(`Concurrent ${i}`), { format: i % 2 ? 'Letter' : 'A4', headerLabel: `job ${i}` })),
      ...slow,
    ]);
    expect(peak).toBeLessThanOrEqual(2);
    const texts = await Promise.all(pdfs.slice(0, 10).map((p) => pdfText(p as Buffer)));
    texts.forEach((t, i) => expect(t.text).toContain(`Concurrent ${i}`));
    expect(renderer.browserLaunches).toBe(1);
    expect(renderer.queued).toBe(0);
  });

  it('relaunches the browser after its process is killed', async () => {
    const before = renderer.pid;
    expect(before).not.toBeNull();
    const launches = renderer.browserLaunches;
    process.kill(before as number);
    const pdf = await renderer.render(page('After the crash'), { format: 'A4', headerLabel: 'relaunch' });
    expect((await pdfText(pdf)).text).toContain('After the crash');
    expect(renderer.browserLaunches).toBe(launches + 1);
    expect(renderer.pid).not.toBeNull();
    expect(renderer.pid).not.toBe(before);
  });

  it('refuses to render after close', async () => {
    const own = new PdfRenderer({ executablePath: CHROMIUM, pageCount: 1 });
    await own.close();
    await expect(own.render(page('closed'), { format: 'A4', headerLabel: 'x' })).rejects.toThrow(/closed/);
    expect(own.browserLaunches).toBe(0);
  });
});

describe('PdfRenderer queue: bounded length and wait, cancelled work (real Chromium)', () => {
  let renderer: PdfRenderer;
  afterEach(() => renderer?.close());

  /** Holds a page until released: a render that takes as long as the test wants, without timing anything. */
  function hold(r: PdfRenderer) {
    let release!: () => void;
    const gate = new Promise<void>((done) => (release = done));
    const done = r.withPage(() => gate);
    return { release, done };
  }
  const until = async (cond: () => boolean) => {
    while (!cond()) await new Promise((r) => setTimeout(r, 10));
  };

  it('refuses a request beyond the queue limit with PdfBusyError and a Retry-After estimate', async () => {
    renderer = new PdfRenderer({ executablePath: CHROMIUM, pageCount: 1, queueLimit: 1 });
    const busy = hold(renderer);
    await until(() => renderer.full === false && renderer.queued === 0);
    const waiting = renderer.render(page('queued'), { format: 'A4', headerLabel: 'q' });
    await until(() => renderer.queued === 1);
    expect(renderer.full).toBe(true);
    const refused = await renderer.render(page('refused'), { format: 'A4', headerLabel: 'r' }).catch((e) => e);
    expect(refused).toBeInstanceOf(PdfBusyError);
    expect(refused).toMatchObject({ reason: 'queue-full' });
    expect(refused.retryAfterSeconds).toBeGreaterThanOrEqual(1);
    busy.release();
    await busy.done;
    expect((await pdfText(await waiting)).text).toContain('Body text of queued');
  });

  it('gives up waiting after the wait limit with PdfBusyError', async () => {
    renderer = new PdfRenderer({ executablePath: CHROMIUM, pageCount: 1, queueLimit: 4, queueWaitMs: 100 });
    const busy = hold(renderer);
    const waited = await renderer.render(page('late'), { format: 'A4', headerLabel: 'l' }).catch((e) => e);
    expect(waited).toBeInstanceOf(PdfBusyError);
    expect(waited).toMatchObject({ reason: 'wait-exceeded' });
    expect(renderer.queued).toBe(0);
    busy.release();
    await busy.done;
  });

  it('drops a waiting request whose caller went away, and stops a render mid-way without killing the browser', async () => {
    renderer = new PdfRenderer({ executablePath: CHROMIUM, pageCount: 1, queueLimit: 4 });
    const busy = hold(renderer);
    const gone = new AbortController();
    const waiting = renderer.render(page('abandoned'), { format: 'A4', headerLabel: 'a', signal: gone.signal }).catch((e) => e);
    await until(() => renderer.queued === 1);
    gone.abort();
    expect(await waiting).toBeInstanceOf(PdfCancelledError);
    expect(renderer.queued).toBe(0);
    busy.release();
    await busy.done;
    // mid-render: the page is closed when the signal fires
    const midway = new AbortController();
    const pid = renderer.pid;
    let entered!: () => void;
    const inWork = new Promise<void>((r) => (entered = r));
    const stopped = renderer
      .withPage(async (p) => {
        entered();
        await new Promise<void>((resolve) => p.once('close', () => resolve()));
        return 'finished';
      }, midway.signal)
      .catch((e) => e);
    await inWork;
    midway.abort();
    expect(await stopped).toBeInstanceOf(PdfCancelledError);
    expect(renderer.cancelled).toBe(2);
    // the browser lives on and renders the next request
    expect((await pdfText(await renderer.render(page('after'), { format: 'A4', headerLabel: 'x' }))).text).toContain('Body text of after');
    expect(renderer.pid).toBe(pid);
    expect(renderer.browserLaunches).toBe(1);
  });

  it('keeps the sandbox unless told otherwise or running as root', () => {
    const asRoot = process.getuid?.() === 0;
    expect(new PdfRenderer({ executablePath: CHROMIUM, sandbox: true }).launchArgs()).not.toContain('--no-sandbox');
    expect(new PdfRenderer({ executablePath: CHROMIUM, sandbox: false }).launchArgs()).toContain('--no-sandbox');
    expect(new PdfRenderer({ executablePath: CHROMIUM }).launchArgs().includes('--no-sandbox')).toBe(asRoot);
  });
});

describe('PdfRenderer connected to a running Chromium (LEADLINE_CHROMIUM_WS_ENDPOINT)', () => {
  it('renders in a context of its own and, when closed, leaves the browser running', async () => {
    // a browser of this test's own, so that closing and counting contexts sees no other file's work
    const browser = await puppeteer.launch({ executablePath: CHROMIUM, args: [...CHROMIUM_FLAGS], headless: true });
    try {
      const renderer = new PdfRenderer({ executablePath: '/nonexistent/chromium', browserWSEndpoint: browser.wsEndpoint() });
      // contexts of the whole browser, whichever connection made them
      const cdp = await browser.target().createCDPSession();
      const contexts = async () => ((await cdp.send('Target.getBrowserContexts')) as { browserContextIds: string[] }).browserContextIds.length;
      const before = await contexts();
      const pdf = await renderer.render(page('Rendered remotely'), { format: 'A4', headerLabel: 'connected' });
      expect((await pdfText(pdf)).text).toContain('Rendered remotely');
      expect(await contexts()).toBe(before + 1);
      expect(renderer.pid).toBeNull(); // not its own process
      await renderer.close();
      expect(browser.connected).toBe(true);
      expect(await contexts()).toBe(before);
      expect(await (await browser.newPage()).evaluate(() => 1 + 1)).toBe(2);
    } finally {
      await browser.close();
    }
  });
});

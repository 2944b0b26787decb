import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { existsSync } from 'node:fs';
import { PdfRenderer } from './browser-pool';
import { pdfText } from '../../../../../test/support/pdf-text';

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

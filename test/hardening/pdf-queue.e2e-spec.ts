/**
 * Every PDF route answers 503 problem+json with Retry-After when the PDF queue is full: the design file as the
 * report does (the design file used to answer 500). The queue is filled for real: both pages of the pool held, one
 * client waiting in the queue (its limit is 1) over a real socket.
 */
import { request as httpRequest } from 'node:http';
import { PdfRenderer } from '../../apps/api/src/infra/pdf/browser-pool';
import { clearDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
const ids: Record<string, string> = {};
beforeAll(async () => {
  t = await startTestApp('postgres', { LEADLINE_PDF_QUEUE_LIMIT: '1' }, undefined, { listen: true });
  ids.product = (await t.call('POST', '/api/v1/products', { code: 'PQ-1', name: 'PDF queue test' })).body.id;
  ids.revision = (await t.call('POST', `/api/v1/products/${ids.product}/calculations`, { title: 'screw', design: clearDesign })).body.revisionId;
});
afterAll(() => t?.close());

/** Waits until the renderer's state satisfies a condition (it changes on the service's own events). */
async function until(condition: () => boolean): Promise<void> {
  while (!condition()) await new Promise((r) => setImmediate(r));
}

it('answers 503 with Retry-After from design-file.pdf and report.pdf while the PDF queue is full, and a PDF once it drains', async () => {
  const pdf = t.app.get(PdfRenderer);
  const gates: (() => void)[] = [];
  const held = [0, 1].map(() => pdf.withPage(() => new Promise<void>((release) => gates.push(release))));
  await until(() => gates.length === 2);
  const waiting = httpRequest(new URL(`${t.baseUrl}/api/v1/products/${ids.product}/design-file.pdf`), { headers: { authorization: `Bearer ${t.tokens.author}` } });
  waiting.on('error', () => undefined);
  const waited = new Promise<number>((resolve) => waiting.on('response', (res) => {
    res.resume();
    resolve(res.statusCode ?? 0);
  }));
  waiting.end();
  await until(() => pdf.queued === 1);
  expect(pdf.full).toBe(true);
  for (const url of [`/api/v1/products/${ids.product}/design-file.pdf`, `/api/v1/products/${ids.product}/design-file.pdf?paper=Letter`, `/api/v1/revisions/${ids.revision}/report.pdf`]) {
    const refused = await t.call('GET', url);
    expect([url, refused.status]).toEqual([url, 503]);
    expect(refused.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(Number(refused.headers['retry-after'])).toBeGreaterThanOrEqual(1);
    expect(refused.body).toMatchObject({ status: 503, title: 'PDF rendering busy' });
  }
  for (const release of gates) release();
  await Promise.all(held);
  // the queued design file is rendered once a page is free
  expect(await waited).toBe(200);
  const file = await t.call('GET', `/api/v1/products/${ids.product}/design-file.pdf`);
  expect(file.status).toBe(200);
  expect(file.headers['content-type']).toBe('application/pdf');
});

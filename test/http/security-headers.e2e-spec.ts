/**
 * Attack: get the browser to treat a stored text as active content. report.html prints user text (titles, notes,
 * comments); JSON, problem+json and CSV carry it too. Now the report is served with a sandboxing CSP (no script
 * runs, nothing loads) and every response with X-Content-Type-Options: nosniff. In real Chromium the report still
 * renders its styles and charts under that policy, and a script smuggled into it does not run.
 */
import puppeteer, { type Browser } from 'puppeteer-core';
import { CHROMIUM_FLAGS } from '../../apps/api/src/infra/pdf/browser-pool';
import { clearDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let browser: Browser;
const ids: Record<string, string> = {};

beforeAll(async () => {
  t = await startTestApp('postgres', {}, undefined, { listen: true });
  ids.product = (await t.call('POST', '/api/v1/products', { code: 'SH-1', name: 'Headers <b>test</b>' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${ids.product}/calculations`, { title: '<script>window.pwned=1</script>x', design: clearDesign });
  ids.revision = opened.body.revisionId;
  browser = await puppeteer.launch({ executablePath: '/usr/bin/chromium', args: [...CHROMIUM_FLAGS], headless: true });
});
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

it('serves report.html with a sandboxing Content-Security-Policy and nosniff [GET /api/v1/revisions/:id/report.html]', async () => {
  const res = await t.call('GET', `/api/v1/revisions/${ids.revision}/report.html`);
  expect(res.status).toBe(200);
  expect(res.headers['x-content-type-options']).toBe('nosniff');
  const csp = String(res.headers['content-security-policy']).split(';').map((d) => d.trim());
  expect(csp).toEqual(expect.arrayContaining(["default-src 'none'", 'sandbox', "frame-ancestors 'none'", "base-uri 'none'", "form-action 'none'"]));
  expect(csp.some((d) => d.startsWith('script-src'))).toBe(false); // default-src 'none' covers scripts
  expect(csp.find((d) => d === 'sandbox')).toBe('sandbox'); // no allow-scripts, no allow-same-origin
});

it('sends nosniff with JSON, problem+json, PDF and /health answers', async () => {
  const answers = [
    await t.call('GET', '/api/v1/products'),
    await t.call('GET', `/api/v1/revisions/${ids.revision}`),
    await t.call('GET', '/api/v1/products/00000000-0000-4000-8000-000000000000'),
    await t.call('GET', '/api/v1/products', undefined, { as: 'anonymous', ip: '198.51.100.201' }),
    await t.call('POST', '/api/v1/products', '{"code":', { headers: { 'content-type': 'application/json' } }),
    await t.call('GET', '/health', undefined, { as: 'anonymous' }),
    await t.call('GET', `/api/v1/revisions/${ids.revision}/report.pdf`),
  ];
  expect(answers.map((a) => a.status)).toEqual([200, 200, 404, 401, 400, 200, 200]);
  for (const a of answers) expect(a.headers['x-content-type-options']).toBe('nosniff');
});

it('renders under its policy in Chromium: styles and charts apply, the smuggled script does not run', async () => {
  const page = await browser.newPage();
  const violations: string[] = [];
  page.on('console', (m) => {
    if (/Content Security Policy|Refused to/.test(m.text())) violations.push(m.text());
  });
  await page.setExtraHTTPHeaders({ authorization: `Bearer ${t.tokens.author}` });
  const res = await page.goto(`${t.baseUrl}/api/v1/revisions/${ids.revision}/report.html`, { waitUntil: 'load' });
  expect(res?.status()).toBe(200);
  const state = await page.evaluate(() => ({
    pwned: (window as unknown as { pwned?: number }).pwned ?? null,
    charts: document.querySelectorAll('svg').length,
    styled: getComputedStyle(document.body).fontFamily,
    title: document.querySelector('h1')?.textContent ?? '',
    scripts: document.querySelectorAll('script').length,
  }));
  expect(state.pwned).toBeNull();
  expect(state.scripts).toBe(0); // the title was escaped as text, not parsed as markup
  expect(state.title).toContain('<script>');
  expect(state.charts).toBeGreaterThan(0);
  expect(state.styled).toContain('Liberation Sans'); // the report's inline <style> applied
  expect(violations).toEqual([]);
  await page.close();
});

it('builds a Docker image that runs as a non-root user and lets Chromium keep its sandbox', () => {
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const text: string = require('node:fs').readFileSync(require('node:path').join(__dirname, '../../Dockerfile'), 'utf8');
  const lines = text.split('\n').map((l) => l.trim()).filter((l) => l && !l.startsWith('#'));
  const lastFrom = lines.map((l) => l.startsWith('FROM ')).lastIndexOf(true);
  const users = lines.map((l, i) => ({ l, i })).filter(({ l, i }) => i > lastFrom && l.startsWith('USER '));
  expect(users.length).toBeGreaterThan(0);
  const user = users[users.length - 1].l.slice(5).split(':')[0];
  expect(['root', '0']).not.toContain(user);
  expect(lines.findIndex((l) => l.startsWith('CMD '))).toBeGreaterThan(users[users.length - 1].i);
  expect(text).not.toMatch(/no-sandbox/);
});

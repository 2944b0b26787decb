/**
 * API answers are never stored by a browser or proxy (Cache-Control: no-store, RFC 9111 5.2.2.5), the answer that
 * carries a newly issued token included; the OpenAPI pages at /api/docs run under a Content-Security-Policy and
 * still render in Chromium; the OpenAPI document marks /health (and the public key) as needing no token.
 */
import { testBrowser, type TestBrowser } from '../support/browser';
import { clearDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let browser: TestBrowser;
beforeAll(async () => {
  t = await startTestApp('postgres', {}, undefined, { listen: true });
  browser = await testBrowser();
});
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

it('sends Cache-Control: no-store on API answers: JSON, a new token, problem+json, CSV, HTML report and /health', async () => {
  const product = await t.call('POST', '/api/v1/products', { code: 'NS-1', name: 'No-store test' });
  const opened = await t.call('POST', `/api/v1/products/${product.body.id}/calculations`, { title: 'screw', design: clearDesign });
  const token = await t.call('POST', `/api/v1/users/${t.users.author}/tokens`, {}, { as: 'admin' });
  expect(token.body.token).toMatch(/^ll_/);
  const answers = {
    product,
    token,
    list: await t.call('GET', '/api/v1/products'),
    missing: await t.call('GET', '/api/v1/products/00000000-0000-4000-8000-000000000000'),
    unauthenticated: await t.call('GET', '/api/v1/products', undefined, { as: 'anonymous', ip: '198.51.100.77' }),
    csv: await t.call('GET', `/api/v1/products/${product.body.id}/audit?format=csv`),
    report: await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.html`),
    health: await t.call('GET', '/health', undefined, { as: 'anonymous' }),
  };
  expect(Object.fromEntries(Object.entries(answers).map(([k, a]) => [k, a.status]))).toEqual({
    product: 201, token: 201, list: 200, missing: 404, unauthenticated: 401, csv: 200, report: 200, health: 200,
  });
  for (const [name, a] of Object.entries(answers)) expect([name, a.headers['cache-control']]).toEqual([name, 'no-store']);
});

it('serves /api/docs with a Content-Security-Policy under which the OpenAPI page renders in Chromium', async () => {
  const res = await t.call('GET', '/api/docs', undefined, { as: 'anonymous' });
  expect(res.status).toBe(200);
  const csp = String(res.headers['content-security-policy']).split(';').map((d) => d.trim());
  expect(csp).toEqual(expect.arrayContaining(["default-src 'none'", "script-src 'self'", "frame-ancestors 'none'", "base-uri 'none'"]));
  expect(csp.find((d) => d.startsWith('script-src'))).not.toMatch(/unsafe-inline|unsafe-eval/);
  // the page's scripts are files, so the policy lets them run; an inline script would not
  const assets = await t.call('GET', '/api/docs/swagger-ui-init.js', undefined, { as: 'anonymous' });
  expect(assets.status).toBe(200);
  expect(assets.headers['content-security-policy']).toBeDefined();

  const page = await browser.newPage();
  const refused: string[] = [];
  page.on('console', (m) => {
    if (/Content Security Policy|Refused to/.test(m.text())) refused.push(m.text());
  });
  const loaded = await page.goto(`${t.baseUrl}/api/docs`, { waitUntil: 'load' });
  expect(loaded?.headers()['content-security-policy']).toContain("default-src 'none'");
  // Swagger UI fetched the document and drew its operations under the policy
  await page.waitForSelector('.opblock-summary-path[data-path="/health"]');
  expect(await page.$eval('.info .title', (e) => e.textContent ?? '')).toContain('Leadline API');
  expect(refused).toEqual([]);
  await page.close();
});

it('documents /health and the public key as public in OpenAPI, and every other operation as needing the bearer token', async () => {
  const doc = (await t.call('GET', '/api/docs-json', undefined, { as: 'anonymous' })).body;
  expect(doc.security).toEqual([{ bearer: [] }]);
  expect(doc.paths['/health'].get.security).toEqual([]);
  expect(doc.paths['/api/v1/checkpoints/public-key'].get.security).toEqual([]);
  const overridden = Object.entries(doc.paths as Record<string, Record<string, { security?: unknown }>>)
    .flatMap(([path, ops]) => Object.entries(ops).filter(([, op]) => op.security !== undefined).map(([method]) => `${method.toUpperCase()} ${path}`));
  // the two passkey sign-in steps need no session or token: documented as public
  expect(overridden.sort()).toEqual(['GET /api/v1/checkpoints/public-key', 'GET /health', 'POST /api/v1/sessions/passkey', 'POST /api/v1/sessions/passkey/options']);
  // and the service agrees: both answer without a token, a secured route does not
  expect((await t.call('GET', '/health', undefined, { as: 'anonymous' })).status).toBe(200);
  expect((await t.call('GET', '/api/v1/checkpoints/public-key', undefined, { as: 'anonymous' })).status).toBe(200);
  expect((await t.call('GET', '/api/v1/products', undefined, { as: 'anonymous', ip: '198.51.100.78' })).status).toBe(401);
});

/**
 * Bodies refused as a whole, before any handler: JSON nested deeper than LEADLINE_JSON_MAX_DEPTH answers 400
 * naming "(body)" (a 3,000-deep body of about 6 KB used to overflow the stack of the text checks: 500), and a body
 * that is not JSON on a JSON route answers 415 naming "(body)". Nothing is stored.
 */
import { countRecords, startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp('postgres');
});
afterAll(() => t?.close());

const nested = (depth: number) => '['.repeat(depth) + ']'.repeat(depth);

it('refuses 3,000-deep JSON with 400 naming the body, and stores nothing [POST /api/v1/products]', async () => {
  const before = await countRecords(t.db);
  const body = `{"code":"DEEP-1","name":"deep","description":${nested(3000)}}`;
  expect(body.length).toBeGreaterThan(6000);
  const res = await t.call('POST', '/api/v1/products', body, { headers: { 'content-type': 'application/json' } });
  expect(res.status).toBe(400);
  expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  expect(res.body.errors).toEqual([{ path: '(body)', message: expect.stringMatching(/deeper than 64 levels/) }]);
  expect(await countRecords(t.db)).toEqual(before);
});

it('refuses deep JSON on every JSON route the same way, the stateless ones included', async () => {
  for (const url of ['/api/v1/evaluations', '/api/v1/sizing', '/api/v1/evaluations/charts']) {
    const res = await t.call('POST', url, `{"a":${nested(3000)}}`, { headers: { 'content-type': 'application/json' } });
    expect([url, res.status, res.body.errors?.[0]?.path]).toEqual([url, 400, '(body)']);
  }
});

it('counts depth on the text: brackets inside strings do not count, the limit itself is accepted', async () => {
  // 64 levels (the default limit) reach the route's own validation: 422 for the unknown field, not 400
  const atLimit = await t.call('POST', '/api/v1/products', `{"code":"D-2","name":"n","x":${nested(63)}}`, { headers: { 'content-type': 'application/json' } });
  expect(atLimit.status).toBe(422);
  const inText = await t.call('POST', '/api/v1/products', { code: 'DEEP-TEXT', name: '['.repeat(150) + '{'.repeat(40) });
  expect(inText.status).toBe(201);
});

it('answers 415 naming the body for a form-encoded or plain-text body on a JSON route, and stores nothing', async () => {
  const before = await countRecords(t.db);
  const form = await t.call('POST', '/api/v1/products', 'code=FORM-1&name=form', { headers: { 'content-type': 'application/x-www-form-urlencoded' } });
  expect(form.status).toBe(415);
  expect(form.headers['content-type']).toMatch(/application\/problem\+json/);
  expect(form.body.errors).toEqual([{ path: '(body)', message: expect.any(String) }]);
  const plain = await t.call('POST', '/api/v1/products', '{"code":"PLAIN-1","name":"plain"}', { headers: { 'content-type': 'text/plain' } });
  expect(plain.status).toBe(415);
  expect(plain.body.errors[0].path).toBe('(body)');
  const multipart = await t.call('POST', '/api/v1/evaluations', '--x\r\n\r\n--x--', { headers: { 'content-type': 'multipart/form-data; boundary=x' } });
  expect(multipart.status).toBe(415);
  expect(await countRecords(t.db)).toEqual(before);
  // the same body as JSON is accepted
  expect((await t.call('POST', '/api/v1/products', { code: 'FORM-1', name: 'form' })).status).toBe(201);
});

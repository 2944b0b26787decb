/**
 * Finding work across products over HTTP on PostgreSQL [GET /api/v1/products?q=&state=]: one search over the
 * product's code and name, its calculations' titles, its revisions' thread sizes and authors, and a filter by the
 * review state of a calculation's latest revision. Each field is tried on its own, and each answer says what matched.
 */
import { clearDesign, warningDesign } from '../support/designs';
import { countRecords, startTestApp, type TestApp } from '../support/harness';

let t: TestApp;

/** The jack of test/support/designs.ts on a Tr 55x9 thread (ISO 2904's 55 mm size): stored whatever its verdict. */
const tr55 = { ...clearDesign, thread: { form: 'trapezoidal', size: 'Tr 55x9', starts: 1 } };

beforeAll(async () => {
  t = await startTestApp('postgres');
  const product = async (code: string, name: string) => {
    const r = await t.call('POST', '/api/v1/products', { code, name });
    expect(r.status).toBe(201);
    return r.body.id as string;
  };
  const open = async (productId: string, title: string, design: unknown, as: 'author' | 'author2' = 'author') => {
    const r = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title, design }, { as });
    expect(r.status).toBe(201);
    return r.body.revisionId as string;
  };
  // SR-1: approved, Tr 40x7, by the first author
  const approved = await open(await product('SR-1', 'Kestrel Mills hoist (test product)'), 'Tailstock feed', clearDesign);
  expect((await t.call('POST', `/api/v1/revisions/${approved}/decisions`, { decision: 'approve', comment: 'Checked.' }, { as: 'reviewer' })).status).toBe(201);
  // SR-2: awaiting review, Tr 55x9, by the second author
  await open(await product('SR-2', 'Brannock platen press (test product)'), 'Platen screw', tr55, 'author2');
  // SR-3: no calculation yet
  await product('SR-3', 'Quarry gate drive (test product)');
  // SR-4: rejected, Tr 40x7, by the first author
  const rejected = await open(await product('SR-4', 'Wexcombe lifting table (test product)'), 'Deck lift', warningDesign);
  expect((await t.call('POST', `/api/v1/revisions/${rejected}/decisions`, { decision: 'reject', comment: 'Name the friction test.' }, { as: 'reviewer' })).status).toBe(201);
}, 60_000);

afterAll(() => t?.close());

async function find(query: string): Promise<{ codes: string[]; matched: Record<string, string[]>; total: number }> {
  const r = await t.call('GET', `/api/v1/products?${query}`);
  expect(r.status).toBe(200);
  const items = r.body.items as { code: string; matchedBy: string[] }[];
  return { codes: items.map((p) => p.code), matched: Object.fromEntries(items.map((p) => [p.code, p.matchedBy])), total: r.body.total };
}

const q = (text: string) => `q=${encodeURIComponent(text)}`;

it('finds a product by its code or name, any case, and says so', async () => {
  expect(await find(q('sr-3'))).toEqual({ codes: ['SR-3'], matched: { 'SR-3': ['code'] }, total: 1 });
  expect(await find(q('BRANNOCK'))).toEqual({ codes: ['SR-2'], matched: { 'SR-2': ['name'] }, total: 1 });
});

it("finds a product by one of its calculations' titles", async () => {
  expect(await find(q('tailstock'))).toEqual({ codes: ['SR-1'], matched: { 'SR-1': ['calculation'] }, total: 1 });
  expect((await find(q('deck'))).codes).toEqual(['SR-4']);
});

it('finds a product by the thread size of one of its revisions, with or without the spaces', async () => {
  expect(await find(q('Tr 55'))).toEqual({ codes: ['SR-2'], matched: { 'SR-2': ['size'] }, total: 1 });
  expect((await find(q('tr55x9'))).codes).toEqual(['SR-2']);
  expect((await find(q('Tr 40x7'))).codes).toEqual(['SR-1', 'SR-4']);
  expect((await find(q('Tr 12'))).codes).toEqual([]);
});

it('finds a product by the author of one of its revisions', async () => {
  expect(await find(q('second author'))).toEqual({ codes: ['SR-2'], matched: { 'SR-2': ['author'] }, total: 1 });
  expect((await find(q('Design author'))).codes).toEqual(['SR-1', 'SR-4']);
});

it("keeps the products with a calculation whose latest revision is in a state, alone or with a search", async () => {
  expect((await find('state=approved')).codes).toEqual(['SR-1']);
  expect((await find('state=rejected')).codes).toEqual(['SR-4']);
  expect((await find('state=submitted')).codes).toEqual(['SR-2']);
  expect((await find('state=withdrawn')).codes).toEqual([]);
  expect(await find(`${q('tr 40')}&state=rejected`)).toEqual({ codes: ['SR-4'], matched: { 'SR-4': ['size'] }, total: 1 });
  // paging applies after the filter
  expect(await find(`${q('(test product)')}&state=approved&limit=1&offset=0`)).toEqual({ codes: ['SR-1'], matched: { 'SR-1': ['name'] }, total: 1 });
  // without q the answer names no match
  expect((await find('limit=2')).matched).toEqual({ 'SR-1': [], 'SR-2': [] });
});

it('takes wildcards literally and refuses an unknown state with 422 naming the field, storing nothing', async () => {
  expect((await find(q('%'))).codes).toEqual([]);
  expect((await find(q('SR_1'))).codes).toEqual([]);
  const before = await countRecords(t.db);
  for (const state of ['lost', 'superseded']) {
    const r = await t.call('GET', `/api/v1/products?state=${state}`);
    expect(r.status).toBe(422);
    expect(r.headers['content-type']).toContain('application/problem+json');
    expect(r.body.errors).toEqual([{ path: 'state', message: expect.stringContaining('approved') }]);
  }
  expect(await countRecords(t.db)).toEqual(before);
});

it('documents q and state in the OpenAPI document', async () => {
  const doc = (await t.call('GET', '/api/docs-json')).body;
  const params = doc.paths['/api/v1/products'].get.parameters.map((p: { name: string; in: string }) => `${p.in}:${p.name}`);
  expect(params).toEqual(expect.arrayContaining(['query:q', 'query:state', 'query:limit', 'query:offset']));
  const state = doc.paths['/api/v1/products'].get.parameters.find((p: { name: string }) => p.name === 'state');
  expect(state.schema.enum).toEqual(['submitted', 'approved', 'rejected', 'withdrawn']);
});

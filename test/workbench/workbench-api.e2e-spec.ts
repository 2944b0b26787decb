/**
 * The API routes the design workbench reads, over HTTP on PostgreSQL: who am I, my revisions with the
 * reviewer's reasons, product search, charts of an unsaved design (the report's own SVG), and the product's
 * design file as one PDF through the pooled Chromium.
 */
import { clearDesign, warningDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';
import { pdfText } from '../support/pdf-text';

let t: TestApp;
let productId: string;
let approvedId: string;
let rejectedId: string;
let calcB: string;

beforeAll(async () => {
  t = await startTestApp('postgres', { LEADLINE_CHROMIUM_PATH: '/usr/bin/chromium' });
  productId = (await t.call('POST', '/api/v1/products', { code: 'WB-1', name: 'Harrow Fen bench press (test product)' })).body.id;
  await t.call('POST', '/api/v1/products', { code: 'WB-2', name: 'Ossory gantry jack (test product)' });
  const a = (await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Ram screw', design: clearDesign })).body;
  approvedId = a.revisionId;
  expect((await t.call('POST', `/api/v1/revisions/${approvedId}/decisions`, { decision: 'approve', comment: 'Checked.' }, { as: 'reviewer' })).status).toBe(201);
  const b = (await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Clamp screw', design: warningDesign })).body;
  rejectedId = b.revisionId;
  calcB = b.calculationId;
  expect(
    (await t.call('POST', `/api/v1/revisions/${rejectedId}/decisions`, { decision: 'reject', comment: 'Name the friction test.', comments: [{ text: 'Which supplier?', target: { field: 'friction.thread.source.reference' } }] }, { as: 'reviewer' })).status,
  ).toBe(201);
}, 60_000);

afterAll(async () => {
  await t?.close();
});

it('names the signed-in user and their roles [GET /api/v1/me]', async () => {
  const me = await t.call('GET', '/api/v1/me');
  expect(me.body).toEqual({ id: t.users.author, name: 'Design author (test)', roles: ['author'], authMethod: 'token', csrfToken: null });
  expect((await t.call('GET', '/api/v1/me', undefined, { as: 'anonymous' })).status).toBe(401);
});

it("lists the author's revisions by state with the reviewer's reasons and whether they may be withdrawn [GET /api/v1/me/revisions]", async () => {
  const c = (await t.call('POST', `/api/v1/calculations/${calcB}/revisions`, { design: clearDesign, note: 'friction from the supplier sheet' })).body;
  const all = (await t.call('GET', '/api/v1/me/revisions')).body.items;
  expect(all.map((i: { revisionId: string; state: string }) => [i.revisionId, i.state])).toEqual([
    [c.revisionId, 'submitted'],
    [rejectedId, 'rejected'],
    [approvedId, 'approved'],
  ]);
  const rejected = all[1];
  expect(rejected).toMatchObject({ productCode: 'WB-1', title: 'Clamp screw', revision: 1, canWithdraw: false, decidedBy: { name: 'Checking engineer (test)' } });
  expect(rejected.comments.map((x: { kind: string; text: string }) => [x.kind, x.text])).toEqual([
    ['decision', 'Name the friction test.'],
    ['comment', 'Which supplier?'],
  ]);
  expect(rejected.comments[1].target).toEqual({ field: 'friction.thread.source.reference' });
  expect(rejected.comments[1].on).toBe('input “Thread friction — friction source reference”'); // the field's label (the contract's description)
  expect(rejected.comments[0].on).toBeNull(); // the decision's own comment is on the revision as a whole
  expect(all[0]).toMatchObject({ canWithdraw: true, note: 'friction from the supplier sheet', comments: [] });
  expect((await t.call('GET', '/api/v1/me/revisions?state=approved')).body.items.map((i: { revisionId: string }) => i.revisionId)).toEqual([approvedId]);
  expect((await t.call('GET', '/api/v1/me/revisions', undefined, { as: 'author2' })).body.items).toEqual([]);
  expect((await t.call('GET', '/api/v1/me/revisions?state=lost')).status).toBe(422);
});

it('finds products by code or name, any case [GET /api/v1/products?q=]', async () => {
  const codes = async (q: string) => (await t.call('GET', `/api/v1/products?q=${encodeURIComponent(q)}`)).body.items.map((p: { code: string }) => p.code);
  expect(await codes('wb-')).toEqual(['WB-1', 'WB-2']);
  expect(await codes('GANTRY')).toEqual(['WB-2']);
  expect(await codes('100%')).toEqual([]);
  expect((await t.call('GET', '/api/v1/products?q=press')).body.total).toBe(1);
});

it("draws an unsaved design's charts with the report's own charting path [POST /api/v1/evaluations/charts]", async () => {
  const res = await t.call('POST', '/api/v1/evaluations/charts', clearDesign);
  expect(res.status).toBe(200);
  expect(res.body.unitSystem).toBe('SI');
  expect(res.body.torqueFriction).toMatch(/^<svg role="img" aria-label="Torque against thread friction"/);
  expect(res.body.column).toMatch(/^<svg role="img" aria-label="Column curve with the design point"/);
  // the stored revision of the same design prints the same torque chart in its report
  const report = (await t.call('GET', `/api/v1/revisions/${approvedId}/report.html`)).text;
  expect(report).toContain(res.body.torqueFriction);
  expect((await t.call('POST', '/api/v1/evaluations/charts?units=US', clearDesign)).body.torqueFriction).toContain('lbf·in');
  const bad = await t.call('POST', '/api/v1/evaluations/charts', { ...clearDesign, load: { axial: '18 MPa', sense: 'compression' } });
  expect(bad.status).toBe(422);
  expect(bad.body.errors[0].path).toBe('load.axial');
});

it("prints the product's design file: cover, the approved revision's report, the audit trail and the chain check [GET /api/v1/products/:id/design-file.pdf]", async () => {
  const res = await t.call('GET', `/api/v1/products/${productId}/design-file.pdf`);
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toBe('application/pdf');
  expect(res.headers['content-disposition']).toBe('inline; filename="design-file-WB-1.pdf"');
  const { text, pages } = await pdfText(res.raw);
  const approved = (await t.call('GET', `/api/v1/revisions/${approvedId}`)).body;
  const chain = (await t.call('GET', `/api/v1/products/${productId}/verify`)).body;
  expect(chain.valid).toBe(true);
  expect(text).toContain('Design file · WB-1');
  expect(text).toMatch(/Ram screw 1 Approved Clear revision 1/);
  expect(text).toMatch(/Clamp screw 2 Awaiting review Clear none approved/);
  expect(text.replace(/\s/g, '')).toContain(approved.hash);
  expect(text).toContain(`Hash-chain verification: intact`);
  expect(text).toContain(`${chain.links} links recomputed`);
  expect(text.replace(/\s/g, '')).toContain(chain.headHash);
  expect(text).toContain('revision 1 rejected: Name the friction test.');
  // page numbering runs through the whole file
  expect(pages).toBeGreaterThan(3);
  expect(text).toContain(`Page ${pages} of ${pages}`);
  expect(text).not.toContain(`Page 1 of ${pages - 1}`);
  expect((await t.call('GET', `/api/v1/products/00000000-0000-4000-8000-000000000000/design-file.pdf`)).status).toBe(404);
}, 60_000);

it('documents the routes the workbench added in the OpenAPI description [GET /api/docs-json]', async () => {
  const paths = (await t.call('GET', '/api/docs-json')).body.paths;
  expect(paths['/api/v1/me'].get).toBeTruthy();
  expect(paths['/api/v1/me/revisions'].get).toBeTruthy();
  expect(paths['/api/v1/evaluations/charts'].post.requestBody.content['application/json'].schema.properties.thread).toBeTruthy();
  expect(paths['/api/v1/products/{id}/design-file.pdf'].get).toBeTruthy();
  expect(paths['/api/v1/products'].get.summary).toContain('q:');
});

it('answers "my revisions" by state on the embedded database too (PGlite) [GET /api/v1/me/revisions]', async () => {
  const p = await startTestApp('pglite');
  try {
    const product = (await p.call('POST', '/api/v1/products', { code: 'WB-P', name: 'Embedded check (test product)' })).body;
    const opened = (await p.call('POST', `/api/v1/products/${product.id}/calculations`, { title: 'Screw', design: clearDesign })).body;
    await p.call('POST', `/api/v1/revisions/${opened.revisionId}/decisions`, { decision: 'reject', comment: 'Too short a nut.' }, { as: 'reviewer' });
    const rejected = (await p.call('GET', '/api/v1/me/revisions?state=rejected')).body.items;
    expect(rejected.map((i: { revisionId: string; comments: { text: string }[] }) => [i.revisionId, i.comments.map((c) => c.text)])).toEqual([[opened.revisionId, ['Too short a nut.']]]);
    expect((await p.call('GET', '/api/v1/me/revisions?state=submitted')).body.items).toEqual([]);
  } finally {
    await p.close();
  }
}, 60_000);

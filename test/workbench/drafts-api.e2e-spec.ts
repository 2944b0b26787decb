/**
 * Drafts of a design and the refusal of an unchanged submission, over HTTP on PostgreSQL with the service connected
 * as the runtime role: PUT and GET /api/v1/calculations/:id/draft (only the owner; validated like a submission;
 * insert-only, the newest wins) and 409 for a revision whose design equals the previous one.
 */
import { Client } from 'pg';
import { changedDesign, clearDesign, warningDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let productId: string;
let calculationId: string;
let firstRevisionId: string;

beforeAll(async () => {
  t = await startTestApp('postgres', {}, undefined, { roles: true });
  productId = (await t.call('POST', '/api/v1/products', { code: 'DR-1', name: 'Brackwater DR-1 lift table (test product)' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Lift screw', design: clearDesign });
  expect(opened.status).toBe(201);
  calculationId = opened.body.calculationId;
  firstRevisionId = opened.body.revisionId;
}, 60_000);
afterAll(() => t?.close());

const draftUrl = () => `/api/v1/calculations/${calculationId}/draft`;

it('answers 404 before any draft is saved [GET /api/v1/calculations/:id/draft]', async () => {
  const other = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Spare screw', design: clearDesign });
  const res = await t.call('GET', `/api/v1/calculations/${other.body.calculationId}/draft`);
  expect(res.status).toBe(404);
  expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
});

it('keeps the newest draft, with the note, and says whether it equals the latest revision [PUT, GET draft]', async () => {
  const first = await t.call('PUT', draftUrl(), { design: clearDesign, note: 'nothing changed yet' });
  expect(first.status).toBe(200);
  expect(first.body).toMatchObject({ calculationId, note: 'nothing changed yet', author: { id: t.users.author }, latestRevision: { id: firstRevisionId, revision: 1, sameDesign: true } });
  const longer = { ...clearDesign, screw: { ...clearDesign.screw, unsupportedLength: '560 mm' } };
  const second = await t.call('PUT', draftUrl(), { design: longer, note: 'longer stroke' });
  expect(second.status).toBe(200);
  expect(second.body.id).not.toBe(first.body.id);
  const read = await t.call('GET', draftUrl());
  expect(read.status).toBe(200);
  expect(read.body).toEqual(second.body);
  expect(read.body.design).toEqual(longer); // stored verbatim, as entered
  expect(read.body.latestRevision).toEqual({ id: firstRevisionId, revision: 1, sameDesign: false });
  // insert-only: both saves are rows; the newest wins
  const [{ n }] = await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM drafts WHERE calculation_id = $1`, [calculationId]);
  expect(Number(n)).toBe(2);
});

it('refuses an invalid design with 422 naming the field, and stores nothing [PUT draft]', async () => {
  const before = await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM drafts`);
  const bad = await t.call('PUT', draftUrl(), { design: { ...clearDesign, load: { axial: '18 MPa', sense: 'compression' } } });
  expect(bad.status).toBe(422);
  expect(bad.body.errors).toEqual([expect.objectContaining({ path: 'design.load.axial' })]);
  const extra = await t.call('PUT', draftUrl(), { design: clearDesign, color: 'red' });
  expect(extra.status).toBe(422);
  const after = await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM drafts`);
  expect(after).toEqual(before);
});

it('lets only the owner read or write the draft [PUT, GET draft]', async () => {
  expect((await t.call('GET', draftUrl(), undefined, { as: 'anonymous' })).status).toBe(401);
  expect((await t.call('GET', draftUrl(), undefined, { as: 'reviewer' })).status).toBe(403);
  expect((await t.call('PUT', draftUrl(), { design: clearDesign }, { as: 'reviewer' })).status).toBe(403);
  const stranger = await t.call('GET', draftUrl(), undefined, { as: 'author2' });
  expect(stranger.status).toBe(403);
  expect(stranger.body.detail).toMatch(/owns a calculation/);
  expect((await t.call('PUT', draftUrl(), { design: clearDesign }, { as: 'author2' })).status).toBe(403);
  expect((await t.call('GET', '/api/v1/calculations/00000000-0000-4000-8000-000000000000/draft')).status).toBe(404);
});

it('refuses UPDATE, DELETE and direct INSERT of drafts in the database, as the runtime role and as the owner', async () => {
  await expect(t.db.query(`UPDATE drafts SET note = 'rewritten'`)).rejects.toThrow(/permission denied/);
  await expect(t.db.query(`DELETE FROM drafts`)).rejects.toThrow(/permission denied/);
  await expect(t.db.query(`INSERT INTO drafts (id, calculation_id, author_id, author, input, normalized) SELECT gen_random_uuid(), calculation_id, author_id, author, input, normalized FROM drafts LIMIT 1`)).rejects.toThrow(/permission denied/);
  // the function refuses a caller without a live credential
  await expect(t.db.query(`SELECT leadline_save_draft(NULL, gen_random_uuid(), $1, $2::jsonb, NULL, NULL, '{}'::json, '{}'::json)`, [calculationId, JSON.stringify({ id: t.users.author, name: 'x' })])).rejects.toThrow(/no live token/);
  const owner = new Client({ connectionString: t.roles!.ownerUrl });
  owner.on('error', () => undefined);
  await owner.connect();
  try {
    await expect(owner.query(`UPDATE drafts SET note = 'rewritten'`)).rejects.toThrow(/records are immutable/);
    await expect(owner.query(`DELETE FROM drafts`)).rejects.toThrow(/records are immutable/);
    await expect(owner.query(`TRUNCATE drafts`)).rejects.toThrow(/records are immutable/);
  } finally {
    await owner.end();
  }
});

describe('an unchanged submission [POST /api/v1/calculations/:id/revisions]', () => {
  it('is refused with 409 naming the previous revision by number and id; nothing is stored', async () => {
    const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Tilt screw', design: warningDesign });
    const revisionsUrl = `/api/v1/calculations/${opened.body.calculationId}/revisions`;
    // the same design written differently (another unit, keys in another order) is still the same design
    const same = { ...warningDesign, load: { sense: 'compression', axial: '18000 N' } };
    const res = await t.call('POST', revisionsUrl, { design: same, note: 'resubmitted by accident' });
    expect(res.status).toBe(409);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ status: 409, title: 'Unchanged design', revision: 1, revisionId: opened.body.revisionId });
    expect(res.body.detail).toContain(`revision 1 (${opened.body.revisionId})`);
    expect((await t.call('GET', revisionsUrl)).body.items).toHaveLength(1);
    // a changed design is accepted, and then that one cannot be submitted twice
    const second = await t.call('POST', revisionsUrl, { design: changedDesign(warningDesign, 'friction test booked'), note: 'source named' });
    expect(second.status).toBe(201);
    const again = await t.call('POST', revisionsUrl, { design: changedDesign(warningDesign, 'friction test booked') });
    expect(again).toMatchObject({ status: 409, body: { revision: 2, revisionId: second.body.revisionId } });
    // going back to revision 1's design is a change against revision 2
    expect((await t.call('POST', revisionsUrl, { design: warningDesign, note: 'back to the first' })).status).toBe(201);
  });

  it('is refused once when two identical submissions race', async () => {
    const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Race screw', design: clearDesign });
    const url = `/api/v1/calculations/${opened.body.calculationId}/revisions`;
    const design = changedDesign(clearDesign, 'raced');
    const answers = await Promise.all([t.call('POST', url, { design }), t.call('POST', url, { design })]);
    expect(answers.map((a) => a.status).sort()).toEqual([201, 409]);
  });
});

/**
 * The review workflow through HTTP against real PostgreSQL: submit, reject with field comments, resubmit,
 * approve with acknowledged warnings, audit trail and chain verification; four-eyes; blocking findings; races.
 */
import { blockedDesign, changedDesign, warningDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';
import { mathHtml } from '../../apps/api/src/reports/markup';

let t: TestApp;
let productId: string;

beforeAll(async () => {
  t = await startTestApp('postgres');
  productId = (await t.call('POST', '/api/v1/products', { code: 'WL-20', name: 'Wrenfield WL-20 work platform (test product)' })).body.id;
});
afterAll(() => t?.close());

it('carries a calculation from submission through rejection and resubmission to approval, all in the audit trail', async () => {
  // Author submits revision 1 (needs acknowledgement of one warning)
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Platform lift screw', design: warningDesign });
  expect(opened.status).toBe(201);
  expect(opened.body.verdict).toBe('needs-acknowledgement');
  const rev1 = opened.body.revisionId;
  const queue = await t.call('GET', `/api/v1/reviews/queue?productId=${productId}`, undefined, { as: 'reviewer' });
  expect(queue.body.items.map((i: { revisionId: string }) => i.revisionId)).toEqual([rev1]);

  // Reviewer rejects with comments on an input field and on a finding
  const rejected = await t.call('POST', `/api/v1/revisions/${rev1}/decisions`, {
    decision: 'reject',
    comment: 'Friction is only assumed; measure it or take a handbook range.',
    comments: [
      { text: 'Which lubricant is this range for?', target: { field: 'friction.thread.source' } },
      { text: 'Resolve this before approval.', target: { finding: 'friction-source-assumed' } },
    ],
  }, { as: 'reviewer' });
  expect(rejected.status).toBe(201);
  expect(rejected.body.state).toBe('rejected');
  expect((await t.call('GET', `/api/v1/revisions/${rev1}`)).body.review.state).toBe('rejected');

  // Author submits revision 2 and comments; revision 1 stays rejected
  const rev2res = await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: changedDesign(warningDesign, 'friction test booked'), note: 'friction test booked; range kept' });
  expect(rev2res.body.revision).toBe(2);
  const rev2 = rev2res.body.revisionId;
  expect((await t.call('POST', `/api/v1/revisions/${rev2}/comments`, { text: 'Test report to follow.' })).status).toBe(201);

  // Approval without acknowledging the warning is refused; with it, accepted
  const unacknowledged = await t.call('POST', `/api/v1/revisions/${rev2}/decisions`, { decision: 'approve', comment: 'ok' }, { as: 'reviewer' });
  expect(unacknowledged.status).toBe(422);
  expect(unacknowledged.body.errors[0].message).toContain('friction-source-assumed');
  const approved = await t.call('POST', `/api/v1/revisions/${rev2}/decisions`, {
    decision: 'approve',
    comment: 'Margins fine at both friction ends.',
    acknowledgements: [{ finding: 'friction-source-assumed', comment: 'Range brackets Table 8-5 values; test to confirm.' }],
  }, { as: 'reviewer' });
  expect(approved.status).toBe(201);
  const record = await t.call('GET', `/api/v1/revisions/${rev2}`, undefined, { as: 'reviewer' });
  expect(record.body.review).toMatchObject({ state: 'approved', decidedBy: { id: t.users.reviewer } });
  expect((await t.call('GET', `/api/v1/reviews/queue?productId=${productId}`, undefined, { as: 'reviewer' })).body.items).toEqual([]);

  // The audit trail shows everything in order, with actors and hashes
  const trail = await t.call('GET', `/api/v1/products/${productId}/audit?limit=3`, undefined, { as: 'reviewer' });
  expect(trail.body.items).toHaveLength(3);
  let all = [...trail.body.items];
  let cursor = trail.body.nextCursor;
  while (cursor !== null) {
    const page = await t.call('GET', `/api/v1/products/${productId}/audit?limit=3&after=${cursor}`, undefined, { as: 'reviewer' });
    all = all.concat(page.body.items);
    cursor = page.body.nextCursor;
  }
  expect(all.map((e: { type: string }) => e.type)).toEqual([
    'product-registered', 'calculation-opened', 'revision', 'revision-submitted', 'rejected', 'revision', 'revision-submitted', 'comment', 'approved',
  ]);
  expect(all.map((e: { seq: number }) => e.seq)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
  expect(all[4].actor.id).toBe(t.users.reviewer);
  expect(all[2].findings).toEqual({ blocking: 0, warning: 1, info: expect.any(Number) });
  for (let i = 1; i < all.length; i++) expect(all[i].previousHash).toBe(all[i - 1].hash);

  const csv = await t.call('GET', `/api/v1/products/${productId}/audit?format=csv`, undefined, { as: 'reviewer' });
  expect(csv.headers['content-type']).toMatch(/text\/csv/);
  expect(csv.headers['content-disposition']).toContain('audit-WL-20.csv');
  const lines = csv.text.trim().split('\r\n');
  expect(lines).toHaveLength(10);
  expect(lines[5]).toContain('rejected');
  const json = await t.call('GET', `/api/v1/products/${productId}/audit?format=json`, undefined, { as: 'reviewer' });
  expect(json.headers['content-disposition']).toContain('audit-WL-20.json');
  expect(json.body.entries).toHaveLength(9);

  const verify = await t.call('GET', `/api/v1/products/${productId}/verify`, undefined, { as: 'reviewer' });
  expect(verify.body).toMatchObject({ valid: true, links: 9 });

  const diff = await t.call('GET', `/api/v1/revisions/${rev2}/diff?against=${rev1}`, undefined, { as: 'reviewer' });
  // revision 2 changed only the thread friction's reference (a submission equal to the previous one is refused)
  expect(diff.body.inputs).toEqual([expect.objectContaining({ path: 'friction.thread.source.reference' })]);
  expect(diff.body.sameCalculation).toBe(true);
});

it('refuses self-approval [POST /api/v1/revisions/:id/decisions]', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'self check', design: warningDesign }, { as: 'reviewer2' });
  const res = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, {
    decision: 'approve', comment: 'mine', acknowledgements: [{ finding: 'friction-source-assumed', comment: 'Range brackets the handbook values.' }],
  }, { as: 'reviewer2' });
  expect(res.status).toBe(403);
  expect(res.body.title).toBe('Four-eyes rule');
  expect((await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body.review.state).toBe('submitted');
});

it('refuses approval while blocking findings stand, with 409 [POST /api/v1/revisions/:id/decisions]', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'fast lift', design: blockedDesign });
  expect(opened.body.verdict).toBe('blocked');
  const res = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'approve', comment: 'looks ok' }, { as: 'reviewer' });
  expect(res.status).toBe(409);
  expect(res.body.blocking).toContain('lifting-self-locking');
  const reject = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'reject' }, { as: 'reviewer' });
  expect(reject.status).toBe(422);
  expect(reject.body.errors[0].path).toBe('comment');
});

it('leaves exactly one decision when 20 approve/reject calls race on one revision', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'race', design: warningDesign });
  const id = opened.body.revisionId;
  const calls = Array.from({ length: 20 }, (_, i) =>
    t.call('POST', `/api/v1/revisions/${id}/decisions`, i % 2
      ? { decision: 'reject', comment: `reject ${i}` }
      : { decision: 'approve', comment: `approve ${i}`, acknowledgements: [{ finding: 'friction-source-assumed', comment: 'Range brackets the handbook values.' }] },
    { as: i % 4 < 2 ? 'reviewer' : 'reviewer2' }),
  );
  const results = await Promise.all(calls);
  expect(results.filter((r) => r.status === 201)).toHaveLength(1);
  expect(results.filter((r) => r.status === 409)).toHaveLength(19);
  const [{ n }] = await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM revision_closures WHERE revision_id = $1`, [id]);
  expect(Number(n)).toBe(1);
  const decisions = await t.db.query(`SELECT 1 FROM events WHERE revision_id = $1 AND type IN ('approved', 'rejected')`, [id]);
  expect(decisions).toHaveLength(1);
  // The database itself refuses a second closure, whatever the application does
  const [closure] = await t.db.query<{ event_id: string }>(`SELECT event_id FROM revision_closures WHERE revision_id = $1`, [id]);
  await expect(
    t.db.query(`INSERT INTO revision_closures (revision_id, kind, event_id, actor_id) VALUES ($1, 'rejected', $2, $3)`, [id, closure.event_id, t.users.reviewer]),
  ).rejects.toThrow(/duplicate key|unique/);
});

it('lets only the author withdraw, and only before a decision [POST /api/v1/revisions/:id/withdraw]', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'withdraw me', design: warningDesign });
  const id = opened.body.revisionId;
  expect((await t.call('POST', `/api/v1/revisions/${id}/withdraw`, {}, { as: 'author2' })).status).toBe(403);
  expect((await t.call('POST', `/api/v1/revisions/${id}/withdraw`, { comment: 'wrong load case' })).status).toBe(200);
  expect((await t.call('POST', `/api/v1/revisions/${id}/withdraw`, {})).status).toBe(409);
  const decide = await t.call('POST', `/api/v1/revisions/${id}/decisions`, { decision: 'reject', comment: 'late' }, { as: 'reviewer' });
  expect(decide.status).toBe(409);
});

it('marks older revisions superseded and refuses decisions on them', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'supersede', design: warningDesign });
  await t.call('POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: changedDesign(warningDesign, 2) });
  const old = await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`);
  expect(old.body.review.state).toBe('superseded');
  const res = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'reject', comment: 'x' }, { as: 'reviewer' });
  expect(res.status).toBe(409);
});

it('validates comment targets against the revision', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'targets', design: warningDesign });
  const bad = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, { text: 'x', target: { field: 'thread.colour' } });
  expect(bad.status).toBe(422);
  expect(bad.body.errors[0].path).toBe('target.field');
  const badFinding = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, { text: 'x', target: { finding: 'no-such-rule' } });
  expect(badFinding.status).toBe(422);
  expect(badFinding.body.errors[0].path).toBe('target.finding');
  const inDecision = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, {
    decision: 'reject', comment: 'see field', comments: [{ text: 'x', target: { field: 'nut.colour' } }],
  }, { as: 'reviewer' });
  expect(inDecision.status).toBe(422);
  expect(inDecision.body.errors[0].path).toBe('comments.0.target.field');
  expect((await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body.review.state).toBe('submitted');
});

it('takes a comment on a result (one of the revision\'s checks), refuses an unknown one storing nothing, and prints it in the report by the check\'s label [POST /api/v1/revisions/:id/comments]', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'result comments', design: warningDesign });
  const id = opened.body.revisionId;
  const before = (await t.call('GET', `/api/v1/revisions/${id}`)).body;
  const check = before.checks.find((c: { value: number | null }) => c.value !== null);
  expect(check).toBeDefined();
  const verifiedBefore = (await t.call('GET', `/api/v1/products/${productId}/verify`)).body;

  const unknown = await t.call('POST', `/api/v1/revisions/${id}/comments`, { text: 'x', target: { result: 'no-such-check' } }, { as: 'reviewer' });
  expect(unknown.status).toBe(422);
  expect(unknown.body.errors).toEqual([{ path: 'target.result', message: expect.stringContaining(check.id) }]);
  const inDecision = await t.call('POST', `/api/v1/revisions/${id}/decisions`, {
    decision: 'reject', comment: 'see result', comments: [{ text: 'x', target: { result: 'no-such-check' } }],
  }, { as: 'reviewer' });
  expect(inDecision.status).toBe(422);
  expect(inDecision.body.errors[0].path).toBe('comments.0.target.result');
  // nothing stored: the chain did not move, the revision still awaits review
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body.links).toBe(verifiedBefore.links);

  const said = await t.call('POST', `/api/v1/revisions/${id}/comments`, { text: 'Margin thin for a platform; say why it is enough.', target: { result: check.id } }, { as: 'reviewer' });
  expect(said.status).toBe(201);
  // what it is on, in the one wording of the revision routes, My work and the review page (reviews/remarks.ts)
  expect(said.body.on).toBe(`result “${check.label}”`);
  const after = (await t.call('GET', `/api/v1/revisions/${id}`)).body;
  expect(after.remarks).toEqual([expect.objectContaining({ kind: 'comment', text: 'Margin thin for a platform; say why it is enough.', target: { result: check.id }, on: `result “${check.label}”` })]);
  expect(after.review.state).toBe('submitted');
  // the audit trail names what the comment is on, and the author's own work carries the target as stored
  const csv = (await t.call('GET', `/api/v1/products/${productId}/audit?format=csv`, undefined, { as: 'reviewer' })).text;
  expect(csv).toContain(`comment on revision 1 (result ${check.id}): Margin thin for a platform; say why it is enough.`);
  const mine = (await t.call('GET', '/api/v1/me/revisions?limit=100')).body.items.find((r: { revisionId: string }) => r.revisionId === id);
  expect(mine.comments).toEqual([expect.objectContaining({ text: 'Margin thin for a platform; say why it is enough.', target: { result: check.id }, on: `result “${check.label}”` })]);

  // a rejection carrying a result comment
  const rejected = await t.call('POST', `/api/v1/revisions/${id}/decisions`, {
    decision: 'reject', comment: 'Raise the margin.', comments: [{ text: 'Governing: lengthen the nut.', target: { result: check.id } }],
  }, { as: 'reviewer' });
  expect(rejected.status).toBe(201);
  expect((await t.call('GET', `/api/v1/revisions/${id}`)).body.remarks.filter((r: { target: unknown }) => r.target !== null)).toHaveLength(2);
  expect((await t.call('GET', `/api/v1/products/${productId}/verify`)).body.valid).toBe(true);

  // the report names the result by the check's label, with its value and limit as its check table prints them
  const report = await t.call('GET', `/api/v1/revisions/${id}/report.html`, undefined, { as: 'reviewer' });
  expect(report.status).toBe(200);
  const html = report.text.slice(report.text.indexOf('class="events"'));
  expect(html).toContain(`On the result “${mathHtml(check.label)}” (`);
  const record = html.replace(/<[^>]+>/g, '').replace(/\s+/g, ' ');
  expect(record).toMatch(/” \([^()]+ against [≥≤] [^()]+\): Margin thin for a platform; say why it is enough\./);
  expect(record).toContain('Governing: lengthen the nut.');
  expect(record).not.toMatch(/target: result/);
});

it('lists every input of a revision as entered, each with its label, and takes a comment on any of them [GET /api/v1/revisions/:id]', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'input comments', design: warningDesign });
  const record = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body;
  const fields = record.inputFields as { path: string; label: string; value: string }[];
  // the input as submitted, field by field: the path a comment's target names, the label, the text as typed
  expect(fields).toContainEqual({ path: 'load.axial', label: 'Axial load', value: warningDesign.load.axial });
  expect(fields).toContainEqual({ path: 'friction.thread.min', label: 'Thread friction — lowest friction coefficient of the range', value: String(warningDesign.friction.thread.min) });
  expect(fields.map((f) => f.path)).toEqual(expect.arrayContaining(['thread.size', 'nut.length', 'screw.material', 'duty.kind']));
  expect(fields.every((f) => !f.label.includes('›'))).toBe(true); // every field has a label of its own
  // each of them may carry a comment (revision 1: nothing changed against an earlier one)
  for (const f of [fields[0], fields[fields.length - 1]]) {
    const said = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, { text: `On ${f.label}.`, target: { field: f.path } }, { as: 'reviewer' });
    expect(said.status).toBe(201);
    expect(said.body.on).toBe(`input “${f.label}”`);
  }
  // the remarks word each input as the list of inputs labels it
  const remarks = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body.remarks as { on: string }[];
  expect(remarks.map((r) => r.on)).toEqual([fields[0], fields[fields.length - 1]].map((f) => `input “${f.label}”`));
});

/**
 * Re-check of approved work after the corrections of rule set 2026.12-2, through HTTP on PostgreSQL: the demo's main lift screw was
 * approved as judged by engine 1.0.0 under rule set 2026.12-1 (recorded in apps/api/src/seed/recorded-history.ts); the
 * current engine and rule set flag it. Nothing is written, and the stored revision keeps what it was judged with.
 */
import { ENGINE_VERSION } from '@leadline/mechanics';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { prepareSubmission, RecordStore } from '../../apps/api/src/records/record-store';
import { recheckResponseSchema } from '../../apps/api/src/rules/recheck.service';
import { seedDemo } from '../../apps/api/src/seed/demo-seed';
import { countRecords, startTestApp, type TestApp } from '../support/harness';

let t: TestApp;

beforeAll(async () => {
  t = await startTestApp('postgres');
  await seedDemo(t.app);
});
afterAll(() => t?.close());

const RECHECK = '/api/v1/rule-sets/recheck';

describe('re-check of stored revisions [POST /api/v1/rule-sets/recheck]', () => {
  it('lists the approved demo revision the corrected checks now flag, old and new figures side by side, writing nothing', async () => {
    const before = await countRecords(t.db);
    const res = await t.call('POST', RECHECK, {}, { as: 'reviewer' });
    expect(res.status).toBe(200);
    expect(recheckResponseSchema.parse(res.body)).toEqual(res.body); // the documented shape, nothing more (unknown keys would be stripped)
    expect(res.body).toMatchObject({ engineVersion: ENGINE_VERSION, ruleSetVersion: DEFAULT_RULE_SET.version, scope: 'latest-and-approved' });
    expect(ENGINE_VERSION).not.toBe('1.0.0');
    // 4 demo calculations, each latest (the main lift screw is also the approved one)
    expect(res.body.examined).toBe(4);
    expect(res.body.changed).toBe(1);
    const [r] = res.body.revisions;
    expect(r).toMatchObject({ revision: 1, approved: true, latest: true });
    expect(r.reasons).toEqual(expect.arrayContaining(['verdict-changed', 'margin-below-limit']));
    expect(r.judged).toMatchObject({ engineVersion: '1.0.0', ruleSetVersion: '2026.12-1', verdict: 'clear' });
    expect(r.recheck).toMatchObject({ engineVersion: ENGINE_VERSION, ruleSetVersion: DEFAULT_RULE_SET.version, verdict: 'blocked' });
    // the governing margin was met when judged and falls short now
    expect(r.judged.governing.margin).toBeGreaterThanOrEqual(1);
    expect(r.recheck.governing.margin).toBeLessThan(1);
    expect(typeof r.recheck.governing.measured).toBe('number');
    expect(typeof r.recheck.governing.limit).toBe('number');
    // every rule that changed, with its old and new figures (the record had no findings)
    const changed = new Map(r.findingChanges.map((c: { ruleId: string }) => [c.ruleId, c]));
    const blocking = r.findingChanges.filter((c: { to: { severity: string } | null }) => c.to?.severity === 'blocking');
    expect(blocking.length).toBeGreaterThan(0);
    for (const c of r.findingChanges) expect(c.from).toBeNull();
    expect(changed.get('brake-holding-torque')).toMatchObject({ to: { severity: 'warning', subject: 'design.duty.brakeTorque' } });

    const calc = await t.call('GET', `/api/v1/revisions/${r.revisionId}`, undefined, { as: 'reviewer' });
    expect(calc.body).toMatchObject({ engineVersion: '1.0.0', ruleSetVersion: '2026.12-1', verdict: 'clear', findings: [] });
    expect(calc.body.evaluation.engineVersion).toBe('1.0.0');
    expect(await countRecords(t.db)).toEqual(before);
    const verify = await t.call('GET', `/api/v1/products/${calc.body.productId}/verify`, undefined, { as: 'reviewer' });
    expect(verify.body.valid).toBe(true);
  });

  it('the impact of rule set 2026.12-2 on the seeded demo answers 200 and includes the engine-1.0 revision [POST /api/v1/rule-sets/:version/impact]', async () => {
    const res = await t.call('POST', '/api/v1/rule-sets/2026.12-2/impact', { scope: 'approved' }, { as: 'reviewer' });
    expect(res.status).toBe(200);
    const old = res.body.revisions.find((r: { judgedBy: string }) => r.judgedBy === '2026.12-1');
    expect(old).toBeDefined();
    const stored = (await t.call('GET', `/api/v1/revisions/${old.revisionId}`, undefined, { as: 'reviewer' })).body;
    expect(stored.engineVersion).toBe('1.0.0');
    // engine 1.0 did not compute the nut's own threads: under 2026.12-2 on lifting duty that check blocks, never passes
    expect(old.verdict).toEqual({ from: 'clear', to: 'blocked' });
    expect(old.findingChanges).toEqual(expect.arrayContaining([{ ruleId: 'nut-thread-root-yield', from: null, to: 'blocking' }]));
    // the stored revision's own checks (rule set 2026.12-1, which has no nut-thread group) are read without error
    expect(stored.checks.map((c: { id: string }) => c.id)).not.toContain('nut-thread-root-yield');
    expect(stored.governing).not.toBeNull();
    // and its report and the product's design file are served (a figure engine 1.0 did not compute is said so)
    const report = await t.call('GET', `/api/v1/revisions/${old.revisionId}/report.html`, undefined, { as: 'reviewer' });
    expect(report.status).toBe(200);
    expect(report.text).toContain('not computed by engine 1.0.0');
    // compared with a revision of the current engine: 200, and the figures engine 1.0 lacks are named as not computed
    const current = (await t.call('POST', RECHECK, { scope: 'latest' }, { as: 'reviewer' })).body;
    const calculations = await t.call('GET', `/api/v1/products/${stored.productId}`, undefined, { as: 'reviewer' });
    const other = calculations.body.calculations.find((c: { id: string }) => c.id !== stored.calculationId);
    const otherRevision = (await t.call('GET', `/api/v1/calculations/${other.id}/revisions`, undefined, { as: 'reviewer' })).body.items[0];
    expect(otherRevision.engineVersion).not.toBe('1.0.0');
    const diff = await t.call('GET', `/api/v1/revisions/${otherRevision.id}/diff?against=${old.revisionId}`, undefined, { as: 'reviewer' });
    expect(diff.status).toBe(200);
    expect(diff.body.results.find((r: { path: string }) => r.path.startsWith('brake.'))).toMatchObject({ notComputed: 'from' });
    expect(current.examined).toBeGreaterThan(0);
    // the product's design file, which holds the engine-1.0 approved revision's report, is printed
    const file = await t.call('GET', `/api/v1/products/${stored.productId}/design-file.pdf`, undefined, { as: 'reviewer' });
    expect(file.status).toBe(200);
    expect(file.raw.subarray(0, 5).toString()).toBe('%PDF-');
    const latest = await t.call('POST', '/api/v1/rule-sets/2026.12-2/impact', { scope: 'latest' }, { as: 'reviewer' });
    expect(latest.status).toBe(200);
    expect(latest.body.examined).toBe(4);
  });

  it('scopes: approved only finds the same revision; a product filter with no stored work examines nothing', async () => {
    const approved = await t.call('POST', RECHECK, { scope: 'approved' }, { as: 'admin' });
    expect(approved.status).toBe(200);
    expect(approved.body).toMatchObject({ examined: 1, changed: 1 });
    const empty = (await t.call('POST', '/api/v1/products', { code: 'RC-EMPTY', name: 'empty (test)' })).body.id;
    const none = await t.call('POST', RECHECK, { productId: empty }, { as: 'reviewer' });
    expect(none.body).toMatchObject({ examined: 0, changed: 0, revisions: [] });
  });

  it('a revision judged under rule set 2026.12-1 by the current engine is listed when 2026.12-2 adds a check it meets badly', async () => {
    const product = (await t.call('POST', '/api/v1/products', { code: 'RC-1', name: 'recheck product (test)' })).body.id;
    // a lifting screw with a brake whose torque is not stated: 2026.12-1 has no brake check, 2026.12-2 warns
    const design = {
      thread: { form: 'trapezoidal', size: 'Tr 40x7' },
      load: { axial: '10 kN', sense: 'compression' },
      friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { entry: 'collar/hard-steel-bronze' } },
      collar: { kind: 'plain', meanDiameter: '50 mm' },
      nut: { length: '70 mm', material: 'bronze' },
      screw: { material: 'steel-1045-cd', unsupportedLength: '300 mm', ends: 'fixed-free' },
      duty: { kind: 'lifting', speed: '10 rpm', brake: true },
    };
    expect((await t.call('POST', '/api/v1/rule-sets/2026.12-1/adopt', {}, { as: 'admin' })).status).toBe(200);
    const old = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'braked jack', design });
    expect(old.status).toBe(201);
    expect((await t.call('POST', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}/adopt`, {}, { as: 'admin' })).status).toBe(200);
    const stored = (await t.call('GET', `/api/v1/revisions/${old.body.revisionId}`)).body;
    expect(stored.ruleSetVersion).toBe('2026.12-1');
    const res = await t.call('POST', RECHECK, { productId: product }, { as: 'reviewer' });
    expect(res.body.examined).toBe(1);
    const hit = res.body.revisions.find((x: { revisionId: string }) => x.revisionId === old.body.revisionId);
    expect(stored.findings.some((f: { ruleId: string }) => f.ruleId === 'brake-holding-torque')).toBe(false);
    expect(hit.judged.ruleSetVersion).toBe('2026.12-1');
    expect(hit.recheck.ruleSetVersion).toBe(DEFAULT_RULE_SET.version);
    expect(hit.findingChanges.map((c: { ruleId: string }) => c.ruleId)).toContain('brake-holding-torque');
    expect(hit.reasons).toContain('verdict-changed');
  });

  it('a stored input that the contract now refuses is listed as input-refused, with the field it names', async () => {
    const product = (await t.call('POST', '/api/v1/products', { code: 'RC-2', name: 'refused input (test)' })).body.id;
    const design = {
      thread: { form: 'trapezoidal', size: 'Tr 40x7' },
      load: { axial: '10 kN', sense: 'compression' },
      friction: { thread: { entry: 'thread/steel-bronze/oil' } },
      collar: { kind: 'none' },
      nut: { length: '70 mm', material: 'aluminum-bronze' },
      screw: { material: 'steel-1045-cd', unsupportedLength: '300 mm', ends: 'fixed-free' },
      duty: { kind: 'positioning', speed: '10 rpm', brake: false },
    };
    const opened = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'refused later', design });
    const stored = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body;
    // A second revision whose stored input carries a brake torque without a brake: the contract refuses that today, as
    // an earlier contract might not have. Appended through the record store as a submission of that time would be.
    const refused = { ...design, duty: { ...design.duty, brakeTorque: '10 N*m' } };
    const store = t.app.get(RecordStore);
    const appended = await store.appendRevision(t.db, product, opened.body.calculationId, prepareSubmission({
      input: refused, normalized: stored.normalized, evaluation: stored.evaluation, findings: stored.findings, verdict: stored.verdict,
      engineVersion: stored.engineVersion, ruleSetVersion: stored.ruleSetVersion, note: 'accepted by an earlier contract (test)',
    }), { id: t.users.author, name: 'Design author (test)' }); // as the calculation's owner (only its author may append)
    const res = await t.call('POST', RECHECK, { productId: product, scope: 'latest' }, { as: 'reviewer' });
    expect(res.body).toMatchObject({ examined: 1, changed: 1 });
    const [r] = res.body.revisions;
    expect(r).toMatchObject({ revisionId: appended.id, reasons: ['input-refused'], recheck: { verdict: null, governing: null } });
    expect(r.recheck.issues).toEqual([{ path: 'duty.brakeTorque', message: 'a brake torque needs duty.brake true' }]);
    expect(r.judged.verdict).toBe(stored.verdict);
  });

  it('is for reviewers and admins; a bad scope is a 422 naming the field', async () => {
    expect((await t.call('POST', RECHECK, {}, { as: 'author' })).status).toBe(403);
    expect((await t.call('POST', RECHECK, {}, { as: 'anonymous' })).status).toBe(401);
    const bad = await t.call('POST', RECHECK, { scope: 'everything' }, { as: 'reviewer' });
    expect(bad.status).toBe(422);
    expect(bad.body.errors[0].path).toBe('scope');
  });
});

describe('on the embedded database (the demo default of npm start)', () => {
  let p: TestApp;
  beforeAll(async () => {
    p = await startTestApp('pglite');
    await seedDemo(p.app);
  });
  afterAll(() => p?.close());

  it('seeds the recorded approval and the re-check flags it, writing nothing', async () => {
    const before = await countRecords(p.db);
    const res = await p.call('POST', RECHECK, { scope: 'approved' }, { as: 'reviewer' });
    expect(res.body).toMatchObject({ examined: 1, changed: 1 });
    expect(res.body.revisions[0].judged).toMatchObject({ engineVersion: '1.0.0', ruleSetVersion: '2026.12-1', verdict: 'clear' });
    expect(res.body.revisions[0].recheck.verdict).toBe('blocked');
    expect(await countRecords(p.db)).toEqual(before);
  });
});

/**
 * The rules module through the real service and database: findings stored with the rule-set version,
 * rule sets created never edited, and the impact report of another rule-set version.
 */
import { DEFAULT_RULE_SET } from '@leadline/rules';
import { blockedDesign, changedDesign, clearDesign, positioningDesign, warningDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let productId: string;

beforeAll(async () => {
  t = await startTestApp('postgres');
  productId = (await t.call('POST', '/api/v1/products', { code: 'RS-1', name: 'Rushmere RS-1 (test product)' })).body.id;
});
afterAll(() => t?.close());

it('blocks lifting, not self-locking, no brake; the same design on positioning duty does not block [POST /api/v1/evaluations]', async () => {
  const lifting = await t.call('POST', '/api/v1/evaluations', blockedDesign);
  expect(lifting.body.selfLocking.locks).toBe(false);
  const finding = lifting.body.findings.find((f: { ruleId: string }) => f.ruleId === 'lifting-self-locking');
  expect(finding).toMatchObject({ severity: 'blocking', measured: lifting.body.selfLocking.margin });
  expect(lifting.body.verdict).toBe('blocked');
  const positioning = await t.call('POST', '/api/v1/evaluations', positioningDesign);
  expect(positioning.body.findings.filter((f: { severity: string }) => f.severity === 'blocking')).toEqual([]);
  expect(positioning.body.verdict).not.toBe('blocked');
  for (const f of [...lifting.body.findings, ...positioning.body.findings]) expect(f.basis.trim().length).toBeGreaterThan(0);
});

it('stores findings and the rule-set version with each revision, and keeps every rule set used', async () => {
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'stored findings', design: warningDesign });
  const rev = await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`);
  expect(rev.body.ruleSetVersion).toBe(DEFAULT_RULE_SET.version);
  expect(rev.body.findings.map((f: { ruleId: string }) => f.ruleId)).toContain('friction-source-assumed');
  const sets = await t.call('GET', '/api/v1/rule-sets');
  expect(sets.body.current).toBe(DEFAULT_RULE_SET.version);
  expect(sets.body.items.map((s: { version: string }) => s.version)).toContain(DEFAULT_RULE_SET.version);
  expect(sets.body.rules.every((r: { basis: string }) => r.basis.length > 0)).toBe(true);
  const one = await t.call('GET', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}`);
  expect(one.body.definition).toEqual(DEFAULT_RULE_SET);
});

it('creates a new rule-set version but never edits one', async () => {
  const next = { ...DEFAULT_RULE_SET, version: '2027.01-1', description: 'stricter engaged-thread band (test)' };
  expect((await t.call('POST', '/api/v1/rule-sets', next, { as: 'admin' })).status).toBe(201);
  const again = await t.call('POST', '/api/v1/rule-sets', { ...next, description: 'changed' }, { as: 'admin' });
  expect(again.status).toBe(409);
  const invalid = await t.call('POST', '/api/v1/rule-sets', { ...next, version: '2027.02-1', thresholds: { ...next.thresholds, drive: { minMargin: 0.5, warnMargin: 1 } } }, { as: 'admin' });
  expect(invalid.status).toBe(422);
  expect(invalid.body.errors[0].path).toBe('thresholds.drive.minMargin');
  await expect(t.db.query(`DELETE FROM rule_sets WHERE version = '2027.01-1'`)).rejects.toThrow(/immutable/);
  await expect(t.db.query(`UPDATE rule_sets SET definition = '{}' WHERE version = '2027.01-1'`)).rejects.toThrow(/immutable/);
});

it('reports exactly the revisions whose verdict another rule set would change, altering nothing [POST /api/v1/rule-sets/:version/impact]', async () => {
  const product = (await t.call('POST', '/api/v1/products', { code: 'RS-IMPACT', name: 'impact product (test)' })).body.id;
  const submit = async (title: string, design: unknown) =>
    (await t.call('POST', `/api/v1/products/${product}/calculations`, { title, design })).body;
  const clearLift = await submit('clear lifting jack', clearDesign); // buckling factor about 18 (lifting)
  const blocked = await submit('already blocked', blockedDesign);
  const positioning = await submit('positioning axis', positioningDesign);
  const approvedClear = await submit('approved jack', clearDesign);
  await t.call('POST', `/api/v1/revisions/${approvedClear.revisionId}/decisions`, { decision: 'approve', comment: 'ok' }, { as: 'reviewer' });
  const verdicts = await t.db.query<{ verdict: string }>(`SELECT verdict FROM revisions WHERE product_id = $1 ORDER BY seq`, [product]);

  // A stricter buckling minimum on lifting duty (25, synthetic for this test) blocks the two lifting jacks only
  const strict = {
    ...DEFAULT_RULE_SET,
    version: '2027.03-1',
    description: 'synthetic: buckling factor 25 on lifting duty (test)',
    thresholds: { ...DEFAULT_RULE_SET.thresholds, buckling: { minSafetyFactor: { lifting: 25, positioning: 2.5, clamping: 2.5 } } },
  };
  expect((await t.call('POST', '/api/v1/rule-sets', strict, { as: 'admin' })).status).toBe(201);
  const latest = await t.call('POST', '/api/v1/rule-sets/2027.03-1/impact', { scope: 'latest', productId: product }, { as: 'reviewer' });
  expect(latest.status).toBe(200);
  expect(latest.body.examined).toBe(4);
  expect(latest.body.revisions.map((r: { revisionId: string }) => r.revisionId).sort()).toEqual([clearLift.revisionId, approvedClear.revisionId].sort());
  expect(latest.body.revisions[0].verdict).toEqual({ from: 'clear', to: 'blocked' });
  expect(latest.body.revisions[0].findingChanges).toContainEqual(expect.objectContaining({ ruleId: 'column-buckling', to: 'blocking' }));
  expect(latest.body.revisions.map((r: { revisionId: string }) => r.revisionId)).not.toContain(blocked.revisionId);
  expect(latest.body.revisions.map((r: { revisionId: string }) => r.revisionId)).not.toContain(positioning.revisionId);

  const approved = await t.call('POST', '/api/v1/rule-sets/2027.03-1/impact', { scope: 'approved', productId: product }, { as: 'reviewer' });
  expect(approved.body.revisions.map((r: { revisionId: string }) => r.revisionId)).toEqual([approvedClear.revisionId]);
  // nothing stored changed
  expect(await t.db.query<{ verdict: string }>(`SELECT verdict FROM revisions WHERE product_id = $1 ORDER BY seq`, [product])).toEqual(verdicts);
  expect((await t.call('GET', `/api/v1/products/${product}/verify`)).body.valid).toBe(true);
});

it('judges new submissions by an adopted rule set, while earlier revisions keep theirs [POST /api/v1/rule-sets/:version/adopt]', async () => {
  const product = (await t.call('POST', '/api/v1/products', { code: 'RS-ADOPT', name: 'adoption product (test)' })).body.id;
  const before = (await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'before', design: clearDesign })).body;
  expect(before.verdict).toBe('clear');
  expect((await t.call('POST', '/api/v1/rule-sets/2027.03-1/adopt', { note: 'test adoption' }, { as: 'reviewer' })).status).toBe(403);
  const adopted = await t.call('POST', '/api/v1/rule-sets/2027.03-1/adopt', { note: 'test adoption' }, { as: 'admin' });
  expect(adopted.status).toBe(200);
  expect(adopted.body.current).toBe('2027.03-1');
  // the same figures with the friction reference restated: a new revision must change the design
  const after = (await t.call('POST', `/api/v1/calculations/${before.calculationId}/revisions`, { design: changedDesign(clearDesign, 're-judged') })).body;
  expect(after.verdict).toBe('blocked'); // the synthetic strict buckling minimum of 2027.03-1
  expect((await t.call('GET', `/api/v1/revisions/${after.revisionId}`)).body.ruleSetVersion).toBe('2027.03-1');
  expect((await t.call('GET', `/api/v1/revisions/${before.revisionId}`)).body.ruleSetVersion).toBe(DEFAULT_RULE_SET.version);
  expect((await t.call('POST', '/api/v1/rule-sets/2099.01-1/adopt', {}, { as: 'admin' })).status).toBe(404);
  // back to the default for any later test
  await t.call('POST', `/api/v1/rule-sets/${DEFAULT_RULE_SET.version}/adopt`, { note: 'restore' }, { as: 'admin' });
  expect((await t.call('GET', '/api/v1/rule-sets')).body.current).toBe(DEFAULT_RULE_SET.version);
});

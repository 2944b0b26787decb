/**
 * Design input through the real service on PostgreSQL (engine 1.1): values that overflow on
 * conversion and bad leaves inside a choice answer 422 naming the field and store nothing; a nut material of the
 * design's own is accepted with its allowables and reported as entered; a lifting nut without a yield blocks.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { countRecords, startTestApp, type TestApp } from '../support/harness';

const design = JSON.parse(readFileSync(join(__dirname, '../fixtures/ok/trapezoidal-jack.json'), 'utf8'));

let t: TestApp;
let productId: string;

beforeAll(async () => {
  t = await startTestApp('postgres');
  productId = (await t.call('POST', '/api/v1/products', { code: 'DI-1', name: 'Dunmore DI-1 input checks (test product)' })).body.id;
});
afterAll(() => t?.close());

const submit = (title: string, d: unknown) => t.call('POST', `/api/v1/products/${productId}/calculations`, { title, design: d });

it('refuses a value that converts to a non-finite number ("1e308 GPa") with 422 naming the field, storing nothing [POST /api/v1/products/:id/calculations]', async () => {
  const before = await countRecords(t.db);
  const bad = { ...design, screw: { ...design.screw, material: undefined, yieldStrength: '530 MPa', elasticModulus: '1e308 GPa', density: '7850 kg/m^3' } };
  const res = await submit('overflow', bad);
  expect(res.status).toBe(422);
  expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  expect(res.body.errors).toEqual([expect.objectContaining({ path: 'design.screw.elasticModulus', message: expect.stringMatching(/too large to compute with/) })]);
  const stateless = await t.call('POST', '/api/v1/evaluations', bad);
  expect(stateless.status).toBe(422);
  expect(stateless.body.errors[0].path).toBe('screw.elasticModulus');
  expect(await countRecords(t.db)).toEqual(before);
});

it('refuses a finite but implausible magnitude (the fuzz suite\'s "1.9345105578188634e+229 mm") with 422 naming the field and the bound, storing nothing [POST /api/v1/evaluations, POST /api/v1/products/:id/calculations]', async () => {
  const before = await countRecords(t.db);
  const bad = { ...design, screw: { ...design.screw, unsupportedLength: '1.9345105578188634e+229 mm' } };
  const stateless = await t.call('POST', '/api/v1/evaluations', bad);
  expect(stateless.status).toBe(422);
  expect(stateless.body.errors).toEqual([{ path: 'screw.unsupportedLength', message: expect.stringMatching(/outside the plausible range 1 um to 1 km/) }]);
  const res = await submit('absurd length', bad);
  expect(res.status).toBe(422);
  expect(res.body.errors).toEqual([expect.objectContaining({ path: 'design.screw.unsupportedLength' })]);
  expect(await countRecords(t.db)).toEqual(before);
});

it('names the leaf field inside a choice: friction.collar as a range with "min": "NaN" [POST /api/v1/evaluations]', async () => {
  const res = await t.call('POST', '/api/v1/evaluations', { ...design, friction: { ...design.friction, collar: { min: 'NaN', max: 0.1, source: design.friction.collar.source } } });
  expect(res.status).toBe(422);
  expect(res.body.errors).toEqual([{ path: 'friction.collar.min', message: expect.stringMatching(/expected number, received string/) }]);
});

it("accepts a nut material of the design's own with its allowables and shows it as entered in the report; a library id still supplies its values", async () => {
  const own = { ...design, nut: { length: '60 mm', material: 'CuSn12 to Dunmore spec N-12', allowablePressure: '9 MPa', allowablePv: '2 MPa*m/s', yieldStrength: '140 MPa' } };
  const opened = await submit('own nut material', own);
  expect(opened.status).toBe(201);
  const rev = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body;
  expect(rev.normalized.nut).toMatchObject({ material: 'CuSn12 to Dunmore spec N-12', materialSource: 'design', allowablePressure: 9e6 });
  expect(rev.evaluation.wear.allowablePressureBasis).toBe('any-speed');
  const html = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.html`)).text;
  expect(html).toContain('CuSn12 to Dunmore spec N-12');
  expect(html).toMatch(/as entered \(the design(&#x27;|')s own material\)/);
  // Without its allowables it is evaluated (engine 1.2): what cannot be computed is named, never a 422 for the whole design
  const missing = await submit('own nut material, no allowable', { ...design, nut: { length: '60 mm', material: 'CuSn12 to Dunmore spec N-12' } });
  expect(missing.status).toBe(201);
  const stored = (await t.call('GET', `/api/v1/revisions/${missing.body.revisionId}`)).body;
  expect(stored.evaluation.wear.allowablePressure).toBeNull();
  const notComputed = Object.fromEntries(stored.evaluation.notComputed.map((n: { subject: string; missing: string[] }) => [n.subject, n.missing]));
  expect(notComputed['wear.pressureRatio'][0]).toMatch(/nut.allowablePressure/);
  expect(notComputed['safetyFactors.strippingNut']).toEqual(['nut.yieldStrength']);
  expect(stored.findings.find((f: { ruleId: string }) => f.ruleId === 'nut-bearing-pressure')).toMatchObject({ measured: expect.any(Number), limit: null });
  const library = (await t.call('POST', '/api/v1/evaluations', design)).body;
  expect(library.wear.allowablePressureBasis).toBe('speed-rated');
});

it('blocks a lifting design whose nut has no yield strength, naming the missing value [POST /api/v1/evaluations]', async () => {
  const res = await t.call('POST', '/api/v1/evaluations', { ...design, nut: { length: '60 mm', material: 'cast-iron' } });
  expect(res.status).toBe(200);
  expect(res.body.verdict).toBe('blocked');
  const f = res.body.findings.find((x: { ruleId: string }) => x.ruleId === 'nut-thread-root-yield');
  expect(f).toMatchObject({ severity: 'blocking', measured: null });
  expect(f.message).toMatch(/nut\.yieldStrength is missing/);
});

it('refuses a design life in a unit that is not a time, or beyond any machine, with 422 naming duty.designLife, storing nothing; judges it under rule set 2026.12-4 once adopted [POST /api/v1/evaluations]', async () => {
  const before = await countRecords(t.db);
  for (const designLife of ['5000 kg', '1e12 h']) {
    const res = await t.call('POST', '/api/v1/evaluations', { ...design, duty: { ...design.duty, designLife } });
    expect(res.status).toBe(422);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toEqual(['duty.designLife']);
  }
  expect(await countRecords(t.db)).toEqual(before);
  // A rolling thrust bearing of L10 = (60 / 18)^3 = 37.04 million revolutions at 60 rpm runs 10,288 h (ISO 281, from memory;
  // hand arithmetic): against 20,000 h its life ratio is 0.514, a warning under 2026.12-4, nothing under 2026.12-3
  const rolling = {
    ...design,
    collar: { kind: 'rolling', meanDiameter: '60 mm', dynamicRating: '60 kN', staticRating: '150 kN', rollingElement: 'ball', ratingSource: 'invented catalogue values for the test' },
    duty: { ...design.duty, designLife: '20000 h' },
  };
  const bearingLife = (body: { checks: { id: string; value: number | null; status: string }[] }) => body.checks.find((c) => c.id === 'collar-bearing-life');
  expect(bearingLife((await t.call('POST', '/api/v1/evaluations', rolling)).body)).toBeUndefined();
  expect((await t.call('POST', '/api/v1/rule-sets/2026.12-4/adopt', {}, { as: 'admin' })).status).toBe(200);
  const judged = bearingLife((await t.call('POST', '/api/v1/evaluations', rolling)).body);
  expect(judged?.status).toBe('warning');
  expect(judged?.value).toBeCloseTo(((60 / 18) ** 3 * 1e6) / (60 * 60) / 20000, 6); // revolutions / (60 rev/min x 60 min/h) = hours
  expect((await t.call('POST', '/api/v1/rule-sets/2026.12-3/adopt', {}, { as: 'admin' })).status).toBe(200);
});

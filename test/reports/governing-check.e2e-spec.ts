/**
 * The governing check and the lowest strength factor agree everywhere for the README jack
 * (test/fixtures/ok/trapezoidal-jack.json): the evaluation answer, the stored revision and the report's summary.
 * Real service on PostgreSQL; the expected figure is worked by hand below, not taken from the engine.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { CHECK_DECLARATIONS } from '@leadline/rules';
import { startTestApp, type TestApp } from '../support/harness';

const JACK = JSON.parse(readFileSync(join(__dirname, '../fixtures/ok/trapezoidal-jack.json'), 'utf8'));

/*
 * The nut's own thread root of the README jack, by hand:
 * Tr 40x7, ISO 2901 basic profile: a_c = 0.5 mm (P 6-12), D4 = d + 2 a_c = 41 mm, D2 = d - P/2 = 36.5 mm.
 * Engaged threads n_t = 60 mm / 7 mm = 8.571; first-thread load F_1 = max(0.38 F, F / n_t) = 0.38 x 18 kN = 6840 N
 * (Shigley 10th ed. Sec. 8-2 after Marshek, from memory).
 * Arm from the pitch line to the nut root a_n = (41 - 36.5) / 2 = 2.25 mm; nut tooth at its root
 * b_n = P/2 + 2 a_n tan 15 deg = 3.5 + 4.5 x 0.26795 = 4.7058 mm (30 deg flanks, ISO 2901).
 * Root bending sigma_b = 6 F_1 a_n / (pi D4 b_n^2) = 6 x 6840 x 2.25 / (pi x 41 x 4.7058^2) = 32.37 MPa;
 * root shear tau = 3 F_1 / (2 pi D4 b_n) = 16.93 MPa (Shigley 10th ed. Eqs. (8-10), (8-11) applied to the nut).
 * Tin bronze S_y = 14 ksi = 96.53 MPa (ASTM B584 C93200, from memory): S_y / sigma_b = 2.982,
 * 0.577 S_y / tau = 3.290; the lower, 2.98, against the lifting minimum 3.
 * Rule set 2026.12-3 (the default) holds lifting strength with the dynamic factor phi_2 = phi_2,min + beta_2 v_h of the
 * default hoisting class HC2 (EN 13001-2, Table 2, from memory: 1.10 and 0.34 s/m): v_h = 60 rpm x 7 mm = 0.007 m/s,
 * phi_2 = 1.10238, so the governing factor is 2.982 / 1.10238 = 2.705.
 */
const HAND_NUT_ROOT_FACTOR = 2.982;
const HAND_PHI_2 = 1.1 + 0.34 * ((60 / 60) * 0.007);
const HAND_GOVERNING = HAND_NUT_ROOT_FACTOR / HAND_PHI_2;

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp('postgres');
});
afterAll(() => t?.close());

it('the README jack: governing check is the nut thread root at 2.98 / phi_2 = 2.70 against 3, in the answer, the stored revision and the report summary [POST /api/v1/evaluations, GET /api/v1/revisions/:id/report.html]', async () => {
  const answer = await t.call('POST', '/api/v1/evaluations', JACK);
  expect(answer.status).toBe(200);
  expect(answer.body.governing).toMatchObject({ id: 'nut-thread-root-yield', limit: 3, status: 'fail', limitKind: 'minimum' });
  expect(answer.body.governing.value).toBeCloseTo(HAND_GOVERNING, 2);
  // judge's blocking findings of the rules that declare checks are exactly the checks past their limits (a rule without a
  // declared check, such as the list of figures not computed, blocks on its own)
  const declaring = new Set(CHECK_DECLARATIONS.map((d) => d.ruleId));
  const blocking = answer.body.findings
    .filter((f: { severity: string; ruleId: string }) => f.severity === 'blocking' && declaring.has(f.ruleId))
    .map((f: { ruleId: string }) => f.ruleId);
  const failing = answer.body.checks.filter((c: { status: string }) => c.status === 'fail').map((c: { ruleId: string }) => c.ruleId);
  expect(failing).toEqual(blocking);

  const product = (await t.call('POST', '/api/v1/products', { code: 'RJ-1', name: 'README jack (test product)' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'Lift screw', design: JACK });
  expect(opened.status).toBe(201);
  const stored = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}`)).body;
  expect(stored.governing).toEqual(answer.body.governing);
  expect(stored.checks).toEqual(answer.body.checks);

  const html = (await t.call('GET', `/api/v1/revisions/${opened.body.revisionId}/report.html`)).text;
  const summary = html.slice(html.indexOf('Summary</h2>'), html.indexOf('Basis and conventions'));
  const row = (label: string) => {
    const at = summary.indexOf(`>${label}<`);
    expect(at).toBeGreaterThan(-1);
    return summary.slice(at, summary.indexOf('</tr>', at)).replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ');
  };
  expect(row('Governing check')).toMatch(/2\.70 against ≥ 3\.00 Nut thread root/);
  expect(row('Lowest strength safety factor')).toMatch(/2\.70 Nut thread root/);
  expect(summary).not.toContain('8.09');
});

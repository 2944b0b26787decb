/**
 * The demo data reads as an engineering office's own work: every text the seed stores and the API hands out
 * (products, calculations, revision notes, review comments and decisions) is free of the project's internal wording.
 */
import { seedDemo } from '../../apps/api/src/seed/demo-seed';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;

beforeAll(async () => {
  t = await startTestApp('postgres');
  await seedDemo(t.app);
}, 60_000);
afterAll(() => t?.close());

/** Words of the project's planning and repair work that a user of the demo should never read. */
const INTERNAL = /\b(issue|issues|corrections?|wave|ticket|TODO|FIXME|lecture|fixture|stub|placeholder)\b|#\d+/i;

it('stores no internal wording in the demo products, calculations, notes and comments [seedDemo]', async () => {
  const texts: string[] = [];
  const products = (await t.call('GET', '/api/v1/products?limit=200')).body.items as { id: string; code: string; name: string; description: string | null }[];
  expect(products.length).toBeGreaterThan(0);
  for (const p of products) {
    texts.push(p.code, p.name, p.description ?? '');
    const trail = (await t.call('GET', `/api/v1/products/${p.id}/audit?limit=500`)).body.items as unknown[];
    for (const e of trail) texts.push(JSON.stringify(e));
    for (const c of (await t.call('GET', `/api/v1/products/${p.id}`)).body.calculations as { id: string; title: string }[]) {
      texts.push(c.title);
      for (const r of (await t.call('GET', `/api/v1/calculations/${c.id}/revisions`)).body.items as { note: string | null }[]) texts.push(r.note ?? '');
    }
  }
  expect(texts.filter((x) => INTERNAL.test(x))).toEqual([]);
  // the recorded approval still says what it was judged by, in an engineer's words
  expect(texts.some((x) => /Approved as judged then: engine 1\.0\.0/.test(x))).toBe(true);
});

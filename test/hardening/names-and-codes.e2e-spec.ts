/**
 * Names and codes a reader compares by eye: bidirectional controls and zero-width characters are refused in product
 * codes and names, calculation titles and user names (422 naming the field, nothing stored), and product codes are
 * unique regardless of case (cv-400 cannot join CV-400), on PostgreSQL and on the embedded database. Codes that
 * already collided before the unique index keep their rows (records are never changed).
 */
import { CreatedCaseInsensitiveProductCodeIndex20261204220000 } from '../../migrations/20261204220000-created-case-insensitive-product-code-index';
import { clearDesign } from '../support/designs';
import { BACKENDS, countRecords, startTestApp, type TestApp } from '../support/harness';

describe.each(BACKENDS)('on %s', (backend) => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp(backend);
  });
  afterAll(() => t?.close());

  it('refuses bidi controls and zero-width characters in codes, names and titles with 422 naming the field, storing nothing', async () => {
    const before = await countRecords(t.db);
    const cases: [string, string, unknown, string, 'author' | 'admin'][] = [
      ['POST', '/api/v1/products', { code: 'CV-400', name: 'Lifting jack \u202Egnp.exe' }, 'name', 'author'],
      ['POST', '/api/v1/products', { code: 'CV\u200B-400', name: 'Lifting jack' }, 'code', 'author'],
      ['POST', '/api/v1/products', { code: '\u2066CV-401', name: 'Lifting jack' }, 'code', 'author'],
      ['POST', '/api/v1/products', { code: 'CV-402', name: 'Lifting\uFEFF jack' }, 'name', 'author'],
      ['POST', '/api/v1/users', { name: 'Checking\u200D engineer', roles: ['reviewer'] }, 'name', 'admin'],
      ['POST', '/api/v1/users', { name: '\u200FChecking engineer', roles: ['reviewer'] }, 'name', 'admin'],
    ];
    for (const [method, url, body, field, as] of cases) {
      const res = await t.call(method, url, body, { as });
      expect([url, field, res.status]).toEqual([url, field, 422]);
      expect(res.body.errors).toContainEqual({ path: field, message: expect.stringMatching(/bidirectional control|zero-width or invisible/) });
    }
    expect(await countRecords(t.db)).toEqual(before);
    const product = await t.call('POST', '/api/v1/products', { code: 'TITLE-1', name: 'Titles' });
    const mid = await countRecords(t.db);
    const title = await t.call('POST', `/api/v1/products/${product.body.id}/calculations`, { title: 'Lift screw \u202Dleft', design: clearDesign });
    expect(title.status).toBe(422);
    expect(title.body.errors).toContainEqual({ path: 'title', message: expect.stringMatching(/U\+202D/) });
    expect(await countRecords(t.db)).toEqual(mid);
    // the same names without the controls are accepted, in any script
    expect((await t.call('POST', '/api/v1/products', { code: 'CV-400', name: 'Hubgetriebe Ø 40 – مكبس' })).status).toBe(201);
  });

  it('keeps product codes unique regardless of case [POST /api/v1/products]', async () => {
    expect((await t.call('POST', '/api/v1/products', { code: 'CASE-400', name: 'first' })).status).toBe(201);
    const before = await countRecords(t.db);
    for (const code of ['case-400', 'Case-400', 'CASE-400']) {
      const res = await t.call('POST', '/api/v1/products', { code, name: 'second' });
      expect([code, res.status]).toEqual([code, 409]);
      expect(res.body.detail).toContain('"CASE-400"');
      expect(res.body.errors).toEqual([{ path: 'code', message: 'already in use' }]);
    }
    expect(await countRecords(t.db)).toEqual(before);
  });
});

it('keeps codes that collided before the index, and refuses any new collision with them (migration 20261204220000)', async () => {
  const t = await startTestApp('postgres');
  try {
    // the state before the migration: no case-insensitive index, two codes that differ only in case
    await t.db.query(`DROP INDEX products_code_lower_key`);
    await t.db.query(`INSERT INTO products (id, code, name) VALUES ('00000000-0000-4000-8000-000000000401', 'OLD-400', 'earlier'), ('00000000-0000-4000-8000-000000000402', 'old-400', 'later')`);
    const runner = t.db.dataSource.createQueryRunner();
    try {
      await new CreatedCaseInsensitiveProductCodeIndex20261204220000().up(runner);
    } finally {
      await runner.release();
    }
    const kept = await t.db.query<{ code: string }>(`SELECT code FROM products WHERE lower(code) = 'old-400' ORDER BY code`);
    expect(kept.map((r) => r.code)).toEqual(['OLD-400', 'old-400']);
    const res = await t.call('POST', '/api/v1/products', { code: 'Old-400', name: 'third' });
    expect(res.status).toBe(409);
    expect(res.body.detail).toContain('"OLD-400"');
    expect((await t.call('POST', '/api/v1/products', { code: 'NEW-400', name: 'new' })).status).toBe(201);
    expect((await t.call('POST', '/api/v1/products', { code: 'new-400', name: 'new' })).status).toBe(409);
  } finally {
    await t.close();
  }
});

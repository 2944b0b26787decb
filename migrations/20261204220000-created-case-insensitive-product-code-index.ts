import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Product codes are unique regardless of case: "cv-400" cannot be registered beside "CV-400". A unique index on
 * lower(code) (codes are ASCII letters, digits, ".", "_" and "-", so lower() folds exactly the letters). Records are
 * never changed or deleted, so codes registered before this migration that already collide regardless of case keep
 * their rows: the earliest of each such group is indexed, the later ones are listed (by id) outside the index, and
 * no new code may collide with any group. The old case-sensitive unique constraint stays.
 */
export class CreatedCaseInsensitiveProductCodeIndex20261204220000 implements MigrationInterface {
  name = 'CreatedCaseInsensitiveProductCodeIndex20261204220000';

  async up(q: QueryRunner): Promise<void> {
    const later: { id: string }[] = await q.query(
      `SELECT id::text AS id FROM (SELECT id, row_number() OVER (PARTITION BY lower(code) ORDER BY created_at, id) AS n FROM products) ranked WHERE n > 1 ORDER BY id`,
    );
    for (const { id } of later) {
      if (!/^[0-9a-f-]{36}$/.test(id)) throw new Error(`unexpected product id ${JSON.stringify(id)}`);
    }
    const outside = later.length ? ` WHERE id NOT IN (${later.map(({ id }) => `'${id}'::uuid`).join(', ')})` : '';
    await q.query(`CREATE UNIQUE INDEX products_code_lower_key ON products (lower(code))${outside}`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX products_code_lower_key`);
  }
}

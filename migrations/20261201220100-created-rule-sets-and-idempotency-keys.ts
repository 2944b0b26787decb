import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Rule-set versions (insert-only) and idempotency keys for retried submissions. */
export class CreatedRuleSetsAndIdempotencyKeys20261201220100 implements MigrationInterface {
  name = 'CreatedRuleSetsAndIdempotencyKeys20261201220100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE rule_sets (
        version text PRIMARY KEY,
        definition jsonb NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE TRIGGER rule_sets_immutable BEFORE UPDATE OR DELETE ON rule_sets
      FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
    await q.query(`
      CREATE TABLE idempotency_keys (
        scope text NOT NULL,
        key text NOT NULL,
        request_hash text NOT NULL,
        status integer NOT NULL,
        response jsonb NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (scope, key)
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE idempotency_keys`);
    throw new Error('rule sets are permanent: only the idempotency keys were dropped');
  }
}

import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Which rule-set version judges new submissions: the latest adoption (insert-only history of who adopted what, when). */
export class CreatedRuleSetAdoptions20261201220400 implements MigrationInterface {
  name = 'CreatedRuleSetAdoptions20261201220400';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE rule_set_adoptions (
        id uuid PRIMARY KEY,
        version text NOT NULL REFERENCES rule_sets(version),
        adopted_by uuid,
        note text,
        adopted_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX rule_set_adoptions_latest_idx ON rule_set_adoptions (adopted_at DESC, id)`);
    await q.query(`CREATE TRIGGER rule_set_adoptions_immutable BEFORE UPDATE OR DELETE ON rule_set_adoptions
      FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
  }

  async down(): Promise<void> {
    throw new Error('rule-set adoptions are permanent: this migration is not reversible');
  }
}

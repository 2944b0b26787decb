import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The chain head is the one row that changes: it may only move forward (seq grows, product unchanged) and can
 * never be deleted or truncated. Rule sets and their adoptions refuse TRUNCATE like the other record tables.
 */
export class GuardedChainHeadsAndRuleTables20261201220500 implements MigrationInterface {
  name = 'GuardedChainHeadsAndRuleTables20261201220500';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE FUNCTION leadline_head_moves_forward() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'DELETE' THEN
          RAISE EXCEPTION 'leadline: DELETE on chain_heads is not allowed: records are immutable' USING ERRCODE = 'P0001';
        END IF;
        IF NEW.product_id <> OLD.product_id OR NEW.seq <= OLD.seq THEN
          RAISE EXCEPTION 'leadline: a chain head only moves forward (seq % -> %)', OLD.seq, NEW.seq USING ERRCODE = 'P0001';
        END IF;
        RETURN NEW;
      END $$`);
    await q.query(`CREATE TRIGGER chain_heads_forward BEFORE UPDATE OR DELETE ON chain_heads
      FOR EACH ROW EXECUTE FUNCTION leadline_head_moves_forward()`);
    for (const table of ['chain_heads', 'rule_sets', 'rule_set_adoptions']) {
      await q.query(`CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table}
        FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
    }
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of ['chain_heads', 'rule_sets', 'rule_set_adoptions']) await q.query(`DROP TRIGGER ${table}_no_truncate ON ${table}`);
    await q.query(`DROP TRIGGER chain_heads_forward ON chain_heads`);
    await q.query(`DROP FUNCTION leadline_head_moves_forward()`);
  }
}

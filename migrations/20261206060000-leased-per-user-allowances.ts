import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Per-user allowances taken in leases: `queue.take_allowances` takes up to p_want tokens from a key's shared bucket in
 * one locked step and answers how many it granted and, when none, the seconds until one more is allowed. An instance
 * spends a lease locally and asks again when it is used up (infra/http/user-limits.ts), so a busy user costs one round
 * trip per lease instead of one per request, and the instances together never allow more than the shared bucket
 * holds. The bucket is the one of migrations/20261206050100 (a minute's allowance refilled evenly; a new key starts
 * full; a refused take costs nothing).
 */
export class LeasedPerUserAllowances20261206060000 implements MigrationInterface {
  name = 'LeasedPerUserAllowances20261206060000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE FUNCTION queue.take_allowances(p_scope text, p_key text, p_per_minute double precision, p_now timestamptz, p_want integer)
      RETURNS TABLE (granted integer, wait integer) LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      DECLARE
        v_rate double precision := p_per_minute / 60000.0; -- per ms
        v_tokens double precision;
        v_since timestamptz;
        v_granted integer;
      BEGIN
        IF p_want IS NULL OR p_want < 1 THEN
          RAISE EXCEPTION 'p_want must be at least 1' USING ERRCODE = '22023';
        END IF;
        INSERT INTO queue.limit_counters (scope, key, since, amount) VALUES (p_scope, p_key, p_now, p_per_minute)
        ON CONFLICT (scope, key) DO NOTHING;
        SELECT c.since, c.amount INTO v_since, v_tokens FROM queue.limit_counters c WHERE c.scope = p_scope AND c.key = p_key FOR UPDATE;
        v_tokens := least(p_per_minute, v_tokens + greatest(0, extract(epoch FROM p_now - v_since) * 1000) * v_rate);
        v_granted := least(p_want, floor(v_tokens))::integer;
        UPDATE queue.limit_counters c SET amount = v_tokens - v_granted, since = greatest(c.since, p_now) WHERE c.scope = p_scope AND c.key = p_key;
        IF v_granted > 0 THEN
          IF random() < 0.01 THEN
            DELETE FROM queue.limit_counters c WHERE c.since < p_now - interval '1 hour';
          END IF;
          RETURN QUERY SELECT v_granted, 0;
        ELSE
          RETURN QUERY SELECT 0, greatest(1, ceil((1 - v_tokens) / v_rate / 1000))::integer;
        END IF;
      END $$`);
    await q.query(`REVOKE ALL ON FUNCTION queue.take_allowances(text, text, double precision, timestamptz, integer) FROM PUBLIC`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP FUNCTION queue.take_allowances(text, text, double precision, timestamptz, integer)`);
  }
}

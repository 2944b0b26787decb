import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The failed-authentication limits and the per-user request limits, kept in the database so that every instance of
 * the service counts against the same numbers (N instances no longer allow N times the attempts).
 *
 * `queue.limit_counters` holds one row per (scope, key): for a failure limit the start of the fixed window and the
 * failures in it; for a per-user allowance (token bucket) the time of the last take and the tokens left. The runtime
 * role has no privilege on the table at all: it calls the three SECURITY DEFINER functions below (granted in
 * infra/database/migrate.ts, grantQueue), each of which changes or reads one row in one stated way. Chosen over a
 * table the runtime role may write because a counter must be read and moved in one locked step (a row lock in the
 * function), and because the runtime role keeps no UPDATE or DELETE anywhere.
 *
 * UNLOGGED: the counters are short-lived (a minute) and need no crash safety; a crash forgets them, as a restart of
 * an instance used to. Writing only unlogged rows also commits without waiting for a WAL flush, which keeps the
 * per-request cost of the per-user limits low. Rows idle for an hour are pruned now and then by the writers.
 * Times come from the service's clock (p_now), as every other limit decision does.
 */
export class CreatedSharedLimitCounters20261206050100 implements MigrationInterface {
  name = 'CreatedSharedLimitCounters20261206050100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE UNLOGGED TABLE queue.limit_counters (
        scope text NOT NULL CHECK (scope ~ '^[a-z][a-z0-9.:-]{0,63}$'),
        key text NOT NULL CHECK (length(key) BETWEEN 1 AND 200),
        since timestamptz NOT NULL,
        amount double precision NOT NULL,
        PRIMARY KEY (scope, key)
      )`);
    await q.query(`CREATE INDEX limit_counters_since_idx ON queue.limit_counters (since)`);
    // Seconds until the key may fail again (0: not limited); a fixed window of p_window_ms holding p_max failures
    await q.query(`
      CREATE FUNCTION queue.failures_blocked(p_scope text, p_key text, p_max integer, p_window_ms integer, p_now timestamptz)
      RETURNS integer LANGUAGE sql STABLE SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
        SELECT coalesce((
          SELECT CASE WHEN c.amount >= p_max AND p_now < c.since + make_interval(secs => p_window_ms / 1000.0)
                      THEN greatest(1, ceil(extract(epoch FROM c.since + make_interval(secs => p_window_ms / 1000.0) - p_now)))::integer
                      ELSE 0 END
            FROM queue.limit_counters c WHERE c.scope = p_scope AND c.key = p_key), 0)
      $$`);
    // One more failure for the key: counted in the running window, or the first of a new one
    await q.query(`
      CREATE FUNCTION queue.record_failure(p_scope text, p_key text, p_window_ms integer, p_now timestamptz)
      RETURNS void LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      BEGIN
        INSERT INTO queue.limit_counters AS c (scope, key, since, amount) VALUES (p_scope, p_key, p_now, 1)
        ON CONFLICT (scope, key) DO UPDATE
          SET since = CASE WHEN p_now >= c.since + make_interval(secs => p_window_ms / 1000.0) THEN p_now ELSE c.since END,
              amount = CASE WHEN p_now >= c.since + make_interval(secs => p_window_ms / 1000.0) THEN 1 ELSE c.amount + 1 END;
        IF random() < 0.01 THEN
          DELETE FROM queue.limit_counters WHERE since < p_now - interval '1 hour';
        END IF;
      END $$`);
    // Takes one from the key's bucket (a minute's allowance, refilled evenly over the minute; a new key starts
    // full): 0 when allowed, else the whole seconds until one more is allowed. A refused take costs nothing.
    await q.query(`
      CREATE FUNCTION queue.take_allowance(p_scope text, p_key text, p_per_minute double precision, p_now timestamptz)
      RETURNS integer LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      DECLARE
        v_rate double precision := p_per_minute / 60000.0; -- per ms
        v_tokens double precision;
        v_since timestamptz;
      BEGIN
        INSERT INTO queue.limit_counters (scope, key, since, amount) VALUES (p_scope, p_key, p_now, p_per_minute)
        ON CONFLICT (scope, key) DO NOTHING;
        SELECT since, amount INTO v_since, v_tokens FROM queue.limit_counters WHERE scope = p_scope AND key = p_key FOR UPDATE;
        v_tokens := least(p_per_minute, v_tokens + greatest(0, extract(epoch FROM p_now - v_since) * 1000) * v_rate);
        IF v_tokens >= 1 THEN
          UPDATE queue.limit_counters SET amount = v_tokens - 1, since = greatest(since, p_now) WHERE scope = p_scope AND key = p_key;
          IF random() < 0.01 THEN
            DELETE FROM queue.limit_counters WHERE since < p_now - interval '1 hour';
          END IF;
          RETURN 0;
        END IF;
        UPDATE queue.limit_counters SET amount = v_tokens, since = greatest(since, p_now) WHERE scope = p_scope AND key = p_key;
        RETURN greatest(1, ceil((1 - v_tokens) / v_rate / 1000))::integer;
      END $$`);
    for (const fn of [
      'queue.failures_blocked(text, text, integer, integer, timestamptz)',
      'queue.record_failure(text, text, integer, timestamptz)',
      'queue.take_allowance(text, text, double precision, timestamptz)',
    ]) {
      await q.query(`REVOKE ALL ON FUNCTION ${fn} FROM PUBLIC`);
    }
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP FUNCTION queue.take_allowance(text, text, double precision, timestamptz)`);
    await q.query(`DROP FUNCTION queue.record_failure(text, text, integer, timestamptz)`);
    await q.query(`DROP FUNCTION queue.failures_blocked(text, text, integer, integer, timestamptz)`);
    await q.query(`DROP TABLE queue.limit_counters`);
  }
}

import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The job queue, webhook endpoints, delivery attempts and mail preferences, in a schema of their own (`queue`).
 *
 * These are operational tables, not records: a job moves from ready to running to done, an endpoint is disabled or
 * its secret rotated. The runtime role nevertheless gets no UPDATE or DELETE here either (granted in
 * infra/database/migrate.ts, grantQueue): it may SELECT and INSERT (enqueue, record an attempt, set a preference),
 * and every state change goes through the SECURITY DEFINER functions below, owned by the migrations' owner role,
 * each changing one row in one stated way. A separate schema keeps these grants apart from the record tables'.
 *
 * The outbox: AFTER INSERT triggers on `events` and `rule_set_adoptions` enqueue one `event` job in the transaction
 * that appends the record, whichever code path appends it, so a committed decision always notifies and a rolled-back
 * one never does. The job carries a thin payload: the event's type and the ids it concerns, no design content.
 * A trigger on `token_revocations` sends NOTIFY leadline_revocations, so every instance drops its cached token lookups.
 * Claiming takes ready jobs with FOR UPDATE SKIP LOCKED (any number of instances, each job to one of them); a
 * running job whose lease ran out (its instance died) is taken again. Times are passed in by the service's clock.
 */
export class CreatedJobQueueAndOutbox20261205000200 implements MigrationInterface {
  name = 'CreatedJobQueueAndOutbox20261205000200';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE SCHEMA queue`);
    await q.query(`
      CREATE TABLE queue.jobs (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        kind text NOT NULL CHECK (kind ~ '^[a-z][a-z0-9.-]{0,63}$'),
        payload jsonb NOT NULL,
        dedupe_key text UNIQUE,
        state text NOT NULL DEFAULT 'ready' CHECK (state IN ('ready', 'running', 'done', 'failed')),
        run_at timestamptz NOT NULL DEFAULT now(),
        attempts integer NOT NULL DEFAULT 0,
        max_attempts integer NOT NULL DEFAULT 5 CHECK (max_attempts >= 1),
        locked_by text,
        locked_until timestamptz,
        progress jsonb,
        result jsonb,
        last_error text,
        created_by uuid,
        created_at timestamptz NOT NULL DEFAULT now(),
        finished_at timestamptz
      )`);
    await q.query(`CREATE INDEX jobs_due_idx ON queue.jobs (run_at) WHERE state IN ('ready', 'running')`);
    await q.query(`
      CREATE TABLE queue.webhook_endpoints (
        id uuid PRIMARY KEY,
        url text NOT NULL,
        events text[] NOT NULL CHECK (cardinality(events) > 0),
        secret text NOT NULL CHECK (secret LIKE 'whsec\\_%'),
        enabled boolean NOT NULL DEFAULT true,
        disabled_reason text,
        disabled_at timestamptz,
        rotated_at timestamptz,
        created_by uuid,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`
      CREATE TABLE queue.webhook_attempts (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        endpoint_id uuid NOT NULL REFERENCES queue.webhook_endpoints(id),
        job_id uuid NOT NULL REFERENCES queue.jobs(id),
        message_id text NOT NULL,
        event_type text NOT NULL,
        attempt integer NOT NULL CHECK (attempt >= 1),
        attempted_at timestamptz NOT NULL,
        status integer,
        error text,
        outcome text NOT NULL CHECK (outcome IN ('delivered', 'retry', 'gave-up', 'disabled')),
        next_attempt_at timestamptz,
        duration_ms integer NOT NULL
      )`);
    await q.query(`CREATE INDEX webhook_attempts_endpoint_idx ON queue.webhook_attempts (endpoint_id, attempted_at DESC)`);
    await q.query(`
      CREATE TABLE queue.mail_preferences (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES users(id),
        email text,
        enabled boolean NOT NULL,
        set_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX mail_preferences_user_idx ON queue.mail_preferences (user_id, set_at DESC, id)`);

    // State changes: one function per move, each refusing a row it does not own (lease holder)
    await q.query(`
      CREATE FUNCTION queue.claim(p_worker text, p_kinds text[], p_limit integer, p_now timestamptz, p_lease_seconds integer)
      RETURNS SETOF queue.jobs LANGUAGE sql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
        UPDATE queue.jobs j
           SET state = 'running', attempts = j.attempts + 1, locked_by = p_worker,
               locked_until = p_now + make_interval(secs => p_lease_seconds)
         WHERE j.id IN (SELECT c.id FROM queue.jobs c
                         WHERE c.kind = ANY (p_kinds)
                           AND ((c.state = 'ready' AND c.run_at <= p_now) OR (c.state = 'running' AND c.locked_until < p_now))
                         ORDER BY c.run_at, c.created_at
                         LIMIT greatest(p_limit, 0)
                         FOR UPDATE SKIP LOCKED)
        RETURNING j.*
      $$`);
    await q.query(`
      CREATE FUNCTION queue.finish(p_id uuid, p_worker text, p_state text, p_result jsonb, p_error text, p_run_at timestamptz)
      RETURNS boolean LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      BEGIN
        IF p_state NOT IN ('done', 'failed', 'ready') THEN
          RAISE EXCEPTION 'a job finishes done, failed or ready for a retry, not %', p_state USING ERRCODE = '22023';
        END IF;
        UPDATE queue.jobs
           SET state = p_state, result = CASE WHEN p_state = 'done' THEN p_result ELSE result END,
               last_error = p_error, locked_by = NULL, locked_until = NULL,
               run_at = CASE WHEN p_state = 'ready' THEN p_run_at ELSE run_at END,
               finished_at = CASE WHEN p_state = 'ready' THEN NULL ELSE clock_timestamp() END
         WHERE id = p_id AND state = 'running' AND locked_by = p_worker;
        RETURN FOUND;
      END $$`);
    await q.query(`
      CREATE FUNCTION queue.report_progress(p_id uuid, p_worker text, p_progress jsonb, p_lease_until timestamptz)
      RETURNS boolean LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      BEGIN
        UPDATE queue.jobs SET progress = p_progress, locked_until = greatest(locked_until, p_lease_until)
         WHERE id = p_id AND state = 'running' AND locked_by = p_worker;
        RETURN FOUND;
      END $$`);
    await q.query(`
      CREATE FUNCTION queue.disable_endpoint(p_id uuid, p_reason text)
      RETURNS boolean LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      BEGIN
        UPDATE queue.webhook_endpoints SET enabled = false, disabled_reason = p_reason, disabled_at = clock_timestamp()
         WHERE id = p_id AND enabled;
        RETURN FOUND;
      END $$`);
    await q.query(`
      CREATE FUNCTION queue.rotate_endpoint_secret(p_id uuid, p_secret text)
      RETURNS boolean LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      BEGIN
        UPDATE queue.webhook_endpoints SET secret = p_secret, rotated_at = clock_timestamp() WHERE id = p_id;
        RETURN FOUND;
      END $$`);

    // The outbox triggers: the job is written by the transaction that writes the record
    await q.query(`
      CREATE FUNCTION queue.enqueue_record_event() RETURNS trigger
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      DECLARE
        v_type text;
        v_data jsonb;
        v_at timestamptz;
      BEGIN
        IF TG_TABLE_NAME = 'rule_set_adoptions' THEN
          v_type := 'rule-set.adopted';
          v_data := jsonb_build_object('version', NEW.version, 'adoptionId', NEW.id);
          v_at := NEW.adopted_at;
        ELSE
          v_type := CASE NEW.type
            WHEN 'revision-submitted' THEN 'revision.submitted'
            WHEN 'approved' THEN 'revision.approved'
            WHEN 'rejected' THEN 'revision.rejected'
            WHEN 'withdrawn' THEN 'revision.withdrawn'
            WHEN 'calculation-opened' THEN 'calculation.opened'
            WHEN 'comment' THEN 'revision.commented'
            ELSE NULL END;
          IF v_type IS NULL THEN
            RETURN NULL;
          END IF;
          v_data := jsonb_strip_nulls(jsonb_build_object('eventId', NEW.id, 'productId', NEW.product_id,
            'calculationId', NEW.calculation_id, 'revisionId', NEW.revision_id));
          v_at := NEW.created_at;
        END IF;
        INSERT INTO queue.jobs (kind, payload, dedupe_key, max_attempts)
        VALUES ('event', jsonb_build_object('type', v_type, 'timestamp', to_char(v_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"'), 'data', v_data),
                'event:' || NEW.id::text, 20);
        PERFORM pg_notify('leadline_jobs', 'event');
        RETURN NULL;
      END $$`);
    await q.query(`CREATE TRIGGER events_enqueue AFTER INSERT ON events FOR EACH ROW EXECUTE FUNCTION queue.enqueue_record_event()`);
    await q.query(`CREATE TRIGGER rule_set_adoptions_enqueue AFTER INSERT ON rule_set_adoptions FOR EACH ROW EXECUTE FUNCTION queue.enqueue_record_event()`);
    // A revocation tells every instance listening to drop its cached token lookups at once
    await q.query(`
      CREATE FUNCTION queue.notify_revocation() RETURNS trigger
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      BEGIN
        PERFORM pg_notify('leadline_revocations', NEW.token_id::text);
        RETURN NULL;
      END $$`);
    await q.query(`CREATE TRIGGER token_revocations_notify AFTER INSERT ON token_revocations FOR EACH ROW EXECUTE FUNCTION queue.notify_revocation()`);
    for (const fn of [
      'queue.notify_revocation()',
      'queue.claim(text, text[], integer, timestamptz, integer)',
      'queue.finish(uuid, text, text, jsonb, text, timestamptz)',
      'queue.report_progress(uuid, text, jsonb, timestamptz)',
      'queue.disable_endpoint(uuid, text)',
      'queue.rotate_endpoint_secret(uuid, text)',
      'queue.enqueue_record_event()',
    ]) {
      await q.query(`REVOKE ALL ON FUNCTION ${fn} FROM PUBLIC`);
    }
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TRIGGER token_revocations_notify ON token_revocations`);
    await q.query(`DROP TRIGGER rule_set_adoptions_enqueue ON rule_set_adoptions`);
    await q.query(`DROP TRIGGER events_enqueue ON events`);
    await q.query(`DROP SCHEMA queue CASCADE`);
  }
}

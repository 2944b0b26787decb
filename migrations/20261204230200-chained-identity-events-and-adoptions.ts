import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Identity changes and rule-set adoptions become chains like a product's: each new row of identity_events and of
 * rule_set_adoptions carries seq, hash (SHA-256 of RFC 8785 canonical JSON of { record, previousHash }, as
 * apps/api/src/records/chain.ts) and mac (HMAC with the record key), computed by the service; the record functions
 * check that a row is the next link of its ledger (ledger_heads, moved only forward and only by them) and is timed by
 * the transaction's clock, then insert it. Rows written before this migration keep seq NULL: they prove what they
 * did before (nothing about who wrote them), and an unchained adoption counts only if it was made before the chain
 * began (ledger_heads.started_at), so a back-dated or future-dated row cannot become the current rule set.
 * The identity functions of 20261204230000 are replaced by ones that take the service's chained events.
 */
export class ChainedIdentityEventsAndAdoptions20261204230200 implements MigrationInterface {
  name = 'ChainedIdentityEventsAndAdoptions20261204230200';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE ledger_heads (
        ledger text PRIMARY KEY CHECK (ledger IN ('identity', 'rule-adoption')),
        seq bigint NOT NULL,
        hash text NOT NULL,
        started_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`INSERT INTO ledger_heads (ledger, seq, hash) VALUES ('identity', 0, ''), ('rule-adoption', 0, '')`);
    await q.query(`
      CREATE FUNCTION leadline_ledger_moves_forward() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'DELETE' OR NEW.ledger <> OLD.ledger OR NEW.seq <= OLD.seq OR NEW.started_at <> OLD.started_at THEN
          RAISE EXCEPTION 'leadline: a ledger head only moves forward' USING ERRCODE = 'P0001';
        END IF;
        RETURN NEW;
      END $$`);
    await q.query(`CREATE TRIGGER ledger_heads_forward BEFORE UPDATE OR DELETE ON ledger_heads FOR EACH ROW EXECUTE FUNCTION leadline_ledger_moves_forward()`);
    await q.query(`CREATE TRIGGER ledger_heads_no_truncate BEFORE TRUNCATE ON ledger_heads FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
    for (const table of ['identity_events', 'rule_set_adoptions']) {
      await q.query(`ALTER TABLE ${table} ADD COLUMN seq bigint UNIQUE, ADD COLUMN hash text, ADD COLUMN previous_hash text, ADD COLUMN mac text`);
    }

    await q.query(`
      CREATE FUNCTION leadline_lock_ledger(p_ledger text) RETURNS TABLE (seq bigint, hash text, now text)
      LANGUAGE sql SECURITY DEFINER SET search_path = public, pg_temp AS $$
        SELECT h.seq, h.hash, to_char(now() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') FROM ledger_heads h WHERE h.ledger = p_ledger FOR UPDATE
      $$`);
    // The next link of a ledger: checks position and time, moves the head (internal: not granted to the runtime role).
    await q.query(`
      CREATE FUNCTION leadline_ledger_next(p_ledger text, p_seq bigint, p_previous_hash text, p_hash text, p_created_at text) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE h record;
      BEGIN
        SELECT l.seq, l.hash INTO h FROM ledger_heads l WHERE l.ledger = p_ledger FOR UPDATE;
        IF p_seq IS DISTINCT FROM h.seq + 1 OR coalesce(p_previous_hash, '') IS DISTINCT FROM h.hash OR p_hash IS NULL THEN
          RAISE EXCEPTION 'leadline: link % is not the next link of the % ledger (head at %)', p_seq, p_ledger, h.seq USING ERRCODE = 'P0001';
        END IF;
        IF p_created_at IS DISTINCT FROM to_char(now() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') THEN
          RAISE EXCEPTION 'leadline: a link is timed by the database clock of its transaction' USING ERRCODE = 'P0001';
        END IF;
        UPDATE ledger_heads SET seq = p_seq, hash = p_hash WHERE ledger = p_ledger;
      END $$`);
    // Inserts the service's chained identity events for one act by (p_actor, p_actor_token).
    await q.query(`
      CREATE FUNCTION leadline_put_identity_events(p_actor uuid, p_actor_token uuid, p_events jsonb) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE e jsonb;
      BEGIN
        FOR e IN SELECT x FROM jsonb_array_elements(p_events) x LOOP
          IF (e->>'actorId')::uuid IS DISTINCT FROM p_actor OR (e->>'actorTokenId')::uuid IS DISTINCT FROM p_actor_token THEN
            RAISE EXCEPTION 'leadline: an identity event names the actor and token that act' USING ERRCODE = 'LL403';
          END IF;
          PERFORM leadline_ledger_next('identity', (e->>'seq')::bigint, e->>'previousHash', e->>'hash', e->>'createdAt');
          INSERT INTO identity_events (id, type, actor_id, actor_token_id, subject_user_id, token_id, data, created_at, seq, hash, previous_hash, mac)
          VALUES ((e->>'id')::uuid, e->>'type', p_actor, p_actor_token, (e->>'subjectUserId')::uuid, (e->>'tokenId')::uuid, e->'data', now(),
            (e->>'seq')::bigint, e->>'hash', e->>'previousHash', e->>'mac');
        END LOOP;
      END $$`);

    await q.query(`DROP FUNCTION leadline_create_user(text, uuid, text, text[])`);
    await q.query(`DROP FUNCTION leadline_issue_token(text, uuid, uuid, text, text, timestamptz, integer)`);
    await q.query(`DROP FUNCTION leadline_revoke_token(text, uuid, uuid)`);
    await q.query(`DROP FUNCTION leadline_adopt_rule_set(text, uuid, text, text)`);
    await q.query(`
      CREATE FUNCTION leadline_create_user(p_credential text, p_id uuid, p_name text, p_roles text[], p_events jsonb) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: creating a user needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF jsonb_array_length(p_events) <> 1 + cardinality(p_roles) OR p_events->0->>'type' <> 'user-created'
           OR p_events->0->'data' IS DISTINCT FROM jsonb_build_object('name', p_name, 'roles', to_jsonb(p_roles))
           OR EXISTS (SELECT 1 FROM jsonb_array_elements(p_events) e WHERE (e->>'subjectUserId')::uuid IS DISTINCT FROM p_id OR e->>'tokenId' IS NOT NULL)
           OR EXISTS (SELECT 1 FROM unnest(p_roles) WITH ORDINALITY r(role, i)
                       WHERE p_events->(i::int)->>'type' IS DISTINCT FROM 'role-granted' OR p_events->(i::int)->'data' IS DISTINCT FROM jsonb_build_object('role', r.role)) THEN
          RAISE EXCEPTION 'leadline: a new user is recorded by user-created and one role-granted event per role' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO users (id, name, roles, created_by, created_at) VALUES (p_id, p_name, p_roles, c.user_id, now());
        PERFORM leadline_put_identity_events(c.user_id, c.token_id, p_events);
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_issue_token(p_credential text, p_id uuid, p_user uuid, p_token_hash text, p_label text, p_expires_at timestamptz, p_events jsonb)
        RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: issuing a token needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF p_token_hash !~ '^[0-9a-f]{64}$' OR p_expires_at IS NULL THEN
          RAISE EXCEPTION 'leadline: a token is stored as its keyed hash, with its expiry' USING ERRCODE = 'P0001';
        END IF;
        IF jsonb_array_length(p_events) <> 1 OR p_events->0->>'type' <> 'token-issued' OR (p_events->0->>'subjectUserId')::uuid IS DISTINCT FROM p_user
           OR (p_events->0->>'tokenId')::uuid IS DISTINCT FROM p_id OR p_events->0->'data'->>'label' IS DISTINCT FROM p_label
           OR (p_events->0->'data'->>'expiresAt')::timestamptz IS DISTINCT FROM p_expires_at THEN
          RAISE EXCEPTION 'leadline: a new token is recorded by its token-issued event' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO tokens (id, user_id, token_hash, label, created_by, created_at, expires_at, hash_kind)
        VALUES (p_id, p_user, p_token_hash, p_label, c.user_id, now(), p_expires_at, 'hmac');
        PERFORM leadline_put_identity_events(c.user_id, c.token_id, p_events);
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_revoke_token(p_credential text, p_user uuid, p_token uuid, p_events jsonb) RETURNS boolean
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: revoking a token needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF NOT EXISTS (SELECT 1 FROM tokens t WHERE t.id = p_token AND t.user_id = p_user) THEN
          RAISE EXCEPTION 'leadline: token % of user % not found', p_token, p_user USING ERRCODE = 'P0002';
        END IF;
        INSERT INTO token_revocations (token_id, revoked_by, revoked_at) VALUES (p_token, c.user_id, now()) ON CONFLICT (token_id) DO NOTHING;
        IF NOT FOUND THEN RETURN false; END IF;
        IF jsonb_array_length(p_events) <> 1 OR p_events->0->>'type' <> 'token-revoked' OR (p_events->0->>'subjectUserId')::uuid IS DISTINCT FROM p_user
           OR (p_events->0->>'tokenId')::uuid IS DISTINCT FROM p_token THEN
          RAISE EXCEPTION 'leadline: a revocation is recorded by its token-revoked event' USING ERRCODE = 'P0001';
        END IF;
        PERFORM leadline_put_identity_events(c.user_id, c.token_id, p_events);
        RETURN true;
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_adopt_rule_set(p_credential text, p_id uuid, p_version text, p_note text, p_seq bigint, p_created_at text,
        p_hash text, p_previous_hash text, p_mac text) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: adopting a rule set needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF NOT EXISTS (SELECT 1 FROM rule_sets s WHERE s.version = p_version) THEN
          RAISE EXCEPTION 'leadline: rule set % not found', p_version USING ERRCODE = 'P0002';
        END IF;
        PERFORM leadline_ledger_next('rule-adoption', p_seq, p_previous_hash, p_hash, p_created_at);
        INSERT INTO rule_set_adoptions (id, version, adopted_by, note, adopted_at, seq, hash, previous_hash, mac)
        VALUES (p_id, p_version, c.user_id, p_note, now(), p_seq, p_hash, p_previous_hash, p_mac);
      END $$`);
    for (const fn of [
      'leadline_lock_ledger(text)',
      'leadline_ledger_next(text, bigint, text, text, text)',
      'leadline_put_identity_events(uuid, uuid, jsonb)',
      'leadline_create_user(text, uuid, text, text[], jsonb)',
      'leadline_issue_token(text, uuid, uuid, text, text, timestamptz, jsonb)',
      'leadline_revoke_token(text, uuid, uuid, jsonb)',
      'leadline_adopt_rule_set(text, uuid, text, text, bigint, text, text, text, text)',
    ]) {
      await q.query(`REVOKE ALL ON FUNCTION ${fn} FROM PUBLIC`);
    }
  }

  async down(): Promise<void> {
    throw new Error('chained identity events and adoptions are records: this migration is not reversible');
  }
}

import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Records the database credential alone cannot forge (docs/reliability.md, "Threat model").
 *
 * Link format 3. Every new link carries `mac` = HMAC-SHA256 over its link hash with a key the service holds outside
 * the database (apps/api/src/records/record-key.ts). The service is the one writer of links: it computes the hash and
 * the MAC and hands both to the functions below, which check the invariants and insert. What an older link still
 * proves: a link of format 1 or 2 (every row written before this migration) is verified by its hash as before; that
 * proves it has not changed since the next link was written, and nothing about who wrote it, because anyone who
 * could insert rows could compute such a hash. Verify therefore refuses a format 1 or 2 link that follows a format 3
 * link: from the first sealed link on, every link must be sealed.
 *
 * Writes go through SECURITY DEFINER functions only. The runtime role keeps SELECT (not on tokens.token_hash) and
 * INSERT on idempotency_keys, nothing else (infra/database/migrate.ts grants it). Each function takes a credential:
 * the stored hash of the acting user's bearer token, which the service computes from the presented token with its
 * key (the runtime role cannot read the column, nor compute the hash), or the service credential (table
 * service_keys keeps only its SHA-256). The functions enforce what the service enforces:
 * - leadline_register_product: an author or admin registers a product (its row, head and first link);
 * - leadline_append_revision: the calculation's owner, holding the author role, appends a revision and its
 *   submission event; the verdict must agree with the findings (blocked iff a blocking finding, needs-acknowledgement
 *   iff warnings only) and the rule set must be stored;
 * - leadline_append_event: comment (author or reviewer), calculation-opened (author; writes the calculation row),
 *   calculation-reassigned (admin; to an author), approved/rejected (a user token only: the reviewer role, not an
 *   admin, not the author, not with a token the author issued, the latest revision, undecided, an approval only
 *   without blocking findings and with every warning acknowledged; writes the closure), withdrawn (the author; the
 *   latest, undecided; writes the closure);
 * - leadline_create_user, leadline_issue_token, leadline_revoke_token: an admin (or the service), each audited in
 *   identity_events with the acting user and token;
 * - leadline_store_rule_set, leadline_adopt_rule_set: an admin (or the service); an adoption is timed by the
 *   database clock (clock_timestamp()), never by the caller.
 * Tokens gain hash_kind: rows before this migration hold a plain SHA-256 ('sha256', accepted until they expire unless
 * LEADLINE_LEGACY_TOKENS=refuse); new rows hold the keyed hash ('hmac').
 */
export class SealedLinksAndMovedWritesIntoFunctions20261204230000 implements MigrationInterface {
  name = 'SealedLinksAndMovedWritesIntoFunctions20261204230000';

  async up(q: QueryRunner): Promise<void> {
    for (const table of ['revisions', 'events']) await q.query(`ALTER TABLE ${table} ADD COLUMN mac text`);
    await q.query(`ALTER TABLE tokens ADD COLUMN hash_kind text NOT NULL DEFAULT 'sha256' CHECK (hash_kind IN ('sha256', 'hmac'))`);
    await q.query(`
      CREATE TABLE service_keys (
        id smallint PRIMARY KEY DEFAULT 1 CHECK (id = 1),
        key_id text NOT NULL,
        credential_digest text NOT NULL,
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE TRIGGER service_keys_immutable BEFORE UPDATE OR DELETE ON service_keys FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
    await q.query(`CREATE TRIGGER service_keys_no_truncate BEFORE TRUNCATE ON service_keys FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);

    // The one registration of the service's key: the first start writes it; a later start with another key is refused by the service.
    await q.query(`
      CREATE FUNCTION leadline_register_service(p_key_id text, p_credential_digest text) RETURNS TABLE (key_id text, credential_digest text)
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      BEGIN
        INSERT INTO service_keys (id, key_id, credential_digest) VALUES (1, p_key_id, p_credential_digest) ON CONFLICT (id) DO NOTHING;
        RETURN QUERY SELECT s.key_id, s.credential_digest FROM service_keys s WHERE s.id = 1;
      END $$`);

    // Who a credential is: the service, or the live token of a user (never revoked, not expired by the database clock).
    await q.query(`
      CREATE FUNCTION leadline_credential(p_credential text,
        OUT is_service boolean, OUT user_id uuid, OUT token_id uuid, OUT token_creator uuid, OUT roles text[], OUT user_name text)
      LANGUAGE plpgsql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
      BEGIN
        is_service := false;
        IF p_credential IS NULL THEN RETURN; END IF;
        IF EXISTS (SELECT 1 FROM service_keys s WHERE s.credential_digest = encode(sha256(convert_to(p_credential, 'UTF8')), 'hex')) THEN
          is_service := true;
          RETURN;
        END IF;
        SELECT t.user_id, t.id, t.created_by, u.roles, u.name INTO user_id, token_id, token_creator, roles, user_name
          FROM tokens t JOIN users u ON u.id = t.user_id
         WHERE t.token_hash = p_credential AND NOT EXISTS (SELECT 1 FROM token_revocations r WHERE r.token_id = t.id)
           AND coalesce(t.expires_at, t.created_at + interval '3650 days') > now();
      END $$`);

    // The acting user of a write: the credential's user (who must be the actor named), or the actor named when the service acts.
    await q.query(`
      CREATE FUNCTION leadline_acting(p_credential text, p_actor_id uuid, p_token_id uuid, p_roles text[], p_service_allowed boolean)
        RETURNS TABLE (is_service boolean, user_id uuid, token_id uuid, token_creator uuid, roles text[])
      LANGUAGE plpgsql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF c.is_service THEN
          IF NOT p_service_allowed THEN
            RAISE EXCEPTION 'leadline: this act needs the live token of a user' USING ERRCODE = 'LL401';
          END IF;
          RETURN QUERY SELECT true, p_actor_id, p_token_id, NULL::uuid, NULL::text[];
          RETURN;
        END IF;
        IF c.user_id IS NULL THEN
          RAISE EXCEPTION 'leadline: no live token for this credential' USING ERRCODE = 'LL401';
        END IF;
        IF p_actor_id IS DISTINCT FROM c.user_id OR p_token_id IS DISTINCT FROM c.token_id THEN
          RAISE EXCEPTION 'leadline: the actor named is not the holder of the token used' USING ERRCODE = 'LL403';
        END IF;
        IF p_roles IS NOT NULL AND NOT (c.roles && p_roles) THEN
          RAISE EXCEPTION 'leadline: this act needs the role %', array_to_string(p_roles, ' or ') USING ERRCODE = 'LL403';
        END IF;
        RETURN QUERY SELECT false, c.user_id, c.token_id, c.token_creator, c.roles;
      END $$`);

    // Locks the head and checks that the link offered is the next one, written at this transaction's time.
    await q.query(`
      CREATE FUNCTION leadline_next_link(p_product uuid, p_seq bigint, p_previous_hash text, p_created_at text) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE h record;
      BEGIN
        SELECT c.seq, c.hash INTO h FROM chain_heads c WHERE c.product_id = p_product FOR UPDATE;
        IF NOT FOUND THEN
          RAISE EXCEPTION 'leadline: product % not found', p_product USING ERRCODE = 'P0002';
        END IF;
        IF p_seq IS DISTINCT FROM h.seq + 1 OR coalesce(p_previous_hash, '') IS DISTINCT FROM h.hash THEN
          RAISE EXCEPTION 'leadline: link % is not the next link of product % (head at %)', p_seq, p_product, h.seq USING ERRCODE = 'P0001';
        END IF;
        IF p_created_at IS DISTINCT FROM to_char(now() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') THEN
          RAISE EXCEPTION 'leadline: a link is timed by the database clock of its transaction' USING ERRCODE = 'P0001';
        END IF;
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_register_product(p_credential text, p_product uuid, p_code text, p_name text, p_description text,
        p_event_id uuid, p_actor jsonb, p_token_id uuid, p_data jsonb, p_created_at text, p_hash text, p_mac text) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE a record;
      BEGIN
        SELECT * INTO a FROM leadline_acting(p_credential, (p_actor->>'id')::uuid, p_token_id, ARRAY['author', 'admin'], true);
        IF p_created_at IS DISTINCT FROM to_char(now() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') THEN
          RAISE EXCEPTION 'leadline: a link is timed by the database clock of its transaction' USING ERRCODE = 'P0001';
        END IF;
        IF p_data->>'code' IS DISTINCT FROM p_code OR p_data->>'name' IS DISTINCT FROM p_name OR p_data->>'description' IS DISTINCT FROM p_description THEN
          RAISE EXCEPTION 'leadline: the registration event must name the product as registered' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO products (id, code, name, description, created_by, created_at) VALUES (p_product, p_code, p_name, p_description, a.user_id, now());
        INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash, link_version, token_id, mac)
        VALUES (p_event_id, p_product, 1, 'product-registered', NULL, NULL, a.user_id, p_actor, p_data, now(), p_hash, NULL, 3, p_token_id, p_mac);
        INSERT INTO chain_heads (product_id, seq, hash) VALUES (p_product, 1, p_hash);
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_append_revision(p_credential text, p_calculation uuid, p_revision_id uuid, p_revision integer, p_seq bigint,
        p_note text, p_input json, p_normalized json, p_evaluation json, p_findings json, p_verdict text, p_engine text, p_rule_set text,
        p_author jsonb, p_token_id uuid, p_created_at text, p_hash text, p_previous_hash text, p_mac text,
        p_event_id uuid, p_event_data jsonb, p_event_hash text, p_event_mac text) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE
        a record;
        v_product uuid;
        v_creator uuid;
        v_owner uuid;
        v_blocking boolean;
        v_warning boolean;
      BEGIN
        SELECT * INTO a FROM leadline_acting(p_credential, (p_author->>'id')::uuid, p_token_id, ARRAY['author'], true);
        SELECT c.product_id, c.created_by INTO v_product, v_creator FROM calculations c WHERE c.id = p_calculation;
        IF NOT FOUND THEN
          RAISE EXCEPTION 'leadline: calculation % not found', p_calculation USING ERRCODE = 'P0002';
        END IF;
        PERFORM leadline_next_link(v_product, p_seq, p_previous_hash, p_created_at);
        SELECT coalesce(
          (SELECT (e.data->'to'->>'id')::uuid FROM events e
            WHERE e.calculation_id = p_calculation AND e.type = 'calculation-reassigned' ORDER BY e.seq DESC LIMIT 1),
          v_creator) INTO v_owner;
        IF v_owner IS DISTINCT FROM a.user_id THEN
          RAISE EXCEPTION 'leadline: only the owner of calculation % may add revisions', p_calculation USING ERRCODE = 'LL403';
        END IF;
        IF p_revision IS DISTINCT FROM (SELECT coalesce(max(r.revision), 0) + 1 FROM revisions r WHERE r.calculation_id = p_calculation) THEN
          RAISE EXCEPTION 'leadline: revision % of calculation % is not the next one', p_revision, p_calculation USING ERRCODE = 'LL409';
        END IF;
        SELECT coalesce(bool_or(f->>'severity' = 'blocking'), false), coalesce(bool_or(f->>'severity' = 'warning'), false)
          INTO v_blocking, v_warning FROM json_array_elements(p_findings) f;
        IF p_verdict IS DISTINCT FROM (CASE WHEN v_blocking THEN 'blocked' WHEN v_warning THEN 'needs-acknowledgement' ELSE 'clear' END) THEN
          RAISE EXCEPTION 'leadline: verdict % does not follow from the findings', p_verdict USING ERRCODE = 'LL422';
        END IF;
        IF NOT EXISTS (SELECT 1 FROM rule_sets s WHERE s.version = p_rule_set) THEN
          RAISE EXCEPTION 'leadline: rule set % is not stored', p_rule_set USING ERRCODE = 'LL422';
        END IF;
        IF p_event_data->>'revisionHash' IS DISTINCT FROM p_hash OR (p_event_data->>'revision')::int IS DISTINCT FROM p_revision
           OR p_event_data->>'verdict' IS DISTINCT FROM p_verdict THEN
          RAISE EXCEPTION 'leadline: the submission event must name the revision it submits' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO revisions (id, calculation_id, product_id, revision, seq, note, input, normalized, evaluation, findings, verdict,
          engine_version, rule_set_version, author_id, author, created_at, hash, previous_hash, link_version, token_id, mac)
        VALUES (p_revision_id, p_calculation, v_product, p_revision, p_seq, p_note, p_input, p_normalized, p_evaluation, p_findings,
          p_verdict, p_engine, p_rule_set, a.user_id, p_author, now(), p_hash, p_previous_hash, 3, p_token_id, p_mac);
        INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash,
          link_version, token_id, mac)
        VALUES (p_event_id, v_product, p_seq + 1, 'revision-submitted', p_calculation, p_revision_id, a.user_id, p_author, p_event_data,
          now(), p_event_hash, p_hash, 3, p_token_id, p_event_mac);
        UPDATE chain_heads SET seq = p_seq + 1, hash = p_event_hash WHERE product_id = v_product;
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_append_event(p_credential text, p_id uuid, p_product uuid, p_seq bigint, p_type text,
        p_calculation uuid, p_revision uuid, p_actor jsonb, p_token_id uuid, p_data jsonb, p_created_at text,
        p_hash text, p_previous_hash text, p_mac text) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE
        a record;
        r record;
        v_warning text;
        v_to record;
      BEGIN
        SELECT * INTO a FROM leadline_acting(p_credential, (p_actor->>'id')::uuid, p_token_id,
          CASE p_type WHEN 'comment' THEN ARRAY['author', 'reviewer'] WHEN 'calculation-opened' THEN ARRAY['author']
            WHEN 'calculation-reassigned' THEN ARRAY['admin'] WHEN 'approved' THEN ARRAY['reviewer'] WHEN 'rejected' THEN ARRAY['reviewer']
            WHEN 'withdrawn' THEN ARRAY['author'] ELSE ARRAY['-'] END,
          p_type NOT IN ('approved', 'rejected'));
        PERFORM leadline_next_link(p_product, p_seq, p_previous_hash, p_created_at);
        IF p_revision IS NOT NULL THEN
          SELECT x.id, x.calculation_id, x.revision, (x.author->>'id')::uuid AS author_id, x.findings::jsonb AS findings INTO r
            FROM revisions x WHERE x.id = p_revision AND x.product_id = p_product;
          IF NOT FOUND OR r.calculation_id IS DISTINCT FROM p_calculation THEN
            RAISE EXCEPTION 'leadline: revision % is not of calculation % of product %', p_revision, p_calculation, p_product USING ERRCODE = 'P0002';
          END IF;
        END IF;
        IF p_type = 'comment' THEN
          IF p_revision IS NULL THEN
            RAISE EXCEPTION 'leadline: a comment is on a revision' USING ERRCODE = 'P0001';
          END IF;
        ELSIF p_type = 'calculation-opened' THEN
          IF p_calculation IS NULL OR p_revision IS NOT NULL OR p_data->>'title' IS NULL THEN
            RAISE EXCEPTION 'leadline: calculation-opened names a new calculation and its title' USING ERRCODE = 'P0001';
          END IF;
          INSERT INTO calculations (id, product_id, title, created_by, created_at) VALUES (p_calculation, p_product, p_data->>'title', a.user_id, now());
        ELSIF p_type = 'calculation-reassigned' THEN
          IF p_calculation IS NULL OR NOT EXISTS (SELECT 1 FROM calculations c WHERE c.id = p_calculation AND c.product_id = p_product) THEN
            RAISE EXCEPTION 'leadline: calculation % is not of product %', p_calculation, p_product USING ERRCODE = 'P0002';
          END IF;
          SELECT u.id, u.roles INTO v_to FROM users u WHERE u.id = (p_data->'to'->>'id')::uuid;
          IF NOT FOUND OR NOT ('author' = ANY (v_to.roles)) THEN
            RAISE EXCEPTION 'leadline: a calculation is reassigned to an author' USING ERRCODE = 'LL422';
          END IF;
        ELSIF p_type IN ('approved', 'rejected', 'withdrawn') THEN
          IF p_revision IS NULL THEN
            RAISE EXCEPTION 'leadline: a decision names its revision' USING ERRCODE = 'P0001';
          END IF;
          IF p_type = 'withdrawn' THEN
            IF r.author_id IS DISTINCT FROM a.user_id THEN
              RAISE EXCEPTION 'leadline: only the author withdraws a revision' USING ERRCODE = 'LL403';
            END IF;
          ELSE
            IF 'admin' = ANY (a.roles) THEN
              RAISE EXCEPTION 'leadline: an admin identity does not decide' USING ERRCODE = 'LL403';
            END IF;
            IF r.author_id IS NOT NULL AND (r.author_id = a.user_id OR a.token_creator IS NOT DISTINCT FROM r.author_id) THEN
              RAISE EXCEPTION 'leadline: four-eyes rule: the author does not decide their own revision' USING ERRCODE = 'LL403';
            END IF;
          END IF;
          IF EXISTS (SELECT 1 FROM revisions n WHERE n.calculation_id = r.calculation_id AND n.revision = r.revision + 1) THEN
            RAISE EXCEPTION 'leadline: revision % is superseded', p_revision USING ERRCODE = 'LL409';
          END IF;
          IF EXISTS (SELECT 1 FROM revision_closures c WHERE c.revision_id = p_revision) THEN
            RAISE EXCEPTION 'leadline: revision % is decided already', p_revision USING ERRCODE = 'LL409';
          END IF;
          IF p_type = 'approved' THEN
            IF EXISTS (SELECT 1 FROM jsonb_array_elements(r.findings) f WHERE f->>'severity' = 'blocking') THEN
              RAISE EXCEPTION 'leadline: a revision with blocking findings is not approved' USING ERRCODE = 'LL409';
            END IF;
            SELECT f->>'ruleId' INTO v_warning FROM jsonb_array_elements(r.findings) f
             WHERE f->>'severity' = 'warning' AND NOT EXISTS (
               SELECT 1 FROM jsonb_array_elements(coalesce(p_data->'acknowledgements', '[]'::jsonb)) k
                WHERE k->>'finding' = f->>'ruleId' AND length(btrim(coalesce(k->>'comment', ''))) > 0)
             LIMIT 1;
            IF v_warning IS NOT NULL THEN
              RAISE EXCEPTION 'leadline: warning % is not acknowledged', v_warning USING ERRCODE = 'LL422';
            END IF;
          END IF;
        ELSE
          RAISE EXCEPTION 'leadline: events of type % are not appended this way', p_type USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash,
          link_version, token_id, mac)
        VALUES (p_id, p_product, p_seq, p_type, p_calculation, p_revision, a.user_id, p_actor, p_data, now(), p_hash, p_previous_hash, 3, p_token_id, p_mac);
        IF p_type IN ('approved', 'rejected', 'withdrawn') THEN
          -- the closure indexes the event (primary key: exactly one per revision, whatever the race)
          INSERT INTO revision_closures (revision_id, kind, event_id, actor_id, created_at) VALUES (p_revision, p_type, p_id, a.user_id, now());
        END IF;
        UPDATE chain_heads SET seq = p_seq, hash = p_hash WHERE product_id = p_product;
      END $$`);

    // Identities: an admin (or the service) acts; every change is audited with the acting user and token.
    await q.query(`
      CREATE FUNCTION leadline_create_user(p_credential text, p_id uuid, p_name text, p_roles text[]) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record; v_role text;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: creating a user needs an admin' USING ERRCODE = 'LL403';
        END IF;
        INSERT INTO users (id, name, roles, created_by, created_at) VALUES (p_id, p_name, p_roles, c.user_id, now());
        INSERT INTO identity_events (id, type, actor_id, actor_token_id, subject_user_id, token_id, data)
        VALUES (gen_random_uuid(), 'user-created', c.user_id, c.token_id, p_id, NULL, jsonb_build_object('name', p_name, 'roles', to_jsonb(p_roles)));
        FOREACH v_role IN ARRAY p_roles LOOP
          INSERT INTO identity_events (id, type, actor_id, actor_token_id, subject_user_id, token_id, data)
          VALUES (gen_random_uuid(), 'role-granted', c.user_id, c.token_id, p_id, NULL, jsonb_build_object('role', v_role));
        END LOOP;
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_issue_token(p_credential text, p_id uuid, p_user uuid, p_token_hash text, p_label text, p_expires_at timestamptz,
        p_default_days integer) RETURNS text
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record; v_expires text;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: issuing a token needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF p_token_hash !~ '^[0-9a-f]{64}$' THEN
          RAISE EXCEPTION 'leadline: a token is stored as its keyed hash' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO tokens (id, user_id, token_hash, label, created_by, created_at, expires_at, hash_kind)
        VALUES (p_id, p_user, p_token_hash, p_label, c.user_id, now(), coalesce(p_expires_at, now() + make_interval(days => p_default_days)), 'hmac');
        SELECT to_char(t.expires_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') INTO v_expires FROM tokens t WHERE t.id = p_id;
        INSERT INTO identity_events (id, type, actor_id, actor_token_id, subject_user_id, token_id, data)
        VALUES (gen_random_uuid(), 'token-issued', c.user_id, c.token_id, p_user, p_id,
          jsonb_build_object('label', p_label, 'expiresAt', v_expires, 'forAnotherUser', c.user_id IS NOT NULL AND c.user_id <> p_user));
        RETURN v_expires;
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_revoke_token(p_credential text, p_user uuid, p_token uuid) RETURNS boolean
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
        INSERT INTO token_revocations (token_id, revoked_by) VALUES (p_token, c.user_id) ON CONFLICT (token_id) DO NOTHING;
        IF NOT FOUND THEN RETURN false; END IF;
        INSERT INTO identity_events (id, type, actor_id, actor_token_id, subject_user_id, token_id, data)
        VALUES (gen_random_uuid(), 'token-revoked', c.user_id, c.token_id, p_user, p_token, '{}'::jsonb);
        RETURN true;
      END $$`);
    // The token behind a presented hash (keyed, or a legacy SHA-256 while accepted): the runtime role cannot read token_hash.
    await q.query(`
      CREATE FUNCTION leadline_find_token(p_hmac text, p_legacy text)
        RETURNS TABLE (user_id uuid, name text, roles text[], token_id uuid, hash_kind text, token_hash text, created_at timestamptz,
          expires_at timestamptz, revoked boolean)
      LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
        SELECT u.id, u.name, u.roles, t.id, t.hash_kind, t.token_hash, t.created_at, t.expires_at,
               EXISTS (SELECT 1 FROM token_revocations r WHERE r.token_id = t.id)
          FROM tokens t JOIN users u ON u.id = t.user_id
         WHERE (t.token_hash = p_hmac AND t.hash_kind = 'hmac') OR (p_legacy IS NOT NULL AND t.token_hash = p_legacy AND t.hash_kind = 'sha256')
      $$`);

    await q.query(`
      CREATE FUNCTION leadline_store_rule_set(p_credential text, p_version text, p_definition jsonb, p_if_absent boolean) RETURNS boolean
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: storing a rule set needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF p_definition->>'version' IS DISTINCT FROM p_version THEN
          RAISE EXCEPTION 'leadline: a rule set is stored under its own version' USING ERRCODE = 'LL422';
        END IF;
        IF p_if_absent THEN
          INSERT INTO rule_sets (version, definition) VALUES (p_version, p_definition) ON CONFLICT (version) DO NOTHING;
          RETURN FOUND;
        END IF;
        INSERT INTO rule_sets (version, definition) VALUES (p_version, p_definition);
        RETURN true;
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_adopt_rule_set(p_credential text, p_id uuid, p_version text, p_note text) RETURNS void
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
        INSERT INTO rule_set_adoptions (id, version, adopted_by, note, adopted_at) VALUES (p_id, p_version, c.user_id, p_note, clock_timestamp());
      END $$`);

    // The functions that wrote links of format 2 are replaced by the ones above; the head moves only inside them.
    await q.query(`DROP FUNCTION leadline_append_revision(uuid, uuid, uuid, uuid, text, json, json, json, json, text, text, text, text, uuid, text, uuid)`);
    await q.query(`DROP FUNCTION leadline_move_head(uuid, bigint, text)`);
    for (const fn of [
      'leadline_register_service(text, text)',
      'leadline_credential(text)',
      'leadline_acting(text, uuid, uuid, text[], boolean)',
      'leadline_next_link(uuid, bigint, text, text)',
      'leadline_register_product(text, uuid, text, text, text, uuid, jsonb, uuid, jsonb, text, text, text)',
      'leadline_append_revision(text, uuid, uuid, integer, bigint, text, json, json, json, json, text, text, text, jsonb, uuid, text, text, text, text, uuid, jsonb, text, text)',
      'leadline_append_event(text, uuid, uuid, bigint, text, uuid, uuid, jsonb, uuid, jsonb, text, text, text, text)',
      'leadline_create_user(text, uuid, text, text[])',
      'leadline_issue_token(text, uuid, uuid, text, text, timestamptz, integer)',
      'leadline_revoke_token(text, uuid, uuid)',
      'leadline_find_token(text, text)',
      'leadline_store_rule_set(text, text, jsonb, boolean)',
      'leadline_adopt_rule_set(text, uuid, text, text)',
    ]) {
      await q.query(`REVOKE ALL ON FUNCTION ${fn} FROM PUBLIC`);
    }
  }

  async down(): Promise<void> {
    throw new Error('sealed links are part of the records: this migration is not reversible');
  }
}

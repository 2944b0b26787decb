import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Accounts, sessions and signatures under the record functions (docs/reliability.md, "Threat model"): the runtime
 * role writes none of the tables of 20261205000000 directly (infra/database/migrate.ts grants INSERT on
 * idempotency_keys only, and hides sessions.secret_hash and sessions.seal_key from it as it hides tokens.token_hash).
 * - Current roles and deactivation are the newest identity events (chain order), in the functions as in the service:
 *   leadline_user_roles, leadline_user_active.
 * - leadline_credential also accepts a live page session's secret hash (not signed out, before its absolute expiry,
 *   the user active) as the credential of its user, with no token; a deactivated user's tokens stop being one.
 * - leadline_create_account (admin or service: the OpenID first sign-in), leadline_change_identity (roles granted or
 *   revoked, deactivation, reactivation; an admin never revokes their own admin role nor deactivates themselves),
 *   leadline_issue_code (activation or reset code, stored as SHA-256), all chained identity events.
 * - leadline_set_password takes the code itself (the function hashes it: a code hash read from the table does not
 *   set a password), checks it is the user's newest, unused, unexpired code of an active user, and stores the
 *   Argon2id hash the service computed (the database cannot run Argon2id); its password-set event names the user.
 * - leadline_start_session and leadline_record_reauthentication need the service credential: the password or the
 *   identity provider's answer is checked by the service, which holds the record key; leadline_end_session and
 *   leadline_use_reauthentication need the session's or token's own credential.
 * - leadline_issue_token also lets a user issue a token to themselves (the token a decision by API is signed with).
 * - A decision event (approved, rejected) must carry data.signature naming its actor as signerId, with the
 *   meaning of its type, and be made with the signer's own session or a token the signer issued themselves.
 */
export class MovedAccountWritesIntoFunctions20261205000100 implements MigrationInterface {
  name = 'MovedAccountWritesIntoFunctions20261205000100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE FUNCTION leadline_user_roles(p_user uuid) RETURNS text[]
      LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
        SELECT ARRAY(SELECT r FROM unnest(ARRAY['author', 'reviewer', 'admin']) AS r WHERE COALESCE(
          (SELECT ce.type = 'role-granted' FROM identity_events ce WHERE ce.subject_user_id = p_user AND ce.type IN ('role-granted', 'role-revoked')
              AND ce.data->>'role' = r ORDER BY ce.seq DESC NULLS LAST, ce.created_at DESC, ce.id DESC LIMIT 1),
          (SELECT r = ANY (u.roles) FROM users u WHERE u.id = p_user)))
      $$`);
    await q.query(`
      CREATE FUNCTION leadline_user_active(p_user uuid) RETURNS boolean
      LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
        SELECT NOT COALESCE((SELECT ae.type = 'user-deactivated' FROM identity_events ae
          WHERE ae.subject_user_id = p_user AND ae.type IN ('user-deactivated', 'user-reactivated') ORDER BY ae.seq DESC NULLS LAST, ae.created_at DESC, ae.id DESC LIMIT 1), false)
      $$`);

    await q.query(`
      CREATE OR REPLACE FUNCTION leadline_credential(p_credential text,
        OUT is_service boolean, OUT user_id uuid, OUT token_id uuid, OUT token_creator uuid, OUT roles text[], OUT user_name text)
      LANGUAGE plpgsql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
      BEGIN
        is_service := false;
        IF p_credential IS NULL THEN RETURN; END IF;
        IF EXISTS (SELECT 1 FROM service_keys s WHERE s.credential_digest = encode(sha256(convert_to(p_credential, 'UTF8')), 'hex')) THEN
          is_service := true;
          RETURN;
        END IF;
        SELECT t.user_id, t.id, t.created_by, u.name INTO user_id, token_id, token_creator, user_name
          FROM tokens t JOIN users u ON u.id = t.user_id
         WHERE t.token_hash = p_credential AND NOT EXISTS (SELECT 1 FROM token_revocations r WHERE r.token_id = t.id)
           AND coalesce(t.expires_at, t.created_at + interval '3650 days') > now();
        IF user_id IS NULL THEN
          -- a page session is its user's own credential (no token; the session was started by the service after sign-in)
          SELECT s.user_id, NULL::uuid, s.user_id, u.name INTO user_id, token_id, token_creator, user_name
            FROM sessions s JOIN users u ON u.id = s.user_id
           WHERE s.secret_hash = p_credential AND NOT EXISTS (SELECT 1 FROM session_ends x WHERE x.session_id = s.id) AND s.expires_at > now();
        END IF;
        IF user_id IS NULL THEN RETURN; END IF;
        IF NOT leadline_user_active(user_id) THEN
          user_id := NULL; token_id := NULL; token_creator := NULL; user_name := NULL;
          RETURN;
        END IF;
        roles := leadline_user_roles(user_id);
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_create_account(p_credential text, p_id uuid, p_name text, p_email text, p_roles text[], p_events jsonb) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: creating a user needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF jsonb_array_length(p_events) <> 1 + cardinality(p_roles) OR p_events->0->>'type' <> 'user-created'
           OR p_events->0->'data' IS DISTINCT FROM jsonb_build_object('name', p_name, 'email', p_email, 'roles', to_jsonb(p_roles))
           OR EXISTS (SELECT 1 FROM jsonb_array_elements(p_events) e WHERE (e->>'subjectUserId')::uuid IS DISTINCT FROM p_id OR e->>'tokenId' IS NOT NULL)
           OR EXISTS (SELECT 1 FROM unnest(p_roles) WITH ORDINALITY r(role, i)
                       WHERE p_events->(i::int)->>'type' IS DISTINCT FROM 'role-granted' OR p_events->(i::int)->'data' IS DISTINCT FROM jsonb_build_object('role', r.role)) THEN
          RAISE EXCEPTION 'leadline: a new user is recorded by user-created and one role-granted event per role' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO users (id, name, email, roles, created_by, created_at) VALUES (p_id, p_name, p_email, p_roles, c.user_id, now());
        PERFORM leadline_put_identity_events(c.user_id, c.token_id, p_events);
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_change_identity(p_credential text, p_user uuid, p_events jsonb) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record; e jsonb;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: changing roles or deactivating needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF NOT EXISTS (SELECT 1 FROM users u WHERE u.id = p_user) THEN
          RAISE EXCEPTION 'leadline: user % not found', p_user USING ERRCODE = 'P0002';
        END IF;
        FOR e IN SELECT x FROM jsonb_array_elements(p_events) x LOOP
          IF (e->>'subjectUserId')::uuid IS DISTINCT FROM p_user OR e->>'tokenId' IS NOT NULL
             OR NOT ((e->>'type' IN ('role-granted', 'role-revoked') AND e->'data' = jsonb_build_object('role', e->'data'->>'role')
                      AND e->'data'->>'role' IN ('author', 'reviewer', 'admin'))
                     OR (e->>'type' IN ('user-deactivated', 'user-reactivated') AND e->'data' = '{}'::jsonb)) THEN
            RAISE EXCEPTION 'leadline: an identity change is a role granted or revoked, a deactivation or a reactivation of the user named' USING ERRCODE = 'P0001';
          END IF;
          IF c.user_id = p_user AND (e->>'type' = 'user-deactivated' OR (e->>'type' = 'role-revoked' AND e->'data'->>'role' = 'admin')) THEN
            RAISE EXCEPTION 'leadline: an admin neither deactivates themselves nor revokes their own admin role' USING ERRCODE = 'LL403';
          END IF;
        END LOOP;
        PERFORM leadline_put_identity_events(c.user_id, c.token_id, p_events);
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_issue_code(p_credential text, p_id uuid, p_user uuid, p_code_hash text, p_purpose text, p_expires_at timestamptz, p_events jsonb)
        RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND 'admin' = ANY (c.roles)) THEN
          RAISE EXCEPTION 'leadline: issuing an activation or reset code needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF NOT EXISTS (SELECT 1 FROM users u WHERE u.id = p_user AND u.email IS NOT NULL) OR NOT leadline_user_active(p_user) THEN
          RAISE EXCEPTION 'leadline: codes are issued to active users with an email' USING ERRCODE = 'LL409';
        END IF;
        IF jsonb_array_length(p_events) <> 1
           OR p_events->0->>'type' IS DISTINCT FROM (CASE p_purpose WHEN 'activation' THEN 'activation-issued' ELSE 'password-reset-issued' END)
           OR (p_events->0->>'subjectUserId')::uuid IS DISTINCT FROM p_user OR p_events->0->>'tokenId' IS NOT NULL
           OR (p_events->0->'data'->>'codeId')::uuid IS DISTINCT FROM p_id OR (p_events->0->'data'->>'expiresAt')::timestamptz IS DISTINCT FROM p_expires_at THEN
          RAISE EXCEPTION 'leadline: a code is recorded by its activation-issued or password-reset-issued event' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO activation_codes (id, user_id, code_hash, purpose, expires_at, created_by, created_at)
        VALUES (p_id, p_user, p_code_hash, p_purpose, p_expires_at, c.user_id, now());
        PERFORM leadline_put_identity_events(c.user_id, c.token_id, p_events);
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_set_password(p_code text, p_password_id uuid, p_hash text, p_events jsonb) RETURNS uuid
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE k record;
      BEGIN
        SELECT a.id, a.user_id, a.purpose INTO k FROM activation_codes a
         WHERE a.code_hash = encode(sha256(convert_to(p_code, 'UTF8')), 'hex') AND a.expires_at > now()
           AND NOT EXISTS (SELECT 1 FROM password_credentials p WHERE p.activation_id = a.id)
           AND NOT EXISTS (SELECT 1 FROM activation_codes n WHERE n.user_id = a.user_id AND n.created_at > a.created_at);
        IF NOT FOUND OR NOT leadline_user_active(k.user_id) THEN
          RAISE EXCEPTION 'leadline: the activation code is unknown, used, replaced or expired' USING ERRCODE = 'LL403';
        END IF;
        IF jsonb_array_length(p_events) <> 1 OR p_events->0->>'type' <> 'password-set' OR (p_events->0->>'subjectUserId')::uuid IS DISTINCT FROM k.user_id
           OR p_events->0->'data' IS DISTINCT FROM jsonb_build_object('codeId', k.id, 'purpose', k.purpose) THEN
          RAISE EXCEPTION 'leadline: a password is recorded by its password-set event' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO password_credentials (id, user_id, hash, activation_id, created_at) VALUES (p_password_id, k.user_id, p_hash, k.id, now());
        PERFORM leadline_put_identity_events(k.user_id, NULL, p_events);
        RETURN k.user_id;
      END $$`);

    await q.query(`
      CREATE FUNCTION leadline_start_session(p_credential text, p_id uuid, p_user uuid, p_secret_hash text, p_seal_key text, p_method text,
        p_auth_time timestamptz, p_expires_at timestamptz) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service THEN
          RAISE EXCEPTION 'leadline: a session is started by the service after it checked the sign-in' USING ERRCODE = 'LL403';
        END IF;
        IF NOT leadline_user_active(p_user) THEN
          RAISE EXCEPTION 'leadline: a deactivated user gets no session' USING ERRCODE = 'LL403';
        END IF;
        INSERT INTO sessions (id, user_id, secret_hash, seal_key, method, auth_time, expires_at, created_at)
        VALUES (p_id, p_user, p_secret_hash, p_seal_key, p_method, p_auth_time, p_expires_at, now());
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_end_session(p_secret_hash text) RETURNS void
      LANGUAGE sql SECURITY DEFINER SET search_path = public, pg_temp AS $$
        INSERT INTO session_ends (session_id, reason, created_at)
        SELECT s.id, 'signed-out', now() FROM sessions s WHERE s.secret_hash = p_secret_hash
        ON CONFLICT (session_id) DO NOTHING
      $$`);
    // A session as the service resolves a cookie (the runtime role cannot read secret_hash or seal_key).
    await q.query(`
      CREATE FUNCTION leadline_find_session(p_secret_hash text)
        RETURNS TABLE (id uuid, user_id uuid, seal_key text, method text, auth_time timestamptz, expires_at timestamptz, ended boolean)
      LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
        SELECT s.id, s.user_id, s.seal_key, s.method, s.auth_time, s.expires_at, EXISTS (SELECT 1 FROM session_ends x WHERE x.session_id = s.id)
          FROM sessions s WHERE s.secret_hash = p_secret_hash
      $$`);

    await q.query(`
      CREATE FUNCTION leadline_record_reauthentication(p_credential text, p_id uuid, p_user uuid, p_revision uuid, p_started_at timestamptz, p_auth_time timestamptz)
        RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service THEN
          RAISE EXCEPTION 'leadline: a fresh login is recorded by the service after it checked the identity provider''s answer' USING ERRCODE = 'LL403';
        END IF;
        INSERT INTO reauthentications (id, user_id, revision_id, method, started_at, auth_time, created_at)
        VALUES (p_id, p_user, p_revision, 'oidc', p_started_at, p_auth_time, now());
      END $$`);
    await q.query(`
      CREATE FUNCTION leadline_use_reauthentication(p_credential text, p_id uuid) RETURNS boolean
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF c.user_id IS NULL OR NOT EXISTS (SELECT 1 FROM reauthentications r WHERE r.id = p_id AND r.user_id = c.user_id) THEN
          RAISE EXCEPTION 'leadline: a fresh login is used by its own user' USING ERRCODE = 'LL403';
        END IF;
        INSERT INTO reauthentication_uses (reauthentication_id, created_at) VALUES (p_id, now()) ON CONFLICT (reauthentication_id) DO NOTHING;
        RETURN FOUND;
      END $$`);

    // leadline_issue_token of 20261204230200, and a user's token for themselves
    await q.query(`
      CREATE OR REPLACE FUNCTION leadline_issue_token(p_credential text, p_id uuid, p_user uuid, p_token_hash text, p_label text, p_expires_at timestamptz, p_events jsonb)
        RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service AND NOT (c.user_id IS NOT NULL AND ('admin' = ANY (c.roles) OR c.user_id = p_user)) THEN
          RAISE EXCEPTION 'leadline: issuing a token for another user needs an admin' USING ERRCODE = 'LL403';
        END IF;
        IF NOT leadline_user_active(p_user) THEN
          RAISE EXCEPTION 'leadline: a deactivated user gets no token' USING ERRCODE = 'LL409';
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

    // A decision is the signature of its actor, made with the actor's own session or self-issued token.
    await q.query(`
      CREATE FUNCTION leadline_decision_is_signed() RETURNS trigger
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      BEGIN
        IF NEW.type IN ('approved', 'rejected') THEN
          IF NEW.data->'signature'->>'signerId' IS DISTINCT FROM NEW.actor->>'id'
             OR NEW.data->'signature'->>'meaning' IS DISTINCT FROM (CASE NEW.type WHEN 'approved' THEN 'approved as checking engineer' ELSE 'rejected as checking engineer' END) THEN
            RAISE EXCEPTION 'leadline: a decision carries the signature of the person deciding' USING ERRCODE = 'LL403';
          END IF;
          IF NEW.token_id IS NOT NULL AND NOT EXISTS (SELECT 1 FROM tokens t WHERE t.id = NEW.token_id AND t.created_by = (NEW.actor->>'id')::uuid) THEN
            RAISE EXCEPTION 'leadline: a decision is signed with the signer''s own session or a token they issued themselves' USING ERRCODE = 'LL403';
          END IF;
        END IF;
        RETURN NEW;
      END $$`);
    await q.query(`CREATE TRIGGER events_decision_signed BEFORE INSERT ON events FOR EACH ROW EXECUTE FUNCTION leadline_decision_is_signed()`);

    for (const fn of [
      'leadline_user_roles(uuid)',
      'leadline_user_active(uuid)',
      'leadline_create_account(text, uuid, text, text, text[], jsonb)',
      'leadline_change_identity(text, uuid, jsonb)',
      'leadline_issue_code(text, uuid, uuid, text, text, timestamptz, jsonb)',
      'leadline_set_password(text, uuid, text, jsonb)',
      'leadline_start_session(text, uuid, uuid, text, text, text, timestamptz, timestamptz)',
      'leadline_end_session(text)',
      'leadline_find_session(text)',
      'leadline_record_reauthentication(text, uuid, uuid, uuid, timestamptz, timestamptz)',
      'leadline_use_reauthentication(text, uuid)',
      'leadline_decision_is_signed()',
    ]) {
      await q.query(`REVOKE ALL ON FUNCTION ${fn} FROM PUBLIC`);
    }
  }

  async down(): Promise<void> {
    throw new Error('accounts and sessions are part of the identity record: this migration is not reversible');
  }
}

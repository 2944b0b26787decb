import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Passkeys (WebAuthn Level 2, W3C Recommendation 2021), insert-only like every identity table, written only by the
 * record functions below (the runtime role holds SELECT on them; infra/database/migrate.ts grants no INSERT):
 * - passkey_credentials: a user's registered public key (the COSE key as the authenticator gave it, base64url), its
 *   credential id, the relying-party id it was made for, and the signature counter at registration; registration is
 *   a chained identity event (passkey-registered) and needs the user's own page session: nobody registers a passkey
 *   for someone else, and a token cannot;
 * - passkey_challenges: one row per challenge the service hands out (registration, sign-in, or signing a revision:
 *   then challenge = SHA-256(revision hash || nonce) and the nonce is kept), with its expiry;
 * - passkey_challenge_uses: a challenge is used at most once (primary key), with the credential and the counter the
 *   assertion carried; the credential's current counter is the highest one used.
 * A page session may now be started by a passkey (sessions.method already admits 'passkey').
 */
export class CreatedPasskeys20261206030000 implements MigrationInterface {
  name = 'CreatedPasskeys20261206030000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE passkey_credentials (
        id uuid PRIMARY KEY,
        user_id uuid NOT NULL REFERENCES users(id),
        credential_id text NOT NULL UNIQUE CHECK (credential_id ~ '^[A-Za-z0-9_-]+$' AND length(credential_id) <= 1400),
        public_key text NOT NULL CHECK (public_key ~ '^[A-Za-z0-9_-]+$'),
        rp_id text NOT NULL CHECK (length(rp_id) BETWEEN 1 AND 253),
        counter bigint NOT NULL CHECK (counter >= 0),
        label text NOT NULL CHECK (length(label) BETWEEN 1 AND 100),
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX passkey_credentials_user_idx ON passkey_credentials (user_id, created_at)`);
    await q.query(`
      CREATE TABLE passkey_challenges (
        id uuid PRIMARY KEY,
        user_id uuid REFERENCES users(id),
        purpose text NOT NULL CHECK (purpose IN ('register', 'sign-in', 'sign')),
        challenge text NOT NULL UNIQUE CHECK (challenge ~ '^[A-Za-z0-9_-]{43}$'),
        revision_id uuid REFERENCES revisions(id),
        nonce text CHECK (nonce IS NULL OR nonce ~ '^[A-Za-z0-9_-]{43}$'),
        rp_id text NOT NULL,
        expires_at timestamptz NOT NULL,
        created_at timestamptz NOT NULL DEFAULT clock_timestamp(),
        CHECK ((purpose = 'sign') = (revision_id IS NOT NULL AND nonce IS NOT NULL)),
        CHECK ((purpose = 'sign-in') = (user_id IS NULL))
      )`);
    await q.query(`
      CREATE TABLE passkey_challenge_uses (
        challenge_id uuid PRIMARY KEY REFERENCES passkey_challenges(id),
        credential_id text REFERENCES passkey_credentials(credential_id),
        counter bigint CHECK (counter >= 0),
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX passkey_challenge_uses_credential_idx ON passkey_challenge_uses (credential_id, counter)`);
    for (const table of ['passkey_credentials', 'passkey_challenges', 'passkey_challenge_uses']) {
      await q.query(`CREATE TRIGGER ${table}_immutable BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
      await q.query(`CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
    }
    await q.query(`ALTER TABLE identity_events DROP CONSTRAINT identity_events_type_check`);
    await q.query(`ALTER TABLE identity_events ADD CONSTRAINT identity_events_type_check CHECK (type IN (
      'user-created', 'role-granted', 'role-revoked', 'token-issued', 'token-revoked', 'user-deactivated', 'user-reactivated',
      'activation-issued', 'password-reset-issued', 'password-set', 'passkey-registered'))`);

    // A challenge: for registration and signing, issued to the user acting with their own credential; for sign-in
    // (nobody is signed in yet) by the service.
    await q.query(`
      CREATE FUNCTION leadline_issue_passkey_challenge(p_credential text, p_id uuid, p_purpose text, p_challenge text, p_revision uuid, p_nonce text,
        p_rp_id text, p_expires_at timestamptz) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF p_purpose = 'sign-in' AND NOT c.is_service THEN
          RAISE EXCEPTION 'leadline: a sign-in challenge is issued by the service' USING ERRCODE = 'LL403';
        END IF;
        IF p_purpose <> 'sign-in' AND c.user_id IS NULL THEN
          RAISE EXCEPTION 'leadline: a passkey challenge is issued to the user acting' USING ERRCODE = 'LL403';
        END IF;
        IF p_purpose = 'register' AND c.token_id IS NOT NULL THEN
          RAISE EXCEPTION 'leadline: a passkey is registered from the user''s own page session' USING ERRCODE = 'LL403';
        END IF;
        INSERT INTO passkey_challenges (id, user_id, purpose, challenge, revision_id, nonce, rp_id, expires_at, created_at)
        VALUES (p_id, c.user_id, p_purpose, p_challenge, p_revision, p_nonce, p_rp_id, p_expires_at, now());
      END $$`);

    // Registration: the user's own session, their own unused, unexpired registration challenge; a chained event.
    await q.query(`
      CREATE FUNCTION leadline_register_passkey(p_credential text, p_challenge uuid, p_id uuid, p_credential_id text, p_public_key text, p_counter bigint,
        p_label text, p_events jsonb) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record; k record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF c.user_id IS NULL OR c.token_id IS NOT NULL THEN
          RAISE EXCEPTION 'leadline: a passkey is registered from the user''s own page session' USING ERRCODE = 'LL403';
        END IF;
        SELECT * INTO k FROM passkey_challenges ch WHERE ch.id = p_challenge AND ch.purpose = 'register' AND ch.user_id = c.user_id AND ch.expires_at > now();
        IF NOT FOUND THEN
          RAISE EXCEPTION 'leadline: not your registration challenge, or it has expired' USING ERRCODE = 'LL403';
        END IF;
        IF jsonb_array_length(p_events) <> 1 OR p_events->0->>'type' <> 'passkey-registered' OR (p_events->0->>'subjectUserId')::uuid IS DISTINCT FROM c.user_id
           OR p_events->0->>'tokenId' IS NOT NULL
           OR p_events->0->'data' IS DISTINCT FROM jsonb_build_object('passkeyId', p_id, 'credentialId', p_credential_id, 'publicKey', p_public_key, 'rpId', k.rp_id, 'label', p_label) THEN
          RAISE EXCEPTION 'leadline: a passkey is recorded by its passkey-registered event' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO passkey_challenge_uses (challenge_id, credential_id, counter, created_at) VALUES (p_challenge, NULL, NULL, now());
        INSERT INTO passkey_credentials (id, user_id, credential_id, public_key, rp_id, counter, label, created_at)
        VALUES (p_id, c.user_id, p_credential_id, p_public_key, k.rp_id, p_counter, p_label, now());
        PERFORM leadline_put_identity_events(c.user_id, NULL, p_events);
      END $$`);

    // An assertion's use of its challenge: once, by the passkey's own user (sign-in: the service, which verified
    // the assertion), with a counter above the highest seen unless the authenticator keeps none (0).
    await q.query(`
      CREATE FUNCTION leadline_use_passkey_challenge(p_credential text, p_challenge uuid, p_credential_id text, p_counter bigint) RETURNS boolean
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record; k record; key record; seen bigint;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        SELECT * INTO k FROM passkey_challenges ch WHERE ch.id = p_challenge AND ch.purpose IN ('sign-in', 'sign');
        SELECT * INTO key FROM passkey_credentials pk WHERE pk.credential_id = p_credential_id;
        IF k.id IS NULL OR key.id IS NULL OR NOT leadline_user_active(key.user_id)
           OR (k.purpose = 'sign-in' AND NOT c.is_service)
           OR (k.purpose = 'sign' AND (c.user_id IS DISTINCT FROM k.user_id OR key.user_id <> k.user_id)) THEN
          RAISE EXCEPTION 'leadline: a passkey challenge is used by the passkey''s own user' USING ERRCODE = 'LL403';
        END IF;
        IF k.expires_at <= now() THEN
          RAISE EXCEPTION 'leadline: the passkey challenge has expired' USING ERRCODE = 'LL403';
        END IF;
        SELECT greatest(key.counter, coalesce(max(u.counter), 0)) INTO seen FROM passkey_challenge_uses u WHERE u.credential_id = p_credential_id;
        IF (p_counter > 0 OR seen > 0) AND p_counter <= seen THEN
          RAISE EXCEPTION 'leadline: the passkey''s signature counter did not advance (a cloned authenticator?)' USING ERRCODE = 'LL403';
        END IF;
        INSERT INTO passkey_challenge_uses (challenge_id, credential_id, counter, created_at) VALUES (p_challenge, p_credential_id, p_counter, now())
          ON CONFLICT (challenge_id) DO NOTHING;
        RETURN FOUND;
      END $$`);

    for (const fn of [
      'leadline_issue_passkey_challenge(text, uuid, text, text, uuid, text, text, timestamptz)',
      'leadline_register_passkey(text, uuid, uuid, text, text, bigint, text, jsonb)',
      'leadline_use_passkey_challenge(text, uuid, text, bigint)',
    ]) {
      await q.query(`REVOKE ALL ON FUNCTION ${fn} FROM PUBLIC`);
    }
  }

  async down(): Promise<void> {
    throw new Error('passkeys are part of the identity record: this migration is not reversible');
  }
}

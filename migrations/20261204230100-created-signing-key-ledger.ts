import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The history of the checkpoint signing keys: each public key with the time from which it signs (it signs until the
 * next row's time), chained by a SHA-256 over the previous row's hash and this row's fields, so an old key cannot be
 * dropped or its validity moved without breaking every later row. Written only by leadline_register_signing_key with
 * the service credential (migrations/20261204230000): the first start registers its key; a start with another key is
 * refused by the service unless LEADLINE_SIGNING_KEY_ROTATE is set, and then the new key is appended. Checkpoints
 * signed by an earlier key keep verifying against its public key here.
 */
export class CreatedSigningKeyLedger20261204230100 implements MigrationInterface {
  name = 'CreatedSigningKeyLedger20261204230100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE signing_keys (
        seq integer PRIMARY KEY CHECK (seq >= 1),
        key_id text NOT NULL,
        algorithm text NOT NULL,
        public_key text NOT NULL,
        valid_from timestamptz NOT NULL,
        previous_hash text,
        hash text NOT NULL
      )`);
    await q.query(`CREATE TRIGGER signing_keys_immutable BEFORE UPDATE OR DELETE ON signing_keys FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
    await q.query(`CREATE TRIGGER signing_keys_no_truncate BEFORE TRUNCATE ON signing_keys FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
    await q.query(`
      CREATE FUNCTION leadline_register_signing_key(p_credential text, p_key_id text, p_algorithm text, p_public_key text, p_rotate boolean)
        RETURNS TABLE (outcome text, current_key_id text)
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE
        c record;
        v_last record;
        v_from timestamptz := clock_timestamp();
        v_from_text text;
        v_seq integer;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service THEN
          RAISE EXCEPTION 'leadline: only the service registers its signing key' USING ERRCODE = 'LL403';
        END IF;
        LOCK TABLE signing_keys IN EXCLUSIVE MODE;
        SELECT * INTO v_last FROM signing_keys ORDER BY seq DESC LIMIT 1;
        IF FOUND AND v_last.key_id = p_key_id THEN
          RETURN QUERY SELECT 'current'::text, v_last.key_id;
          RETURN;
        END IF;
        IF FOUND AND NOT p_rotate THEN
          RETURN QUERY SELECT 'mismatch'::text, v_last.key_id;
          RETURN;
        END IF;
        v_seq := coalesce(v_last.seq, 0) + 1;
        v_from_text := to_char(v_from AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"');
        INSERT INTO signing_keys (seq, key_id, algorithm, public_key, valid_from, previous_hash, hash)
        VALUES (v_seq, p_key_id, p_algorithm, p_public_key, v_from_text::timestamptz, v_last.hash,
          encode(sha256(convert_to(coalesce(v_last.hash, '') || '|' || v_seq || '|' || p_key_id || '|' || p_algorithm || '|' || p_public_key || '|' || v_from_text, 'UTF8')), 'hex'));
        RETURN QUERY SELECT CASE WHEN v_seq = 1 THEN 'registered' ELSE 'rotated' END, p_key_id;
      END $$`);
    await q.query(`REVOKE ALL ON FUNCTION leadline_register_signing_key(text, text, text, text, boolean) FROM PUBLIC`);
  }

  async down(): Promise<void> {
    throw new Error('the signing-key history is permanent: this migration is not reversible');
  }
}

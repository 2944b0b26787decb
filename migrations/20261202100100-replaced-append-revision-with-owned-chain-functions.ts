import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The chain head moves only through functions owned by the migration role (SECURITY DEFINER), so the service's
 * runtime role needs no UPDATE privilege at all (it holds SELECT and INSERT on the record tables):
 * - leadline_lock_head(product): locks the head for the caller's transaction and returns seq, hash and the
 *   transaction time as exact text;
 * - leadline_move_head(product, seq, hash): moves the head to a link that exists with exactly that seq and hash
 *   (the forward-only trigger still applies);
 * - leadline_append_revision(...): as in 20261201220600, now writing link format 2 (the link version and the
 *   token id are hashed) and refusing (SQLSTATE LL403) a revision by anyone but the calculation's owner: its
 *   opener, or the user named by its latest calculation-reassigned event.
 *
 * The link hashes are computed exactly as apps/api/src/records/chain.ts computes them: SHA-256 over the RFC 8785
 * canonical JSON of { previousHash, record } (keys in code-unit order; strings escaped by to_json(text), which
 * matches JSON.stringify). The chain tests with awkward note text prove that the two agree.
 */
export class ReplacedAppendRevisionWithOwnedChainFunctions20261202100100 implements MigrationInterface {
  name = 'ReplacedAppendRevisionWithOwnedChainFunctions20261202100100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE FUNCTION leadline_lock_head(p_product uuid) RETURNS TABLE (seq bigint, hash text, now text)
      LANGUAGE sql SECURITY DEFINER SET search_path = public, pg_temp AS $$
        SELECT h.seq, h.hash, to_char(now() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')
          FROM chain_heads h WHERE h.product_id = p_product FOR UPDATE
      $$`);
    await q.query(`
      CREATE FUNCTION leadline_move_head(p_product uuid, p_seq bigint, p_hash text) RETURNS void
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      BEGIN
        IF NOT EXISTS (SELECT 1 FROM events e WHERE e.product_id = p_product AND e.seq = p_seq AND e.hash = p_hash)
           AND NOT EXISTS (SELECT 1 FROM revisions r WHERE r.product_id = p_product AND r.seq = p_seq AND r.hash = p_hash) THEN
          RAISE EXCEPTION 'leadline: no link % with that hash in the chain of product %', p_seq, p_product USING ERRCODE = 'P0001';
        END IF;
        UPDATE chain_heads SET seq = p_seq, hash = p_hash WHERE product_id = p_product;
      END $$`);
    await q.query(`DROP FUNCTION leadline_append_revision(uuid, uuid, uuid, uuid, text, json, json, json, json, text, text, text, text, uuid, text)`);
    await q.query(`
      CREATE FUNCTION leadline_append_revision(
        p_product uuid, p_calculation uuid, p_revision_id uuid, p_event_id uuid, p_note text,
        p_input json, p_normalized json, p_evaluation json, p_findings json, p_content text,
        p_verdict text, p_engine text, p_rule_set text, p_author_id uuid, p_author_name text, p_token_id uuid
      ) RETURNS TABLE (revision integer, seq bigint, hash text, previous_hash text, created_at text, event_hash text)
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE
        v_seq bigint;
        v_prev text;
        v_rev integer;
        v_owner uuid;
        v_now text := to_char(now() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"');
        v_author text := CASE WHEN p_author_id IS NULL THEN 'null'
          ELSE '{"id":' || leadline_json(p_author_id::text) || ',"name":' || leadline_json(p_author_name) || '}' END;
        v_hash text;
        v_data text;
        v_event_hash text;
      BEGIN
        SELECT h.seq, nullif(h.hash, '') INTO v_seq, v_prev FROM chain_heads h WHERE h.product_id = p_product FOR UPDATE;
        IF NOT FOUND THEN
          RAISE EXCEPTION 'leadline: product % not found', p_product USING ERRCODE = 'P0002';
        END IF;
        -- who owns the calculation, read under the head lock (reassignments take the same lock)
        SELECT coalesce(
          (SELECT (e.data->'to'->>'id')::uuid FROM events e
            WHERE e.calculation_id = p_calculation AND e.type = 'calculation-reassigned' ORDER BY e.seq DESC LIMIT 1),
          (SELECT c.created_by FROM calculations c WHERE c.id = p_calculation)) INTO v_owner;
        IF v_owner IS NOT NULL AND v_owner IS DISTINCT FROM p_author_id THEN
          RAISE EXCEPTION 'leadline: only the owner of calculation % may add revisions', p_calculation USING ERRCODE = 'LL403';
        END IF;
        -- a new statement, so a fresh snapshot: it sees the revision committed by whoever held the lock before us
        SELECT coalesce(max(r.revision), 0) + 1 INTO v_rev FROM revisions r WHERE r.calculation_id = p_calculation;

        v_hash := encode(sha256(convert_to(
          '{"previousHash":' || leadline_json(v_prev) || ',"record":{' ||
            '"author":' || v_author ||
            ',"calculationId":' || leadline_json(p_calculation::text) ||
            ',"content":' || leadline_json(p_content) ||
            ',"createdAt":' || leadline_json(v_now) ||
            ',"engineVersion":' || leadline_json(p_engine) ||
            ',"id":' || leadline_json(p_revision_id::text) ||
            ',"kind":"revision"' ||
            ',"linkVersion":2' ||
            ',"note":' || leadline_json(p_note) ||
            ',"productId":' || leadline_json(p_product::text) ||
            ',"revision":' || v_rev ||
            ',"ruleSetVersion":' || leadline_json(p_rule_set) ||
            ',"seq":' || (v_seq + 1) ||
            ',"tokenId":' || leadline_json(p_token_id::text) ||
            ',"verdict":' || leadline_json(p_verdict) ||
          '}}', 'UTF8')), 'hex');

        v_data := '{"note":' || leadline_json(p_note) || ',"revision":' || v_rev ||
          ',"revisionHash":' || leadline_json(v_hash) || ',"verdict":' || leadline_json(p_verdict) || '}';
        v_event_hash := encode(sha256(convert_to(
          '{"previousHash":' || leadline_json(v_hash) || ',"record":{' ||
            '"actor":' || v_author ||
            ',"calculationId":' || leadline_json(p_calculation::text) ||
            ',"createdAt":' || leadline_json(v_now) ||
            ',"data":' || v_data ||
            ',"id":' || leadline_json(p_event_id::text) ||
            ',"kind":"event"' ||
            ',"linkVersion":2' ||
            ',"productId":' || leadline_json(p_product::text) ||
            ',"revisionId":' || leadline_json(p_revision_id::text) ||
            ',"seq":' || (v_seq + 2) ||
            ',"tokenId":' || leadline_json(p_token_id::text) ||
            ',"type":"revision-submitted"' ||
          '}}', 'UTF8')), 'hex');

        INSERT INTO revisions (id, calculation_id, product_id, revision, seq, note, input, normalized, evaluation, findings, verdict,
          engine_version, rule_set_version, author_id, author, created_at, hash, previous_hash, link_version, token_id)
        VALUES (p_revision_id, p_calculation, p_product, v_rev, v_seq + 1, p_note, p_input, p_normalized, p_evaluation, p_findings,
          p_verdict, p_engine, p_rule_set, p_author_id, v_author::jsonb, v_now::timestamptz, v_hash, v_prev, 2, p_token_id);
        INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash,
          link_version, token_id)
        VALUES (p_event_id, p_product, v_seq + 2, 'revision-submitted', p_calculation, p_revision_id, p_author_id, v_author::jsonb,
          v_data::jsonb, v_now::timestamptz, v_event_hash, v_hash, 2, p_token_id);
        UPDATE chain_heads SET seq = v_seq + 2, hash = v_event_hash WHERE product_id = p_product;

        RETURN QUERY SELECT v_rev, v_seq + 2, v_hash, v_prev, v_now, v_event_hash;
      END $$`);
    // Only the roles the migrator grants (the owner and the configured runtime role) may call them.
    for (const fn of [
      'leadline_lock_head(uuid)',
      'leadline_move_head(uuid, bigint, text)',
      'leadline_append_revision(uuid, uuid, uuid, uuid, text, json, json, json, json, text, text, text, text, uuid, text, uuid)',
    ]) {
      await q.query(`REVOKE ALL ON FUNCTION ${fn} FROM PUBLIC`);
    }
  }

  async down(): Promise<void> {
    throw new Error('the link format 2 append function is what new records were written with: not reversible');
  }
}

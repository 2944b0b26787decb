import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * One database call appends a revision: lock the product's chain head, take the next revision number, link the
 * revision and its submission event into the chain, insert both and move the head. As a single statement it is
 * atomic on its own, so a submission costs one round trip instead of five.
 *
 * The link hashes are computed here exactly as apps/api/src/records/chain.ts computes them: SHA-256 over the
 * RFC 8785 canonical JSON of { previousHash, record } (keys in code-unit order, strings escaped as JSON.stringify
 * does, which to_json(text) matches). Verification recomputes them in TypeScript, so any drift between the two
 * is caught by the chain check and its tests.
 */
export class CreatedAppendRevisionFunction20261201220600 implements MigrationInterface {
  name = 'CreatedAppendRevisionFunction20261201220600';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE FUNCTION leadline_json(v text) RETURNS text LANGUAGE sql IMMUTABLE AS $$
        SELECT coalesce(to_json(v)::text, 'null')
      $$`);
    await q.query(`
      CREATE FUNCTION leadline_append_revision(
        p_product uuid, p_calculation uuid, p_revision_id uuid, p_event_id uuid, p_note text,
        p_input json, p_normalized json, p_evaluation json, p_findings json, p_content text,
        p_verdict text, p_engine text, p_rule_set text, p_author_id uuid, p_author_name text
      ) RETURNS TABLE (revision integer, seq bigint, hash text, previous_hash text, created_at text, event_hash text)
      LANGUAGE plpgsql AS $$
      DECLARE
        v_seq bigint;
        v_prev text;
        v_rev integer;
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
            ',"note":' || leadline_json(p_note) ||
            ',"productId":' || leadline_json(p_product::text) ||
            ',"revision":' || v_rev ||
            ',"ruleSetVersion":' || leadline_json(p_rule_set) ||
            ',"seq":' || (v_seq + 1) ||
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
            ',"productId":' || leadline_json(p_product::text) ||
            ',"revisionId":' || leadline_json(p_revision_id::text) ||
            ',"seq":' || (v_seq + 2) ||
            ',"type":"revision-submitted"' ||
          '}}', 'UTF8')), 'hex');

        INSERT INTO revisions (id, calculation_id, product_id, revision, seq, note, input, normalized, evaluation, findings, verdict,
          engine_version, rule_set_version, author_id, author, created_at, hash, previous_hash)
        VALUES (p_revision_id, p_calculation, p_product, v_rev, v_seq + 1, p_note, p_input, p_normalized, p_evaluation, p_findings,
          p_verdict, p_engine, p_rule_set, p_author_id, v_author::jsonb, v_now::timestamptz, v_hash, v_prev);
        INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash)
        VALUES (p_event_id, p_product, v_seq + 2, 'revision-submitted', p_calculation, p_revision_id, p_author_id, v_author::jsonb,
          v_data::jsonb, v_now::timestamptz, v_event_hash, v_hash);
        UPDATE chain_heads SET seq = v_seq + 2, hash = v_event_hash WHERE product_id = p_product;

        RETURN QUERY SELECT v_rev, v_seq + 2, v_hash, v_prev, v_now, v_event_hash;
      END $$`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP FUNCTION leadline_append_revision(uuid, uuid, uuid, uuid, text, json, json, json, json, text, text, text, text, uuid, text)`);
    await q.query(`DROP FUNCTION leadline_json(text)`);
  }
}

import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Design drafts: the author's unsubmitted design input of a calculation (PUT and GET /api/v1/calculations/:id/draft).
 *
 * A draft is not a record of the product's chain (it is never reviewed, hashed or reported), but it is kept the way
 * records are: insert-only. Saving appends a row; the newest row of a calculation and author is the draft (the
 * latest wins, ordered by `seq`, an identity column); the trigger leadline_refuse_change rejects UPDATE, DELETE and
 * TRUNCATE whoever sends them. The runtime role only reads the table (infra/database/migrate.ts grants SELECT on every
 * table and INSERT on none of these); it writes through leadline_save_draft, which checks, like
 * leadline_append_revision, that the credential is a live token or session of a user holding the author role who
 * may add revisions to the calculation (its owner: the latest calculation-reassigned event, else its creator).
 * The service validates the design input first (422 naming the field, nothing stored) and stores it verbatim with
 * its normalized (SI) form.
 */
export class CreatedDesignDrafts20261206010000 implements MigrationInterface {
  name = 'CreatedDesignDrafts20261206010000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE drafts (
        id uuid PRIMARY KEY,
        seq bigint GENERATED ALWAYS AS IDENTITY UNIQUE,
        calculation_id uuid NOT NULL REFERENCES calculations (id),
        author_id uuid NOT NULL REFERENCES users (id),
        author jsonb NOT NULL,
        token_id uuid,
        note text,
        input json NOT NULL,
        normalized json NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX drafts_latest_idx ON drafts (calculation_id, author_id, seq DESC)`);
    await q.query(`CREATE TRIGGER drafts_immutable BEFORE UPDATE OR DELETE ON drafts FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
    await q.query(`CREATE TRIGGER drafts_no_truncate BEFORE TRUNCATE ON drafts FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);

    await q.query(`
      CREATE FUNCTION leadline_save_draft(p_credential text, p_id uuid, p_calculation uuid, p_author jsonb, p_token_id uuid,
        p_note text, p_input json, p_normalized json) RETURNS text
      LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE
        a record;
        v_creator uuid;
        v_owner uuid;
        v_at timestamptz;
      BEGIN
        SELECT * INTO a FROM leadline_acting(p_credential, (p_author->>'id')::uuid, p_token_id, ARRAY['author'], false);
        SELECT c.created_by INTO v_creator FROM calculations c WHERE c.id = p_calculation;
        IF NOT FOUND THEN
          RAISE EXCEPTION 'leadline: calculation % not found', p_calculation USING ERRCODE = 'P0002';
        END IF;
        SELECT coalesce(
          (SELECT (e.data->'to'->>'id')::uuid FROM events e
            WHERE e.calculation_id = p_calculation AND e.type = 'calculation-reassigned' ORDER BY e.seq DESC LIMIT 1),
          v_creator) INTO v_owner;
        IF v_owner IS DISTINCT FROM a.user_id THEN
          RAISE EXCEPTION 'leadline: only the owner of calculation % keeps a draft of it', p_calculation USING ERRCODE = 'LL403';
        END IF;
        IF p_author IS DISTINCT FROM jsonb_build_object('id', a.user_id::text, 'name', p_author->>'name') THEN
          RAISE EXCEPTION 'leadline: a draft names its author as {id, name}' USING ERRCODE = 'P0001';
        END IF;
        INSERT INTO drafts (id, calculation_id, author_id, author, token_id, note, input, normalized, created_at)
        VALUES (p_id, p_calculation, a.user_id, p_author, p_token_id, p_note, p_input, p_normalized, now())
        RETURNING created_at INTO v_at;
        RETURN to_char(v_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"');
      END $$`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP FUNCTION leadline_save_draft(text, uuid, uuid, jsonb, uuid, text, json, json)`);
    await q.query(`DROP TABLE drafts`);
  }
}

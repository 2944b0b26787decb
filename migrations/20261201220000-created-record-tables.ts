import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Products, calculations, revisions and the per-product event log, all insert-only.
 * The chain head per product is the one mutable row: it is locked to serialize appends and found by primary key.
 */
export class CreatedRecordTables20261201220000 implements MigrationInterface {
  name = 'CreatedRecordTables20261201220000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE products (
        id uuid PRIMARY KEY,
        code text NOT NULL UNIQUE,
        name text NOT NULL,
        description text,
        created_by uuid,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`
      CREATE TABLE chain_heads (
        product_id uuid PRIMARY KEY REFERENCES products(id),
        seq bigint NOT NULL,
        hash text NOT NULL
      )`);
    await q.query(`
      CREATE TABLE calculations (
        id uuid PRIMARY KEY,
        product_id uuid NOT NULL REFERENCES products(id),
        title text NOT NULL,
        created_by uuid,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX calculations_product_idx ON calculations (product_id, created_at)`);
    await q.query(`
      CREATE TABLE revisions (
        id uuid PRIMARY KEY,
        calculation_id uuid NOT NULL REFERENCES calculations(id),
        product_id uuid NOT NULL REFERENCES products(id),
        revision integer NOT NULL CHECK (revision >= 1),
        seq bigint NOT NULL,
        note text,
        input json NOT NULL,
        normalized jsonb NOT NULL,
        evaluation jsonb NOT NULL,
        findings jsonb NOT NULL,
        verdict text NOT NULL CHECK (verdict IN ('blocked', 'needs-acknowledgement', 'clear')),
        engine_version text NOT NULL,
        rule_set_version text NOT NULL,
        author_id uuid,
        author jsonb,
        created_at timestamptz NOT NULL,
        hash text NOT NULL,
        previous_hash text,
        CONSTRAINT revisions_number_unique UNIQUE (calculation_id, revision),
        CONSTRAINT revisions_seq_unique UNIQUE (product_id, seq)
      )`);
    await q.query(`
      CREATE TABLE events (
        id uuid PRIMARY KEY,
        product_id uuid NOT NULL REFERENCES products(id),
        seq bigint NOT NULL,
        type text NOT NULL,
        calculation_id uuid REFERENCES calculations(id),
        revision_id uuid REFERENCES revisions(id),
        actor_id uuid,
        actor jsonb,
        data jsonb NOT NULL,
        created_at timestamptz NOT NULL,
        hash text NOT NULL,
        previous_hash text,
        CONSTRAINT events_seq_unique UNIQUE (product_id, seq)
      )`);
    await q.query(`CREATE INDEX events_revision_idx ON events (revision_id, seq)`);
    await q.query(`CREATE INDEX events_calculation_idx ON events (calculation_id, seq)`);

    // History cannot be rewritten: the database refuses UPDATE, DELETE and TRUNCATE on record tables.
    await q.query(`
      CREATE FUNCTION leadline_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'leadline: % on % is not allowed: records are immutable', TG_OP, TG_TABLE_NAME
          USING ERRCODE = 'P0001';
      END $$`);
    for (const table of ['products', 'calculations', 'revisions', 'events']) {
      await q.query(`CREATE TRIGGER ${table}_immutable BEFORE UPDATE OR DELETE ON ${table}
        FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
      await q.query(`CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table}
        FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
    }

    // Revision numbers are contiguous per calculation: the next one is exactly one above the highest.
    // Together with the unique constraint this holds under concurrent submissions.
    await q.query(`
      CREATE FUNCTION leadline_revision_contiguous() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE highest integer;
      BEGIN
        SELECT max(revision) INTO highest FROM revisions WHERE calculation_id = NEW.calculation_id;
        IF NEW.revision <> coalesce(highest, 0) + 1 THEN
          RAISE EXCEPTION 'leadline: revision % of calculation % is not contiguous (highest is %)',
            NEW.revision, NEW.calculation_id, coalesce(highest, 0) USING ERRCODE = 'P0001';
        END IF;
        RETURN NEW;
      END $$`);
    await q.query(`CREATE TRIGGER revisions_contiguous BEFORE INSERT ON revisions
      FOR EACH ROW EXECUTE FUNCTION leadline_revision_contiguous()`);
  }

  async down(): Promise<void> {
    throw new Error('records are permanent: this migration is not reversible');
  }
}

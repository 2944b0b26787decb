import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Users with roles, bearer tokens (stored only as SHA-256 hashes), token revocations, and review closures.
 * All insert-only: revoking a token appends a revocation; a decision or withdrawal appends a closure, and the
 * primary key on revision_id makes it exactly one per revision, whatever the race.
 */
export class CreatedIdentitiesAndReviewClosures20261201220200 implements MigrationInterface {
  name = 'CreatedIdentitiesAndReviewClosures20261201220200';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE users (
        id uuid PRIMARY KEY,
        name text NOT NULL,
        roles text[] NOT NULL CHECK (roles <@ ARRAY['author', 'reviewer', 'admin']::text[] AND cardinality(roles) > 0),
        created_by uuid,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`
      CREATE TABLE tokens (
        id uuid PRIMARY KEY,
        user_id uuid NOT NULL REFERENCES users(id),
        token_hash text NOT NULL UNIQUE,
        label text,
        created_by uuid,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`
      CREATE TABLE token_revocations (
        token_id uuid PRIMARY KEY REFERENCES tokens(id),
        revoked_by uuid,
        revoked_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`
      CREATE TABLE revision_closures (
        revision_id uuid PRIMARY KEY REFERENCES revisions(id),
        kind text NOT NULL CHECK (kind IN ('approved', 'rejected', 'withdrawn')),
        event_id uuid NOT NULL REFERENCES events(id),
        actor_id uuid NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    for (const table of ['users', 'tokens', 'token_revocations', 'revision_closures']) {
      await q.query(`CREATE TRIGGER ${table}_immutable BEFORE UPDATE OR DELETE ON ${table}
        FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
      await q.query(`CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table}
        FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
    }
    await q.query(`CREATE INDEX revisions_created_idx ON revisions (created_at, id)`);
  }

  async down(): Promise<void> {
    throw new Error('identities and review closures are permanent: this migration is not reversible');
  }
}

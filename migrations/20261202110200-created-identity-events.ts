import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The user-level audit: who created which user with which roles, who issued or revoked which token for whom, and
 * with which of their own tokens. Insert-only, like every record table.
 */
export class CreatedIdentityEvents20261202110200 implements MigrationInterface {
  name = 'CreatedIdentityEvents20261202110200';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE identity_events (
        id uuid PRIMARY KEY,
        type text NOT NULL CHECK (type IN ('user-created', 'role-granted', 'token-issued', 'token-revoked')),
        actor_id uuid,
        actor_token_id uuid,
        subject_user_id uuid NOT NULL REFERENCES users(id),
        token_id uuid REFERENCES tokens(id),
        data jsonb NOT NULL DEFAULT '{}'::jsonb,
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX identity_events_subject_idx ON identity_events (subject_user_id, created_at)`);
    await q.query(`CREATE INDEX identity_events_created_idx ON identity_events (created_at, id)`);
    await q.query(`CREATE TRIGGER identity_events_immutable BEFORE UPDATE OR DELETE ON identity_events
      FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
    await q.query(`CREATE TRIGGER identity_events_no_truncate BEFORE TRUNCATE ON identity_events
      FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
  }

  async down(): Promise<void> {
    throw new Error('the identity audit is permanent: this migration is not reversible');
  }
}

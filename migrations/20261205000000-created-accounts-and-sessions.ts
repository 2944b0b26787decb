import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Local accounts and page sessions, all insert-only like every record table (the runtime role holds SELECT and
 * INSERT only):
 * - users get a unique `email` (compared case-insensitively); rows created before this migration have none and can
 *   only use bearer tokens until an admin creates an account for them;
 * - activation_codes: one-time codes (stored as SHA-256) an admin issues for a new user or a password reset; a
 *   code is used by the password credential that names it (unique: at most once, whatever the race);
 * - password_credentials: Argon2id hashes, the newest per user counts; only an activation code sets one;
 * - sessions: one row per sign-in (the cookie's secret as SHA-256, the method, when the person authenticated, the
 *   absolute expiry, and a per-session key that seals the idle stamp and derives the CSRF token); session_ends: one
 *   row per sign-out;
 * - reauthentications: a fresh login at the identity provider for signing one revision (when the signing started,
 *   the provider's auth_time, never older), used at most once (reauthentication_uses);
 * - identity_events takes the new kinds of change (roles revoked, deactivation, activation codes, passwords set).
 * Roles and deactivation are derived from identity_events (the newest event per role, and per user), never stored
 * by update; users.roles remains the roles granted at creation for rows that have no role event.
 */
export class CreatedAccountsAndSessions20261205000000 implements MigrationInterface {
  name = 'CreatedAccountsAndSessions20261205000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE users ADD COLUMN email text CHECK (email IS NULL OR (length(email) BETWEEN 3 AND 254 AND email = btrim(email)))`);
    await q.query(`CREATE UNIQUE INDEX users_email_key ON users (lower(email))`);
    await q.query(`
      CREATE TABLE activation_codes (
        id uuid PRIMARY KEY,
        user_id uuid NOT NULL REFERENCES users(id),
        code_hash text NOT NULL UNIQUE,
        purpose text NOT NULL CHECK (purpose IN ('activation', 'reset')),
        expires_at timestamptz NOT NULL,
        created_by uuid REFERENCES users(id),
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX activation_codes_user_idx ON activation_codes (user_id, created_at)`);
    await q.query(`
      CREATE TABLE password_credentials (
        id uuid PRIMARY KEY,
        user_id uuid NOT NULL REFERENCES users(id),
        hash text NOT NULL CHECK (hash LIKE '$argon2id$%'),
        activation_id uuid NOT NULL UNIQUE REFERENCES activation_codes(id),
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX password_credentials_user_idx ON password_credentials (user_id, created_at DESC)`);
    await q.query(`
      CREATE TABLE sessions (
        id uuid PRIMARY KEY,
        user_id uuid NOT NULL REFERENCES users(id),
        secret_hash text NOT NULL UNIQUE,
        seal_key text NOT NULL,
        method text NOT NULL CHECK (method IN ('password', 'oidc', 'passkey')),
        auth_time timestamptz NOT NULL,
        expires_at timestamptz NOT NULL,
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX sessions_user_idx ON sessions (user_id, created_at)`);
    await q.query(`
      CREATE TABLE session_ends (
        session_id uuid PRIMARY KEY REFERENCES sessions(id),
        reason text NOT NULL CHECK (reason IN ('signed-out')),
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`
      CREATE TABLE reauthentications (
        id uuid PRIMARY KEY,
        user_id uuid NOT NULL REFERENCES users(id),
        revision_id uuid NOT NULL REFERENCES revisions(id),
        method text NOT NULL CHECK (method IN ('oidc')),
        started_at timestamptz NOT NULL,
        auth_time timestamptz NOT NULL CHECK (auth_time >= started_at),
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`
      CREATE TABLE reauthentication_uses (
        reauthentication_id uuid PRIMARY KEY REFERENCES reauthentications(id),
        created_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    for (const table of ['activation_codes', 'password_credentials', 'sessions', 'session_ends', 'reauthentications', 'reauthentication_uses']) {
      await q.query(`CREATE TRIGGER ${table}_immutable BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION leadline_refuse_change()`);
      await q.query(`CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION leadline_refuse_change()`);
    }
    await q.query(`ALTER TABLE identity_events DROP CONSTRAINT identity_events_type_check`);
    await q.query(`ALTER TABLE identity_events ADD CONSTRAINT identity_events_type_check CHECK (type IN (
      'user-created', 'role-granted', 'role-revoked', 'token-issued', 'token-revoked', 'user-deactivated', 'user-reactivated',
      'activation-issued', 'password-reset-issued', 'password-set'))`);
    await q.query(`CREATE INDEX identity_events_state_idx ON identity_events (subject_user_id, type, created_at DESC)`);
  }

  async down(): Promise<void> {
    throw new Error('accounts and sessions are part of the identity record: this migration is not reversible');
  }
}

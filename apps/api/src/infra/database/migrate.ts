/**
 * Migrations and least privilege on PostgreSQL. The migrations run as the owner role
 * (LEADLINE_MIGRATION_DATABASE_URL, default DATABASE_URL); afterwards the runtime role the service connects as is
 * granted SELECT and EXECUTE on the functions, and INSERT only where no record lives (RUNTIME_INSERT_TABLES): without
 * ownership it cannot ALTER, DROP, TRUNCATE or disable a trigger, and it writes records, identities and rule sets
 * only through the SECURITY DEFINER functions of migrations/20261204230000. The grants are repeated on every start, so tables added by later
 * migrations are covered too.
 */
import { Logger } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { MIGRATIONS } from '../../../../../migrations';
import type { AppConfig } from '../config';

export const MIGRATIONS_TABLE = 'schema_migrations';

type MigrationConfig = Pick<AppConfig, 'DATABASE_URL' | 'LEADLINE_MIGRATION_DATABASE_URL' | 'LEADLINE_RUNTIME_ROLE'>;

/** The role to grant to: configured, or the user of DATABASE_URL when migrations have their own URL. */
export function runtimeRole(config: MigrationConfig): string | null {
  if (config.LEADLINE_RUNTIME_ROLE) return config.LEADLINE_RUNTIME_ROLE;
  if (config.LEADLINE_MIGRATION_DATABASE_URL && config.DATABASE_URL) return decodeURIComponent(new URL(config.DATABASE_URL).username) || null;
  return null;
}

const ident = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** Runs every pending migration as the owner role and grants the runtime role what it needs, and only that. */
export async function migrateServer(config: MigrationConfig, logger = new Logger('database')): Promise<void> {
  if (!config.LEADLINE_MIGRATION_DATABASE_URL) {
    logger.warn(
      'LEADLINE_MIGRATION_DATABASE_URL is not set: migrations run as the service\'s own database role (single-user setup). ' +
        'That role owns the record tables and could disable their triggers; for production give the migrations an owner role ' +
        'and the service a runtime role with SELECT and INSERT only (docs/reliability.md, "Security and tamper evidence").',
    );
  }
  const owner = new DataSource({
    type: 'postgres',
    url: config.LEADLINE_MIGRATION_DATABASE_URL ?? config.DATABASE_URL,
    migrations: MIGRATIONS,
    migrationsTableName: MIGRATIONS_TABLE,
    poolSize: 1,
    logging: false,
  });
  await owner.initialize();
  try {
    await owner.runMigrations({ transaction: 'each' });
    const role = runtimeRole(config);
    const [{ current_user: me }] = await owner.query(`SELECT current_user`);
    if (role && role !== me) {
      await grantRuntime(owner, role);
      await grantQueue(owner, role);
    }
  } finally {
    await owner.destroy();
  }
}

/**
 * SELECT on the tables (tokens without token_hash, sessions without secret_hash and seal_key, password_credentials without hash), INSERT on idempotency_keys only, EXECUTE on the functions;
 * everything else revoked. Every record, identity and rule row is written by the SECURITY DEFINER functions of
 * migrations/20261204230000, which check the acting credential and the invariants (docs/reliability.md, "Threat model").
 */
export async function grantRuntime(q: { query(sql: string, params?: unknown[]): Promise<unknown> }, role: string): Promise<void> {
  const r = ident(role);
  await q.query(`GRANT USAGE ON SCHEMA public TO ${r}`);
  await q.query(`REVOKE ALL ON ALL TABLES IN SCHEMA public FROM ${r}`);
  await q.query(`GRANT SELECT ON ALL TABLES IN SCHEMA public TO ${r}`);
  await q.query(`REVOKE ALL ON ${MIGRATIONS_TABLE} FROM ${r}`);
  // a token row's hash and a session's secret hash are what the functions accept as a credential: the runtime role may not read them
  for (const [table, hidden] of Object.entries(HIDDEN_COLUMNS)) {
    await q.query(`REVOKE SELECT ON ${table} FROM ${r}`);
    const columns = (await q.query(
      `SELECT column_name FROM information_schema.columns WHERE table_schema = 'public' AND table_name = $1 AND NOT (column_name = ANY ($2::text[])) ORDER BY ordinal_position`,
      [table, hidden],
    )) as { column_name: string }[];
    if (columns.length) await q.query(`GRANT SELECT (${columns.map((c) => ident(c.column_name)).join(', ')}) ON ${table} TO ${r}`);
  }
  for (const table of RUNTIME_INSERT_TABLES) await q.query(`GRANT INSERT ON ${table} TO ${r}`);
  await q.query(`GRANT EXECUTE ON ALL FUNCTIONS IN SCHEMA public TO ${r}`);
  // helpers the record functions call with the owner's rights; called directly they would write without the checks
  for (const fn of INTERNAL_FUNCTIONS) {
    if (((await q.query(`SELECT to_regprocedure($1) AS f`, [fn])) as { f: string | null }[])[0]?.f) await q.query(`REVOKE EXECUTE ON FUNCTION ${fn} FROM ${r}`);
  }
}

/** Columns the runtime role may not read: the stored credentials (and a session's seal key, which makes its cookies), the password hashes. */
export const HIDDEN_COLUMNS: Readonly<Record<string, readonly string[]>> = {
  tokens: ['token_hash'],
  sessions: ['secret_hash', 'seal_key'],
  // the Argon2id hashes: read through leadline_password_hash with the service credential (migrations/20261206030100)
  password_credentials: ['hash'],
};

/** Functions only the record functions call (migrations/20261204230200). */
export const INTERNAL_FUNCTIONS = ['leadline_ledger_next(text, bigint, text, text, text)', 'leadline_put_identity_events(uuid, uuid, jsonb)'];

/** Tables the runtime role inserts into directly: none of them is a record, identity or rule table. */
export const RUNTIME_INSERT_TABLES = ['idempotency_keys'];
/**
 * The queue schema (migrations/20261205000200): SELECT and INSERT on its tables (enqueue, record a delivery attempt,
 * set a mail preference) and EXECUTE on its functions, the only way a job, an endpoint or a lease changes.
 */
export async function grantQueue(q: { query(sql: string): Promise<unknown> }, role: string): Promise<void> {
  const r = ident(role);
  await q.query(`GRANT USAGE ON SCHEMA queue TO ${r}`);
  await q.query(`REVOKE ALL ON ALL TABLES IN SCHEMA queue FROM ${r}`);
  await q.query(`GRANT SELECT, INSERT ON queue.jobs, queue.webhook_endpoints, queue.webhook_attempts, queue.mail_preferences, queue.rendered_files TO ${r}`);
  await q.query(`GRANT EXECUTE ON FUNCTION queue.claim(text, text[], integer, timestamptz, integer), queue.finish(uuid, text, text, jsonb, text, timestamptz),
    queue.report_progress(uuid, text, jsonb, timestamptz), queue.extend_lease(uuid, text, timestamptz), queue.failures_blocked(text, text, integer, integer, timestamptz),
    queue.record_failure(text, text, integer, timestamptz), queue.take_allowance(text, text, double precision, timestamptz),
    queue.take_allowances(text, text, double precision, timestamptz, integer), queue.disable_endpoint(uuid, text), queue.rotate_endpoint_secret(uuid, text) TO ${r}`);
}

/** Warns when the service's own connection is a superuser or owns the record tables (it could then rewrite them). */
export async function warnIfPrivileged(q: { query(sql: string): Promise<{ superuser: boolean; owner: boolean }[]> }, logger = new Logger('database')): Promise<void> {
  const [me] = await q.query(
    `SELECT r.rolsuper AS superuser, coalesce(pg_has_role(current_user, t.tableowner, 'USAGE'), false) AS owner
       FROM pg_roles r LEFT JOIN pg_tables t ON t.schemaname = 'public' AND t.tablename = 'revisions' WHERE r.rolname = current_user`,
  );
  if (me?.superuser || me?.owner) {
    logger.warn(
      `the service connects as a role that ${me.superuser ? 'is a database superuser' : 'owns the record tables'}: it could disable the insert-only ` +
        'triggers. Connect DATABASE_URL as a runtime role and run migrations as the owner (LEADLINE_MIGRATION_DATABASE_URL).',
    );
  }
}

/**
 * What the integration run shares between its files (prepared once by global-setup.ts): one Chromium, one migrated
 * template database on the PostgreSQL server, one migrated PGlite snapshot. A file started on its own (no global
 * setup) gets none of them and falls back to launching and migrating by itself.
 */
import { readFileSync } from 'node:fs';

export const ENV = {
  /** DevTools WebSocket address of the run's Chromium */
  chromium: 'LEADLINE_TEST_CHROMIUM_WS',
  /** Name of the migrated template database */
  pgTemplate: 'LEADLINE_TEST_PG_TEMPLATE',
  /** File holding the migrated PGlite data-folder dump */
  pgliteSnapshot: 'LEADLINE_TEST_PGLITE_SNAPSHOT',
} as const;

export const serverUrl = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';

/** The run's Chromium, or null. */
export function chromiumEndpoint(): string | null {
  return process.env[ENV.chromium] || null;
}

/** The migrated template database, or null. */
export function pgTemplate(): string | null {
  return process.env[ENV.pgTemplate] || null;
}

let snapshot: Blob | null | undefined;

/** The migrated PGlite snapshot (read once per worker), or null. */
export function pgliteSnapshot(): Blob | null {
  if (snapshot === undefined) {
    const file = process.env[ENV.pgliteSnapshot];
    snapshot = file ? new Blob([readFileSync(file)]) : null;
  }
  return snapshot;
}

/** The URL of database `name` on the server of DATABASE_URL. */
export function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

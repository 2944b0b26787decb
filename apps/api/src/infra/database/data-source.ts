/**
 * Builds the TypeORM data source for either PostgreSQL (DATABASE_URL) or embedded PGlite (LEADLINE_DATA_DIR).
 * The same migrations, triggers and constraints run on both.
 */
import { mkdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { Logger } from '@nestjs/common';
import { DataSource, type DataSourceOptions } from 'typeorm';
import { PGliteDriver } from 'typeorm-pglite';
import { MIGRATIONS } from '../../../../../migrations';
import type { AppConfig } from '../config';
import { lockDataDir, type DataDirLock } from './data-dir-lock';
import { DATA_DIR_MODE, restrictDataDir } from './data-dir-mode';

export interface DataSourceChoice {
  readonly dataSource: DataSource;
  readonly embedded: boolean;
  /** The embedded database's folder on disk (not set for PostgreSQL or an in-memory database) */
  readonly dataDir?: string;
}

const locks = new WeakMap<DataSource, DataDirLock>();

/** The data-folder lock of an embedded data source (released when the data source is destroyed). */
export function dataDirLockOf(dataSource: DataSource): DataDirLock | undefined {
  return locks.get(dataSource);
}

/**
 * LEADLINE_DATA_DIR is a folder for PGlite, or "memory://" for an in-memory database (tests).
 * @param embeddedSnapshot - a PGlite data-folder dump to start an in-memory database from (tests: migrated once per run)
 */
export function createDataSource(config: Pick<AppConfig, 'DATABASE_URL' | 'LEADLINE_DATA_DIR' | 'LEADLINE_DB_POOL'>, embeddedSnapshot?: Blob): DataSourceChoice {
  const common = {
    type: 'postgres' as const,
    synchronize: false,
    migrationsRun: false,
    migrations: MIGRATIONS,
    migrationsTableName: 'schema_migrations',
    logging: false,
  };
  if (config.DATABASE_URL) {
    const options: DataSourceOptions = { ...common, url: config.DATABASE_URL, poolSize: config.LEADLINE_DB_POOL };
    return { dataSource: new DataSource(options), embedded: false };
  }
  const dir = config.LEADLINE_DATA_DIR;
  const dataDir = dir.startsWith('memory://') ? dir : resolve(dir);
  // A folder is opened by one process only: the lock is taken before PGlite touches the folder.
  let lock: DataDirLock | undefined;
  if (!dir.startsWith('memory://')) {
    mkdirSync(dataDir, { recursive: true, mode: DATA_DIR_MODE });
    restrictDataDir(dataDir);
    lock = lockDataDir(dataDir);
  }
  const options: DataSourceOptions = {
    ...common,
    driver: new PGliteDriver(embeddedSnapshot && dataDir.startsWith('memory://') ? { dataDir, loadDataDir: embeddedSnapshot } : { dataDir }).driver,
    installExtensions: false,
  } as DataSourceOptions;
  const dataSource = new DataSource(options);
  if (lock) locks.set(dataSource, lock);
  return { dataSource, embedded: true, ...(lock ? { dataDir } : {}) };
}

interface PgClientLike {
  on(event: 'error', listener: (err: Error) => void): unknown;
}

/**
 * A pg client that loses its connection while checked out (terminated session, database restart) emits 'error';
 * without a listener that event would end the process. The pool's own handler covers idle clients only, so every
 * client gets one: the request that held it fails with the query's own error (answered 503), the pool drops it.
 */
export function guardPoolClients(dataSource: DataSource): void {
  const pool = (dataSource.driver as unknown as { master?: { on?: unknown; _clients?: PgClientLike[] } }).master;
  if (!pool || typeof pool.on !== 'function') return; // PGlite: no pool
  const logger = new Logger('database');
  const guard = (client: PgClientLike) => {
    if (!(client as { leadlineGuarded?: boolean }).leadlineGuarded) {
      (client as { leadlineGuarded?: boolean }).leadlineGuarded = true;
      client.on('error', (err) => logger.warn(`database connection lost: ${err.message}`));
    }
  };
  (pool.on as (event: string, listener: (client: PgClientLike) => void) => void).call(pool, 'connect', guard);
  for (const client of pool._clients ?? []) guard(client); // connections opened before (start-up, migrations)
}

/**
 * The one door to the database. PostgreSQL (pg pool) in production and tests; PGlite in embedded mode.
 *
 * PGlite is a single connection per process: two transactions would interleave on it and one's rows could be
 * lost (shared/STACK-NOTES.md). In embedded mode every statement and transaction therefore goes through one
 * FIFO queue, so a transaction owns the connection from BEGIN to COMMIT.
 */
import { Injectable, OnApplicationShutdown } from '@nestjs/common';
import { DataSource, type QueryRunner } from 'typeorm';
import { dataDirLockOf } from './data-source';
import { restrictDataDir } from './data-dir-mode';

/** What a transaction body may do: run statements on its own connection. */
export interface Queryer {
  query<T = Record<string, unknown>>(sql: string, params?: unknown[]): Promise<T[]>;
}

/** A FIFO lock: one holder at a time, the rest wait in order. */
class SerialQueue {
  private tail: Promise<unknown> = Promise.resolve();
  run<T>(task: () => Promise<T>): Promise<T> {
    const result = this.tail.then(task, task);
    this.tail = result.catch(() => undefined);
    return result;
  }
}

/** PostgreSQL error codes the services translate into HTTP answers */
export const PG_UNIQUE_VIOLATION = '23505';
export const PG_NO_DATA_FOUND = 'P0002';

export function pgErrorCode(err: unknown): string | undefined {
  const e = err as { code?: string; driverError?: { code?: string } };
  return e?.driverError?.code ?? e?.code;
}

@Injectable()
export class Database implements OnApplicationShutdown {
  private readonly queue: SerialQueue | null;

  constructor(
    readonly dataSource: DataSource,
    readonly embedded: boolean,
    /** The embedded database's folder, restricted to the owner again when it is closed */
    private readonly dataDir?: string,
  ) {
    this.queue = embedded ? new SerialQueue() : null;
  }

  /** One statement outside any transaction (autocommit). */
  query<T = Record<string, unknown>>(sql: string, params: unknown[] = []): Promise<T[]> {
    const run = () => this.dataSource.query(sql, params) as Promise<T[]>;
    return this.queue ? this.queue.run(run) : run();
  }

  /**
   * Runs the body in one transaction on one connection; commits on success, rolls back on any error.
   * @param isolation - 'repeatable read' gives the body one snapshot (consistent multi-table reads)
   */
  transaction<T>(body: (q: Queryer) => Promise<T>, isolation: 'read committed' | 'repeatable read' = 'read committed'): Promise<T> {
    const run = async () => {
      const runner: QueryRunner = this.dataSource.createQueryRunner();
      await runner.connect();
      try {
        await runner.query(isolation === 'read committed' ? 'BEGIN' : 'BEGIN ISOLATION LEVEL REPEATABLE READ');
        const result = await body({ query: (sql, params = []) => runner.query(sql, params) });
        await runner.query('COMMIT');
        return result;
      } catch (err) {
        await runner.query('ROLLBACK').catch(() => undefined);
        throw err;
      } finally {
        await runner.release();
      }
    };
    return this.queue ? this.queue.run(run) : run();
  }

  async onApplicationShutdown(): Promise<void> {
    try {
      if (this.dataSource.isInitialized) await this.dataSource.destroy();
      if (this.dataDir) restrictDataDir(this.dataDir);
    } finally {
      // The embedded folder is free for the next process only once PGlite has closed it
      dataDirLockOf(this.dataSource)?.release();
    }
  }
}

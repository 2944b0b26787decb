/**
 * Planner statistics for the embedded database. PGlite runs no autovacuum worker, so without this its tables are
 * never analyzed: the planner keeps the row estimates of an empty table, sorts the whole trail for the audit page
 * instead of reading the (product_id, seq) indexes, and the append function's cached plans scan instead of probing,
 * so every cost grows with the chain. PostgreSQL's autovacuum does this job on a server.
 */
import { Injectable, type OnApplicationBootstrap, type OnApplicationShutdown } from '@nestjs/common';
import { Database } from './database.service';

/** The tables whose plans depend on their size; analyzed together. */
const RECORD_TABLES = ['revisions', 'events', 'calculations', 'revision_closures', 'chain_heads'];

/** How often the embedded database checks whether its statistics are stale [ms]. */
export const STATISTICS_CHECK_MS = 10_000;

@Injectable()
export class EmbeddedStatistics implements OnApplicationBootstrap, OnApplicationShutdown {
  private timer: NodeJS.Timeout | null = null;

  constructor(private readonly db: Database) {}

  async onApplicationBootstrap(): Promise<void> {
    if (!this.db.embedded) return;
    await this.refresh();
    this.timer = setInterval(() => void this.refresh().catch(() => undefined), STATISTICS_CHECK_MS);
    this.timer.unref();
  }

  onApplicationShutdown(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  /**
   * ANALYZE the record tables when the chain has grown past the last estimate by more than 10 % + 50 rows (the
   * default autovacuum threshold), or when they were never analyzed. The check reads one row per product.
   * @returns whether it analyzed
   */
  async refresh(): Promise<boolean> {
    const [s] = await this.db.query<{ links: string; estimated: string; never: boolean }>(
      `SELECT (SELECT coalesce(sum(seq), 0) FROM chain_heads) AS links,
              (SELECT coalesce(sum(greatest(reltuples, 0)), 0) FROM pg_class WHERE oid IN ('revisions'::regclass, 'events'::regclass)) AS estimated,
              (SELECT bool_or(reltuples < 0) FROM pg_class WHERE oid IN ('revisions'::regclass, 'events'::regclass)) AS never`,
    );
    if (!s.never && Number(s.links) <= Number(s.estimated) * 1.1 + 50) return false;
    for (const table of RECORD_TABLES) await this.db.query(`ANALYZE ${table}`);
    return true;
  }
}

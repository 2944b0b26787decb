/**
 * The durable job queue on the service's own database (schema `queue`, migrations/20261205000200).
 *
 * Enqueue inside the caller's transaction (`enqueue(q, ...)`): the job exists exactly when the transaction commits.
 * Record events enqueue themselves by trigger (the outbox). Every instance runs up to LEADLINE_WORKERS jobs at once;
 * a job is claimed by one instance (FOR UPDATE SKIP LOCKED) under a lease, and taken again by any instance once the
 * lease runs out (its instance died). On PostgreSQL a NOTIFY on commit wakes idle instances at once; otherwise, and
 * on the embedded database (one process, same SQL), they look every LEADLINE_QUEUE_POLL_MS.
 *
 * Tests run jobs deterministically with `drain()` (LEADLINE_WORKERS=0 in the harness) and decide due times by the
 * injected clock.
 */
import { Inject, Injectable, Logger, OnApplicationBootstrap, OnApplicationShutdown } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import { Client } from 'pg';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { CLOCK, type Clock } from '../infra/clock';
import { Database, type Queryer } from '../infra/database/database.service';
import { retryDelayMs } from './backoff';

export interface Job<P = Record<string, unknown>> {
  id: string;
  kind: string;
  payload: P;
  attempts: number;
  maxAttempts: number;
  createdBy: string | null;
}

/** What a handler decides; a thrown error is a retry after the backoff (or a failure after the last attempt). */
export type JobOutcome =
  | { state: 'done'; result?: unknown }
  | { state: 'retry'; at: number; error: string }
  | { state: 'failed'; error: string };

export interface JobContext {
  /** Records progress (shown to whoever polls the job) and extends the lease */
  progress(value: unknown): Promise<void>;
}

export type JobHandler = (job: Job<any>, ctx: JobContext) => Promise<JobOutcome | void>;

export interface EnqueueOptions {
  /** A second enqueue with the same key is ignored (fan-out that may run twice) */
  dedupeKey?: string;
  maxAttempts?: number;
  /** Due time [ms since epoch]; default: now */
  runAt?: number;
  createdBy?: string | null;
}

/** A job as its creator sees it (GET /api/v1/jobs/:id). */
export interface JobView {
  id: string;
  kind: string;
  state: 'ready' | 'running' | 'done' | 'failed';
  attempts: number;
  progress: unknown;
  result: unknown;
  error: string | null;
  createdBy: string | null;
  createdAt: string;
  finishedAt: string | null;
}

export const JOB_CHANNEL = 'leadline_jobs';

const JOB_COLUMNS = 'id, kind, state, attempts, progress, result, last_error, created_by, created_at, finished_at';

/** A queue.jobs row (JOB_COLUMNS) as its creator sees it. */
function jobView(row: Record<string, any>): JobView {
  return {
    id: row.id, kind: row.kind, state: row.state, attempts: row.attempts, progress: row.progress ?? null, result: row.result ?? null,
    error: row.last_error ?? null, createdBy: row.created_by ?? null,
    createdAt: new Date(row.created_at).toISOString(), finishedAt: row.finished_at ? new Date(row.finished_at).toISOString() : null,
  };
}

@Injectable()
export class QueueService implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger('queue');
  private readonly handlers = new Map<string, JobHandler>();
  /** Kinds whose jobs any signed-in user may follow at GET /api/v1/jobs/:id (work a user asked for, not deliveries) */
  private readonly visible = new Set<string>();
  /** This instance's name in leases: host, process and a random part (two apps in one process differ) */
  readonly worker = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  private running = 0;
  private stopped = false;
  private timer: NodeJS.Timeout | null = null;
  private listener: Client | null = null;
  private ticking: Promise<void> | null = null;
  private again = false;
  private readonly inFlight = new Set<Promise<void>>();
  /** LEADLINE_QUEUE_LEASE_SECONDS; while a handler works its lease is moved forward every quarter of it (a heartbeat) */
  private readonly leaseMs: number;

  constructor(
    private readonly db: Database,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    this.leaseMs = config.LEADLINE_QUEUE_LEASE_SECONDS * 1000;
  }

  /**
   * Registers the handler of one kind of job (modules do this at construction). `visible`: its jobs are shown at
   * GET /api/v1/jobs/:id (deliveries and fan-out are not: their payloads name endpoints and addresses).
   */
  handle(kind: string, handler: JobHandler, options: { visible?: boolean } = {}): void {
    if (this.handlers.has(kind)) throw new Error(`a handler for ${kind} jobs is registered already`);
    this.handlers.set(kind, handler);
    if (options.visible) this.visible.add(kind);
  }

  /** Whether jobs of this kind may be shown to signed-in users. */
  isVisible(kind: string): boolean {
    return this.visible.has(kind);
  }

  /** Enqueues a job in the caller's transaction (or alone); returns its id, or null when the dedupe key existed. */
  async enqueue(q: Queryer, kind: string, payload: unknown, options: EnqueueOptions = {}): Promise<string | null> {
    const rows = await q.query<{ id: string }>(
      `INSERT INTO queue.jobs (kind, payload, dedupe_key, max_attempts, run_at, created_by)
       VALUES ($1, $2::jsonb, $3, $4, $5, $6) ON CONFLICT (dedupe_key) DO NOTHING RETURNING id`,
      [kind, JSON.stringify(payload), options.dedupeKey ?? null, options.maxAttempts ?? 5, new Date(options.runAt ?? this.clock.now()).toISOString(), options.createdBy ?? null],
    );
    if (rows.length && !this.db.embedded) await q.query(`SELECT pg_notify($1, $2)`, [JOB_CHANNEL, kind]);
    return rows[0]?.id ?? null;
  }

  async get(id: string): Promise<JobView | null> {
    const [row] = await this.db.query<Record<string, any>>(`SELECT ${JOB_COLUMNS} FROM queue.jobs WHERE id = $1`, [id]);
    return row ? jobView(row) : null;
  }

  /**
   * The newest jobs of one kind whose payload names `value` under `key` (a product's design files), newest first,
   * each with its payload.
   */
  async recent(kind: string, key: string, value: string, limit: number): Promise<(JobView & { payload: unknown })[]> {
    const rows = await this.db.query<Record<string, any>>(
      `SELECT ${JOB_COLUMNS}, payload FROM queue.jobs WHERE kind = $1 AND payload->>$2 = $3 ORDER BY created_at DESC, id LIMIT $4`,
      [kind, key, value, limit],
    );
    return rows.map((row) => ({ ...jobView(row), payload: row.payload }));
  }

  /**
   * Runs every job that is due now (by the service's clock), including those the jobs enqueue, until none is left;
   * returns how many ran. What tests and the single-run tools use instead of waiting for the workers.
   */
  async drain(limit = 10_000): Promise<number> {
    let ran = 0;
    while (ran < limit) {
      const jobs = await this.claim(Math.min(16, limit - ran));
      if (!jobs.length) break;
      for (const job of jobs) await this.run(job);
      ran += jobs.length;
    }
    return ran;
  }

  onApplicationBootstrap(): void {
    if (this.config.LEADLINE_WORKERS === 0) return;
    this.schedule();
    if (!this.db.embedded && this.config.DATABASE_URL) void this.listen(this.config.DATABASE_URL);
    this.wake();
  }

  async onApplicationShutdown(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearTimeout(this.timer);
    const listener = this.listener;
    this.listener = null;
    await listener?.end().catch(() => undefined);
    await this.ticking?.catch(() => undefined);
    await Promise.allSettled([...this.inFlight]);
  }

  /** Looks for due jobs now (coalesced: one look at a time, another one after it if asked meanwhile). */
  wake(): void {
    if (this.stopped || this.config.LEADLINE_WORKERS === 0) return;
    if (this.ticking) {
      this.again = true;
      return;
    }
    this.ticking = this.tick()
      .catch((err) => this.logger.warn(`looking for jobs failed: ${(err as Error).message}`))
      .finally(() => {
        this.ticking = null;
        if (this.again) {
          this.again = false;
          this.wake();
        }
      });
  }

  private async tick(): Promise<void> {
    const free = this.config.LEADLINE_WORKERS - this.running;
    if (free <= 0 || this.stopped) return;
    const jobs = await this.claim(free);
    for (const job of jobs) {
      this.running++;
      const done = this.run(job).finally(() => {
        this.running--;
        this.inFlight.delete(done);
        this.wake();
      });
      this.inFlight.add(done);
    }
  }

  private schedule(): void {
    if (this.stopped) return;
    this.timer = setTimeout(() => {
      this.wake();
      this.schedule();
    }, this.config.LEADLINE_QUEUE_POLL_MS);
    this.timer.unref();
  }

  private async listen(url: string): Promise<void> {
    const client = new Client({ connectionString: url });
    client.on('error', (err) => {
      this.logger.warn(`queue listener lost its connection (${err.message}); polling every ${this.config.LEADLINE_QUEUE_POLL_MS} ms`);
      if (this.listener === client) this.listener = null;
    });
    client.on('notification', () => this.wake());
    try {
      await client.connect();
      await client.query(`LISTEN ${JOB_CHANNEL}`);
      if (this.stopped) await client.end();
      else this.listener = client;
    } catch (err) {
      this.logger.warn(`queue listener could not connect (${(err as Error).message}); polling instead`);
      await client.end().catch(() => undefined);
    }
  }

  private async claim(limit: number): Promise<Job[]> {
    const kinds = [...this.handlers.keys()];
    if (!kinds.length || limit <= 0) return [];
    const rows = await this.db.query<Record<string, any>>(
      `SELECT id, kind, payload, attempts, max_attempts, created_by FROM queue.claim($1, $2::text[], $3, $4, $5)`,
      [this.worker, kinds, limit, new Date(this.clock.now()).toISOString(), this.config.LEADLINE_QUEUE_LEASE_SECONDS],
    );
    return rows.map((r) => ({ id: r.id, kind: r.kind, payload: r.payload, attempts: r.attempts, maxAttempts: r.max_attempts, createdBy: r.created_by ?? null }));
  }

  private async run(job: Job): Promise<void> {
    const handler = this.handlers.get(job.kind)!;
    let outcome: JobOutcome;
    const heartbeat = setInterval(() => {
      this.db
        .query(`SELECT queue.extend_lease($1, $2, $3)`, [job.id, this.worker, new Date(this.clock.now() + this.leaseMs).toISOString()])
        .catch((err) => this.logger.warn(`${job.kind} job ${job.id}: the lease could not be extended (${(err as Error).message})`));
    }, this.leaseMs / 4);
    heartbeat.unref();
    try {
      outcome = (await handler(job, {
        progress: async (value) => {
          await this.db.query(`SELECT queue.report_progress($1, $2, $3::jsonb, $4)`, [
            job.id, this.worker, JSON.stringify(value), new Date(this.clock.now() + this.leaseMs).toISOString(),
          ]);
        },
      })) ?? { state: 'done' };
    } catch (err) {
      const message = (err as Error).message ?? String(err);
      outcome = job.attempts >= job.maxAttempts
        ? { state: 'failed', error: message }
        : { state: 'retry', at: this.clock.now() + retryDelayMs(job.attempts), error: message };
      this.logger.warn(`${job.kind} job ${job.id} attempt ${job.attempts} failed: ${message}`);
    } finally {
      clearInterval(heartbeat);
    }
    const state = outcome.state === 'retry' ? 'ready' : outcome.state;
    await this.db.query(`SELECT queue.finish($1, $2, $3, $4::jsonb, $5, $6)`, [
      job.id, this.worker, state,
      outcome.state === 'done' && outcome.result !== undefined ? JSON.stringify(outcome.result) : null,
      outcome.state === 'done' ? null : outcome.error,
      outcome.state === 'retry' ? new Date(outcome.at).toISOString() : null,
    ]);
  }
}

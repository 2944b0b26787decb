/**
 * Per-user limits on the costly routes: screw searches, evaluations, submissions (permanent records) and PDFs. Each
 * user has a token bucket per kind that holds a minute's allowance (LEADLINE_<KIND>_PER_USER_PER_MINUTE) and refills
 * evenly over the minute; a request finding it empty answers 429 with Retry-After, the seconds until one more is
 * allowed. Counted after authentication, so the limit is the user's whatever address or token they use; decided by
 * the service's clock (a test moves it forward). The buckets live in the database, shared by every instance; an
 * instance takes them in leases (LeasedAllowances) so that a busy user does not cost a round trip per request.
 */
import { Inject, Injectable, SetMetadata, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Observable } from 'rxjs';
import { CLOCK, type Clock } from '../clock';
import { APP_CONFIG, type AppConfig } from '../config';
import { Database, type Queryer } from '../database/database.service';
import { ProblemError } from './problem';

export type LimitKind = 'searches' | 'evaluations' | 'submissions' | 'pdfs';

const USER_LIMIT = 'leadline:user-limit';
/** Counts a route against the caller's per-minute allowance of this kind. */
export const UserLimit = (kind: LimitKind) => SetMetadata(USER_LIMIT, kind);

const SETTING: Record<LimitKind, keyof AppConfig> = {
  searches: 'LEADLINE_SEARCHES_PER_USER_PER_MINUTE',
  evaluations: 'LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE',
  submissions: 'LEADLINE_SUBMISSIONS_PER_USER_PER_MINUTE',
  pdfs: 'LEADLINE_PDFS_PER_USER_PER_MINUTE',
};

/**
 * Token buckets of one kind, one per key, each holding up to perMinute and refilling perMinute a minute, kept in
 * the database (queue.take_allowance, migrations/20261206050100) so that every instance takes from the same bucket.
 */
export class TokenBuckets {
  constructor(
    private readonly db: Queryer,
    readonly scope: string,
    readonly perMinute: number,
  ) {}

  /** Takes one for this key: 0 when allowed, else the whole seconds until one more is allowed. */
  async take(key: string, now: number): Promise<number> {
    const [row] = await this.db.query<{ wait: number }>(`SELECT queue.take_allowance($1, $2, $3, $4) AS wait`, [
      this.scope, key, this.perMinute, new Date(now).toISOString(),
    ]);
    return Number(row?.wait ?? 0);
  }

  /** Takes up to `want` for this key at once: how many were granted and, when none, the seconds until one more is. */
  async takeUpTo(key: string, now: number, want: number): Promise<{ granted: number; wait: number }> {
    const [row] = await this.db.query<{ granted: number; wait: number }>(`SELECT granted, wait FROM queue.take_allowances($1, $2, $3, $4, $5)`, [
      this.scope, key, this.perMinute, new Date(now).toISOString(), want,
    ]);
    return { granted: Number(row?.granted ?? 0), wait: Number(row?.wait ?? 1) };
  }
}

/**
 * An instance's leases on the shared buckets: a request spends a token of its user's lease without a round trip;
 * an empty lease is refilled from the shared bucket, with one token when the last lease lasted longer than a second
 * and twice the last size when it did not, up to three seconds' worth of the allowance (perMinute / 20). Tokens leave
 * the shared bucket before they are spent, so all instances together never allow more than it holds; what a lease
 * still holds counts only on its instance (a user moved to another instance finds the bucket short by at most that).
 * At most maxEntries leases are kept; the least recently used goes first, its tokens forgotten (the safe side).
 */
export class LeasedAllowances {
  private readonly leases = new Map<string, { tokens: number; size: number; at: number }>();
  private readonly maxLease: number;

  constructor(
    readonly bucket: TokenBuckets,
    readonly maxEntries = 10_000,
  ) {
    this.maxLease = Math.max(1, Math.floor(bucket.perMinute / 20));
  }

  /** Spends a token of the key's lease when it holds one (true: allowed without a round trip). */
  spendLocal(key: string): boolean {
    const lease = this.leases.get(key);
    if (lease === undefined || lease.tokens < 1) return false;
    lease.tokens -= 1;
    return true;
  }

  /** Refills the key's lease from the shared bucket and spends one of it: 0 when allowed, else the seconds to wait. */
  async refill(key: string, now: number): Promise<number> {
    const last = this.leases.get(key);
    const want = last !== undefined && now - last.at < 1000 ? Math.min(this.maxLease, last.size * 2) : 1;
    const { granted, wait } = await this.bucket.takeUpTo(key, now, want);
    const current = this.leases.get(key); // read after the round trip: a concurrent refill may have left some
    const carried = current !== undefined ? Math.max(0, current.tokens) : 0;
    this.leases.delete(key); // re-inserted at the end: insertion order is last-use order
    if (this.leases.size >= this.maxEntries) {
      const oldest = this.leases.keys().next();
      if (!oldest.done) this.leases.delete(oldest.value);
    }
    this.leases.set(key, { tokens: carried + granted - (granted > 0 ? 1 : 0), size: Math.max(1, granted), at: now });
    return granted > 0 ? 0 : wait;
  }
}

@Injectable()
export class UserLimitInterceptor implements NestInterceptor {
  private readonly allowances: Record<LimitKind, LeasedAllowances>;

  constructor(
    private readonly reflector: Reflector,
    @Inject(APP_CONFIG) config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
    db: Database,
  ) {
    const of = (kind: LimitKind) => new LeasedAllowances(new TokenBuckets(db, `user:${kind}`, config[SETTING[kind]] as number));
    this.allowances = { searches: of('searches'), evaluations: of('evaluations'), submissions: of('submissions'), pdfs: of('pdfs') };
  }

  intercept(ctx: ExecutionContext, next: CallHandler): Observable<unknown> | Promise<Observable<unknown>> {
    const kind = ctx.getType() === 'http' ? this.reflector.get<LimitKind | undefined>(USER_LIMIT, ctx.getHandler()) : undefined;
    const user = kind ? ctx.switchToHttp().getRequest<{ principal?: { id: string } }>().principal?.id : undefined;
    if (!kind || !user || this.allowances[kind].spendLocal(user)) return next.handle();
    return this.allowances[kind].refill(user, this.clock.now()).then((wait) => {
      if (wait > 0) {
        const limit = this.allowances[kind].bucket.perMinute;
        throw new ProblemError(429, 'Too many requests', `you may make ${limit} ${kind} a minute (${SETTING[kind]}); try again in ${wait} s`, { retryAfter: wait });
      }
      return next.handle();
    });
  }
}

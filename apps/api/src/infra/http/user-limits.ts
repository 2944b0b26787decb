/**
 * Per-user limits on the costly routes: screw searches, evaluations, submissions (permanent records) and PDFs. Each
 * user has a token bucket per kind that holds a minute's allowance (LEADLINE_<KIND>_PER_USER_PER_MINUTE) and refills
 * evenly over the minute; a request finding it empty answers 429 with Retry-After, the seconds until one more is
 * allowed. Counted after authentication, so the limit is the user's whatever address or token they use; decided by
 * the service's clock (a test moves it forward). The buckets live in the database, shared by every instance.
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
}

@Injectable()
export class UserLimitInterceptor implements NestInterceptor {
  private readonly buckets: Record<LimitKind, TokenBuckets>;

  constructor(
    private readonly reflector: Reflector,
    @Inject(APP_CONFIG) config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
    db: Database,
  ) {
    const of = (kind: LimitKind) => new TokenBuckets(db, `user:${kind}`, config[SETTING[kind]] as number);
    this.buckets = { searches: of('searches'), evaluations: of('evaluations'), submissions: of('submissions'), pdfs: of('pdfs') };
  }

  async intercept(ctx: ExecutionContext, next: CallHandler): Promise<Observable<unknown>> {
    const kind = ctx.getType() === 'http' ? this.reflector.get<LimitKind | undefined>(USER_LIMIT, ctx.getHandler()) : undefined;
    const user = kind ? ctx.switchToHttp().getRequest<{ principal?: { id: string } }>().principal?.id : undefined;
    if (kind && user) {
      const wait = await this.buckets[kind].take(user, this.clock.now());
      if (wait > 0) {
        const limit = this.buckets[kind].perMinute;
        throw new ProblemError(429, 'Too many requests', `you may make ${limit} ${kind} a minute (${SETTING[kind]}); try again in ${wait} s`, { retryAfter: wait });
      }
    }
    return next.handle();
  }
}

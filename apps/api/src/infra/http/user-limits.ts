/**
 * Per-user limits on the costly routes: screw searches, evaluations, submissions (permanent records) and PDFs. Each
 * user has a token bucket per kind that holds a minute's allowance (LEADLINE_<KIND>_PER_USER_PER_MINUTE) and refills
 * evenly over the minute; a request finding it empty answers 429 with Retry-After, the seconds until one more is
 * allowed. Counted after authentication, so the limit is the user's whatever address or token they use; decided by
 * the service's clock (a test moves it forward). Memory is bounded: beyond maxEntries users the least recently seen
 * bucket goes first, which is also the fullest one.
 */
import { Inject, Injectable, SetMetadata, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Observable } from 'rxjs';
import { CLOCK, type Clock } from '../clock';
import { APP_CONFIG, type AppConfig } from '../config';
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

/** Token buckets of one kind, one per key, each holding up to perMinute and refilling perMinute a minute. */
export class TokenBuckets {
  // Insertion order is last-use order: a bucket is re-inserted at the end whenever it is used.
  private readonly buckets = new Map<string, { tokens: number; at: number }>();
  constructor(
    readonly perMinute: number,
    readonly maxEntries = 10_000,
  ) {}

  get size(): number {
    return this.buckets.size;
  }

  /** Takes one for this key: 0 when allowed, else the whole seconds until one more is allowed. */
  take(key: string, now: number): number {
    const rate = this.perMinute / 60_000; // per ms
    const b = this.buckets.get(key);
    let tokens = b ? Math.min(this.perMinute, b.tokens + Math.max(0, now - b.at) * rate) : this.perMinute;
    this.buckets.delete(key);
    if (this.buckets.size >= this.maxEntries) {
      const oldest = this.buckets.keys().next();
      if (!oldest.done) this.buckets.delete(oldest.value);
    }
    const allowed = tokens >= 1;
    if (allowed) tokens -= 1;
    this.buckets.set(key, { tokens, at: now });
    return allowed ? 0 : Math.max(1, Math.ceil((1 - tokens) / rate / 1000));
  }
}

@Injectable()
export class UserLimitInterceptor implements NestInterceptor {
  private readonly buckets: Record<LimitKind, TokenBuckets>;

  constructor(
    private readonly reflector: Reflector,
    @Inject(APP_CONFIG) config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    const of = (kind: LimitKind) => new TokenBuckets(config[SETTING[kind]] as number);
    this.buckets = { searches: of('searches'), evaluations: of('evaluations'), submissions: of('submissions'), pdfs: of('pdfs') };
  }

  intercept(ctx: ExecutionContext, next: CallHandler): Observable<unknown> {
    const kind = ctx.getType() === 'http' ? this.reflector.get<LimitKind | undefined>(USER_LIMIT, ctx.getHandler()) : undefined;
    const user = kind ? ctx.switchToHttp().getRequest<{ principal?: { id: string } }>().principal?.id : undefined;
    if (kind && user) {
      const wait = this.buckets[kind].take(user, this.clock.now());
      if (wait > 0) {
        const limit = this.buckets[kind].perMinute;
        throw new ProblemError(429, 'Too many requests', `you may make ${limit} ${kind} a minute (${SETTING[kind]}); try again in ${wait} s`, { retryAfter: wait });
      }
    }
    return next.handle();
  }
}

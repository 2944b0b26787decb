import type { Queryer } from '../infra/database/database.service';

/**
 * Fixed-window counter of failed authentications per client address, kept in the database (queue.limit_counters,
 * migrations/20261206050100) so that every instance counts against the same number. Only failures are counted,
 * and only failures are refused: a valid token is accepted whatever its address did, and an account is never
 * locked. `scope` keeps separate counts apart (bearer tokens, sign-in). Times come from the caller's clock.
 */
export class FailureLimiter {
  constructor(
    private readonly db: Queryer,
    readonly scope: string,
    readonly maxFailures = 10,
    readonly windowMs = 60_000,
  ) {}

  /** Seconds until this address may fail again, or 0 when it is not limited. */
  async blocked(key: string, now: number): Promise<number> {
    const [row] = await this.db.query<{ wait: number }>(`SELECT queue.failures_blocked($1, $2, $3, $4, $5) AS wait`, [
      this.scope, key, this.maxFailures, this.windowMs, new Date(now).toISOString(),
    ]);
    return Number(row?.wait ?? 0);
  }

  async fail(key: string, now: number): Promise<void> {
    await this.db.query(`SELECT queue.record_failure($1, $2, $3, $4)`, [this.scope, key, this.windowMs, new Date(now).toISOString()]);
  }
}

/**
 * The limiter's key for a client address: IPv4 as is, IPv6 by its /64 network (one host can hold a whole
 * /64, so counting single IPv6 addresses would let it rotate past the limit).
 */
export function clientKey(ip: string | undefined): string {
  if (!ip) return 'unknown';
  const v4 = /^(?:::ffff:)?(\d{1,3}(?:\.\d{1,3}){3})$/i.exec(ip);
  if (v4) return v4[1];
  if (!ip.includes(':')) return ip;
  const [head, tail = ''] = ip.toLowerCase().split('%')[0].split('::');
  const left = head ? head.split(':') : [];
  const right = ip.includes('::') && tail ? tail.split(':') : [];
  const groups = ip.includes('::') ? [...left, ...Array(Math.max(0, 8 - left.length - right.length)).fill('0'), ...right] : left;
  return `${groups.slice(0, 4).map((g) => g.replace(/^0+(?=.)/, '')).join(':')}::/64`;
}

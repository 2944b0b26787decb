/**
 * Fixed-window counter of failed authentications per client address. Only failures are counted, and only
 * failures are refused: a valid token is accepted whatever its address did. Memory is bounded: when the
 * table is full, windows that have ended go first, then the oldest running one (the nearest to its end),
 * one at a time, so a flood of new addresses never wipes every other address's count at once.
 */
export class FailureLimiter {
  // Insertion order is window-start order: a new window is always (re)inserted at the end.
  private readonly windows = new Map<string, { start: number; failures: number }>();
  constructor(
    readonly maxFailures = 10,
    readonly windowMs = 60_000,
    readonly maxEntries = 10_000,
  ) {}

  /** Addresses currently tracked. */
  get size(): number {
    return this.windows.size;
  }

  /** Seconds until this address may fail again, or 0 when it is not limited. */
  blocked(key: string, now = Date.now()): number {
    const w = this.windows.get(key);
    if (!w || now - w.start >= this.windowMs) return 0;
    return w.failures >= this.maxFailures ? Math.max(1, Math.ceil((w.start + this.windowMs - now) / 1000)) : 0;
  }

  fail(key: string, now = Date.now()): void {
    const w = this.windows.get(key);
    if (w && now - w.start < this.windowMs) {
      w.failures++;
      return;
    }
    this.windows.delete(key);
    if (this.windows.size >= this.maxEntries) this.evict(now);
    this.windows.set(key, { start: now, failures: 1 });
  }

  private evict(now: number): void {
    for (const [k, w] of this.windows) {
      if (now - w.start < this.windowMs) break;
      this.windows.delete(k);
    }
    if (this.windows.size >= this.maxEntries) {
      const oldest = this.windows.keys().next();
      if (!oldest.done) this.windows.delete(oldest.value);
    }
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

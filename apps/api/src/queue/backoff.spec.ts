import { nominalRetryDelayMs, retryAfterMs, retryDelayMs, RETRY_CAP_MS, WEBHOOK_MAX_ATTEMPTS } from './backoff';

describe('retry backoff', () => {
  it('grows fourfold from 10 s and stops at the 12 h cap (the schedule stated in backoff.ts)', () => {
    expect([1, 2, 3, 4].map(nominalRetryDelayMs)).toEqual([10_000, 40_000, 160_000, 640_000]);
    expect(nominalRetryDelayMs(20)).toBe(RETRY_CAP_MS);
  });

  it('spreads each delay over 0.75 … 1.25 of the nominal one', () => {
    expect(retryDelayMs(2, () => 0)).toBe(30_000);
    expect(retryDelayMs(2, () => 0.5)).toBe(40_000);
    expect(retryDelayMs(2, () => 0.999999)).toBeLessThanOrEqual(50_000);
  });

  it('retries a webhook over about a day: eight retries sum to between 20 h and 34 h', () => {
    const sum = (f: number) => Array.from({ length: WEBHOOK_MAX_ATTEMPTS - 1 }, (_, i) => retryDelayMs(i + 1, () => f)).reduce((a, b) => a + b, 0);
    expect(sum(0) / 3600_000).toBeGreaterThan(20);
    expect(sum(0.999999) / 3600_000).toBeLessThan(34);
  });

  it('reads Retry-After as seconds or as an HTTP-date (RFC 9110, 10.2.3)', () => {
    const now = Date.parse('2026-12-04T12:00:00Z');
    expect(retryAfterMs('120', now)).toBe(120_000);
    expect(retryAfterMs('Fri, 04 Dec 2026 12:05:00 GMT', now)).toBe(300_000);
    expect(retryAfterMs('Fri, 04 Dec 2026 11:00:00 GMT', now)).toBe(0);
    expect(retryAfterMs('soon', now)).toBeNull();
    expect(retryAfterMs(undefined, now)).toBeNull();
  });
});

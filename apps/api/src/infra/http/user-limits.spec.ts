import { TokenBuckets } from './user-limits';

describe('TokenBuckets (per-user limits)', () => {
  it('allows a minute\'s allowance at once, then one more each 60/perMinute seconds', () => {
    const b = new TokenBuckets(3);
    const t0 = 1_000_000;
    expect([b.take('u', t0), b.take('u', t0), b.take('u', t0)]).toEqual([0, 0, 0]);
    expect(b.take('u', t0)).toBe(20); // 3 a minute: the next one in 20 s
    expect(b.take('u', t0 + 19_000)).toBe(1); // a refused request costs nothing: 1 s left
    expect(b.take('u', t0 + 20_000)).toBe(0);
    expect(b.take('other', t0 + 20_000)).toBe(0); // every key has its own bucket
  });

  it('never holds more than a minute\'s allowance, however long a user was away', () => {
    const b = new TokenBuckets(2);
    expect(b.take('u', 0)).toBe(0);
    const later = 3_600_000;
    expect([b.take('u', later), b.take('u', later), b.take('u', later)]).toEqual([0, 0, 30]);
  });

  it('keeps at most maxEntries buckets, dropping the least recently used', () => {
    const b = new TokenBuckets(1, 3);
    for (const k of ['a', 'b', 'c', 'd']) b.take(k, 0);
    expect(b.size).toBe(3);
    expect(b.take('a', 0)).toBe(0); // "a" was dropped: it starts full again
    expect(b.take('d', 0)).toBe(60); // "d" was kept
  });
});

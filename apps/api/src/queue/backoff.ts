/**
 * When a failed job or webhook delivery is tried again: exponential backoff with jitter, so that many receivers
 * failing together do not all come back at the same instant (M. Brooker, "Exponential Backoff And Jitter", AWS
 * Architecture Blog, 2015; the Standard Webhooks specification asks senders to retry with exponential backoff).
 *
 * Delay before retry n (n = attempts made so far, from 1): 10 s × 4^(n−1), capped at 12 h, times a factor drawn
 * uniformly from [0.75, 1.25]. Eight retries span 10 s … 12 h, about 27 h in all (20–34 h with the jitter): a
 * receiver that is down for most of a day still gets the message.
 */
export const RETRY_BASE_MS = 10_000;
export const RETRY_FACTOR = 4;
export const RETRY_CAP_MS = 12 * 3600_000;
/** A webhook message is tried once and retried eight times */
export const WEBHOOK_MAX_ATTEMPTS = 9;

/** Nominal delay before retry n, without jitter [ms]. */
export function nominalRetryDelayMs(attempts: number): number {
  return Math.min(RETRY_CAP_MS, RETRY_BASE_MS * RETRY_FACTOR ** Math.max(0, attempts - 1));
}

/** Delay before retry n with jitter [ms]; `random` in [0, 1). */
export function retryDelayMs(attempts: number, random: () => number = Math.random): number {
  return Math.round(nominalRetryDelayMs(attempts) * (0.75 + 0.5 * random()));
}

/**
 * The delay a Retry-After header asks for [ms] (RFC 9110, section 10.2.3: delay-seconds or an HTTP-date), or null
 * when absent or unreadable. Never negative.
 */
export function retryAfterMs(header: string | undefined, nowMs: number): number | null {
  if (!header) return null;
  const v = header.trim();
  if (/^\d+$/.test(v)) return Number(v) * 1000;
  const at = Date.parse(v);
  return Number.isFinite(at) ? Math.max(0, at - nowMs) : null;
}

/**
 * The service's clock. Everything that decides by the time of day in application code (token and session expiry,
 * rate windows, time-outs) asks this clock, so that tests move time forward instead of sleeping
 * (test/support/clock.ts). Record timestamps are set by the database (`now()`), never by this clock.
 */
export interface Clock {
  /** Milliseconds since the Unix epoch */
  now(): number;
}

export const CLOCK = Symbol('CLOCK');

export const systemClock: Clock = { now: () => Date.now() };

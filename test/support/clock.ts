/** A clock a test moves forward by hand: the real time plus an offset that only grows. */
import type { Clock } from '../../apps/api/src/infra/clock';

export class TestClock implements Clock {
  private offsetMs = 0;

  now(): number {
    return Date.now() + this.offsetMs;
  }

  /** Moves this clock forward by `ms` milliseconds. */
  advance(ms: number): void {
    if (!(ms >= 0)) throw new Error('a clock only moves forward');
    this.offsetMs += ms;
  }
}

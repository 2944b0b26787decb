/**
 * CPU-heavy work in slices on the event loop: a stepwise computation (a generator that pauses between steps) runs
 * for at most sliceMs at a time, then lets the loop serve other requests (setImmediate: after pending I/O) before it
 * goes on. At most `concurrency` such computations run at once; the rest wait their turn in order. So a worst-case
 * screw search (hundreds of milliseconds of CPU) never holds /health or any other request for more than about
 * concurrency x sliceMs. The measured figures are in docs/performance.md.
 */
import { performance } from 'node:perf_hooks';

const nextTurn = () => new Promise<void>((resolve) => setImmediate(resolve));

export class SlicedRunner {
  private running = 0;
  private readonly waiting: (() => void)[] = [];

  constructor(
    readonly sliceMs = 8,
    readonly concurrency = 2,
  ) {}

  /** Computations running or waiting now. */
  get active(): number {
    return this.running + this.waiting.length;
  }

  /** Computations holding a slot now (at most `concurrency`). */
  get runningNow(): number {
    return this.running;
  }

  async run<T>(steps: Generator<void, T, void>): Promise<T> {
    if (this.running >= this.concurrency) await new Promise<void>((resolve) => this.waiting.push(resolve));
    else this.running++;
    try {
      // the first slice also waits a turn, so the request that asked is never answered inside its own I/O callback
      await nextTurn();
      let deadline = performance.now() + this.sliceMs;
      for (;;) {
        const step = steps.next();
        if (step.done) return step.value;
        if (performance.now() >= deadline) {
          await nextTurn();
          deadline = performance.now() + this.sliceMs;
        }
      }
    } finally {
      const next = this.waiting.shift();
      // the slot passes straight to the next in line (running stays counted), or is freed
      if (next) next();
      else this.running--;
    }
  }
}

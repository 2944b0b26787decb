/**
 * The one convention for seeded property tests (fast-check) and the HTTP fuzz suite.
 *
 * - Default run (`npm test`): a fixed seed, so every run replays the same cases and a failure reproduces.
 * - Full run (`npm run test:full`, LEADLINE_TEST_FULL=1): a fresh seed each run and five times the runs.
 * - LEADLINE_SEED=<n> replays one seed in either run.
 * Every failure names the seed and the command that replays it.
 */
import fc from 'fast-check';

/** True in the full run (`npm run test:full`). */
export const FULL_RUN = process.env.LEADLINE_TEST_FULL === '1';

/** The default run's seed: a fixed number, so the default run is deterministic. */
export const DEFAULT_SEED = 20261204;

function resolveSeed(): number {
  const given = process.env.LEADLINE_SEED;
  if (given !== undefined && given !== '') {
    const n = Number(given);
    if (!Number.isSafeInteger(n)) throw new Error(`LEADLINE_SEED must be an integer, not "${given}"`);
    return n;
  }
  return FULL_RUN ? Math.floor(Math.random() * 2 ** 31) : DEFAULT_SEED;
}

/** This run's seed (printed with every failure). */
export const SEED = resolveSeed();

/** How much larger the full run is than the default run (runs per property, fuzz inputs). */
export const FULL_SCALE = 5;

/** Runs for a property: `n` in the default run, FULL_SCALE times `n` in the full run. */
export function runs(n: number): number {
  return FULL_RUN ? n * FULL_SCALE : n;
}

export interface PropertyOptions {
  /** Runs in the default run (the full run multiplies them by FULL_SCALE) */
  readonly numRuns: number;
  /** Stop at the first failure instead of shrinking (for properties whose replays are expensive, e.g. HTTP) */
  readonly endOnFailure?: boolean;
}

function replayHint(): string {
  const file = expect.getState().testPath ?? '<file>';
  return `seed ${SEED} (replay: LEADLINE_SEED=${SEED} npx jest ${file.replace(`${process.cwd()}/`, '')})`;
}

function withSeed(err: unknown): Error {
  const e = err instanceof Error ? err : new Error(String(err));
  e.message = `property failed with ${replayHint()}\n${e.message}`;
  return e;
}

/** Checks a synchronous property with this run's seed. */
export function checkProperty<Ts>(property: fc.IProperty<Ts>, options: PropertyOptions): void {
  try {
    fc.assert(property, { seed: SEED, numRuns: runs(options.numRuns), endOnFailure: options.endOnFailure });
  } catch (err) {
    throw withSeed(err);
  }
}

/** Checks an asynchronous property with this run's seed. */
export async function checkAsyncProperty<Ts>(property: fc.IAsyncProperty<Ts>, options: PropertyOptions): Promise<void> {
  try {
    await fc.assert(property, { seed: SEED, numRuns: runs(options.numRuns), endOnFailure: options.endOnFailure });
  } catch (err) {
    throw withSeed(err);
  }
}

/** Draws `count` values from an arbitrary with this run's seed (for table-like tests over generated inputs). */
export function sampleWithSeed<T>(arbitrary: fc.Arbitrary<T>, count: number): T[] {
  return fc.sample(arbitrary, { seed: SEED, numRuns: runs(count) });
}

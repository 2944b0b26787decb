import { SlicedRunner } from './slices';

/** A computation of `steps` steps that records each step it takes, and how many run at that moment. */
function* counted(log: string[], name: string, steps: number, runner: SlicedRunner, seen: number[]): Generator<void, string, void> {
  for (let i = 0; i < steps; i++) {
    log.push(`${name}${i}`);
    seen.push(runner.runningNow);
    yield;
  }
  return `${name} done`;
}

describe('SlicedRunner', () => {
  it('returns what the computation returns, and lets other callbacks run between slices', async () => {
    const runner = new SlicedRunner(0, 2); // a zero-length slice: a turn of the loop after every step
    const log: string[] = [];
    const result = runner.run(counted(log, 'a', 5, runner, []));
    setImmediate(() => log.push('other'));
    expect(await result).toBe('a done');
    expect(log).toContain('other');
    expect(log.indexOf('other')).toBeLessThan(log.indexOf('a4')); // served before the computation ended
  });

  it('runs at most `concurrency` computations at once; the rest wait in order and all finish', async () => {
    const runner = new SlicedRunner(0, 2);
    const log: string[] = [];
    const seen: number[] = [];
    const all = ['a', 'b', 'c', 'd'].map((n) => runner.run(counted(log, n, 3, runner, seen)));
    expect(runner.active).toBe(4);
    expect(await Promise.all(all)).toEqual(['a done', 'b done', 'c done', 'd done']);
    expect(Math.max(...seen)).toBe(2);
    // c starts only after a or b has finished
    expect(log.indexOf('c0')).toBeGreaterThan(Math.min(log.indexOf('a2'), log.indexOf('b2')));
    expect(runner.active).toBe(0);
  });

  it('frees its slot when a computation throws', async () => {
    const runner = new SlicedRunner(0, 1);
    function* failing(): Generator<void, never, void> {
      yield;
      throw new Error('boom');
    }
    await expect(runner.run(failing())).rejects.toThrow('boom');
    expect(runner.active).toBe(0);
    expect(await runner.run(counted([], 'x', 1, runner, []))).toBe('x done');
  });
});

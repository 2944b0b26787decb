/** Number of engaged threads in the nut: too few overloads the first thread; too many add little. */
import type { Finding } from '@leadline/contracts';
import { percent, sigPair } from '../format';
import { finding, exceeds, fallsShort, type Rule, type RuleContext } from '../rule';

export const NUT_ENGAGED_THREADS_ID = 'nut-engaged-threads';
const BASIS =
  "Shigley 10th ed. Sec. 8-2 after Marshek (from memory): first, second and third threads carry 0.38, 0.25 and 0.18 of " +
  'the load, the seventh is nearly free; common practice (defaults: warn below 4 or above 10 engaged threads)';

export function nutEngagedThreads({ evaluation, thresholds }: RuleContext): Finding | null {
  const n = evaluation.geometry.engagedThreads;
  const { min, max } = thresholds.engagedThreads;
  const base = { ruleId: NUT_ENGAGED_THREADS_ID, severity: 'warning', unit: '-', subject: 'geometry.engagedThreads', basis: BASIS } as const;
  if (fallsShort(n, min)) {
    const [m, l] = sigPair(n, min, 2);
    return finding(base, {
      measured: n,
      limit: min,
      message:
        `Only ${m} threads are engaged, fewer than ${l}. The first thread carries a large share of the load (the ` +
        `thread-root checks take at least F / n_t on it), small errors of pitch and form load it more, and wear soon ` +
        `loosens the nut. Lengthen the nut.`,
    });
  }
  if (exceeds(n, max)) {
    const [m, l] = sigPair(n, max, 2);
    // A nut that is long for wear must not be told to shrink: with only `max` threads the mean pressure would rise by n / max
    const w = evaluation.wear;
    const shortenedRatio = w.pressureRatio === null ? null : (w.pressureRatio * n) / max;
    if (shortenedRatio === null || !(shortenedRatio <= thresholds.wear.warnPressureRatio)) {
      return finding(base, {
        measured: n,
        limit: max,
        message:
          `${m} threads are engaged, more than ${l}. The first few threads carry most of the load, so the extra length adds ` +
          `little strength, and the stripping and mean-pressure checks, which spread the load over all threads, read ` +
          `optimistic until the nut has run in. The length is needed for wear: ` +
          (shortenedRatio === null
            ? 'no allowable bearing pressure is known, so keep the nut length and acknowledge.'
            : `with ${l} threads the mean pressure would be ${percent(shortenedRatio)} of the allowable, so keep the nut length and acknowledge.`),
      });
    }
    return finding(base, {
      measured: n,
      limit: max,
      message:
        `${m} threads are engaged, more than ${l}. The first few threads carry most of the load, so the extra length adds ` +
        `little strength, while the stripping and mean-pressure checks spread the load over all threads and read optimistic ` +
        `until the nut has run in. The wear check would still pass with ${l} threads, so the nut could be shortened; or ` +
        `keep it for wear reserve and acknowledge.`,
    });
  }
  return null;
}

export const nutEngagedThreadsRule: Rule = {
  id: NUT_ENGAGED_THREADS_ID,
  title: 'Engaged threads in the nut',
  basis: BASIS,
  description: 'Warns when the engaged threads (nut length / pitch) are below engagedThreads.min or above engagedThreads.max.',
  check: nutEngagedThreads,
};

/** Number of engaged threads in the nut: too few overloads the first thread; too many add little. */
import type { Finding } from '@leadline/contracts';
import { sigPair } from '../format';
import { exceeds, fallsShort, type Rule, type RuleContext } from '../rule';

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
    return {
      ...base,
      measured: n,
      limit: min,
      message:
        `Only ${m} threads are engaged, fewer than ${l}. With so few threads the first one carries more than the 0.38 of ` +
        `the load the thread-root check assumes, so that check is optimistic, and wear soon loosens the nut. Lengthen the nut.`,
    };
  }
  if (exceeds(n, max)) {
    const [m, l] = sigPair(n, max, 2);
    return {
      ...base,
      measured: n,
      limit: max,
      message:
        `${m} threads are engaged, more than ${l}. The first few threads carry most of the load, so the extra length adds ` +
        `little strength, while the stripping and mean-pressure checks spread the load over all threads and read optimistic ` +
        `until the nut has run in. Shorten the nut, or keep it for wear reserve and acknowledge.`,
    };
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

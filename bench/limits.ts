/**
 * The benchmarks load the service as one user from many connections at once: the per-user limits (429 above
 * LEADLINE_<KIND>_PER_USER_PER_MINUTE) would measure the limiter, not the route, so every benchmark app raises them.
 */
export const BENCH_UNLIMITED: Record<string, string> = {
  LEADLINE_SEARCHES_PER_USER_PER_MINUTE: '100000000',
  LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE: '100000000',
  LEADLINE_SUBMISSIONS_PER_USER_PER_MINUTE: '100000000',
  LEADLINE_PDFS_PER_USER_PER_MINUTE: '100000000',
};

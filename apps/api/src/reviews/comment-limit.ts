/**
 * Comments are bounded work: at most LEADLINE_COMMENTS_PER_REVISION_PER_MINUTE on one revision and
 * LEADLINE_COMMENTS_PER_USER_PER_MINUTE by one user (over all revisions), counted from the stored events, so
 * the limit holds across restarts and instances. Over the limit: 429 with Retry-After (when the oldest counted
 * comment leaves the minute). Called with the product's chain head locked, so comments on one revision are
 * counted one after the other.
 */
import type { Queryer } from '../infra/database/database.service';
import { ProblemError } from '../infra/http/problem';

export interface CommentLimits {
  readonly perRevisionPerMinute: number;
  readonly perUserPerMinute: number;
}

export async function checkCommentRate(q: Queryer, limits: CommentLimits, revisionId: string, actorId: string): Promise<void> {
  const [row] = await q.query<{ revision_count: string; revision_wait: string | null; user_count: string; user_wait: string | null }>(
    `SELECT r.n AS revision_count, r.wait AS revision_wait, u.n AS user_count, u.wait AS user_wait
       FROM (SELECT count(*) AS n, ceil(extract(epoch FROM min(created_at) + interval '1 minute' - clock_timestamp())) AS wait
               FROM events WHERE revision_id = $1 AND type = 'comment' AND created_at > clock_timestamp() - interval '1 minute') r,
            (SELECT count(*) AS n, ceil(extract(epoch FROM min(created_at) + interval '1 minute' - clock_timestamp())) AS wait
               FROM events WHERE actor_id = $2 AND type = 'comment' AND created_at > clock_timestamp() - interval '1 minute') u`,
    [revisionId, actorId],
  );
  const wait = (w: string | null) => Math.min(60, Math.max(1, Number(w ?? 60)));
  if (Number(row.revision_count) >= limits.perRevisionPerMinute) {
    const retryAfter = wait(row.revision_wait);
    throw new ProblemError(429, 'Too many comments', `this revision already has ${limits.perRevisionPerMinute} comments in the last minute; try again in ${retryAfter} s`, { retryAfter });
  }
  if (Number(row.user_count) >= limits.perUserPerMinute) {
    const retryAfter = wait(row.user_wait);
    throw new ProblemError(429, 'Too many comments', `you have written ${limits.perUserPerMinute} comments in the last minute; try again in ${retryAfter} s`, { retryAfter });
  }
}

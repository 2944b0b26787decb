/**
 * Which stored revisions a re-judging report reads (rule-set impact, re-check): the latest of each calculation, the
 * approved ones, or both, optionally of one product. "Approved" counts only closures that index their decision event
 * (CLOSED), so a forged closure row makes nothing approved here either.
 */
import { CLOSED, SUPERSEDED } from '../reviews/reviews.service';

export type RevisionScope = 'latest' | 'approved' | 'latest-and-approved';

export const LATEST_SQL = `NOT ${SUPERSEDED('r')}`;
export const APPROVED_SQL = CLOSED('r', 'approved');

/** SQL condition on revisions aliased `r`, with its parameters. */
export function revisionScope(scope: RevisionScope, productId?: string): { where: string; params: unknown[] } {
  const where = scope === 'latest' ? LATEST_SQL : scope === 'approved' ? APPROVED_SQL : `(${LATEST_SQL} OR ${APPROVED_SQL})`;
  return productId ? { where: `${where} AND r.product_id = $1`, params: [productId] } : { where, params: [] };
}

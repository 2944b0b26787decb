/**
 * What was said on a revision, read from its events: a comment (on the revision, an input field, a finding or a
 * result: one of the revision's numeric checks, by its id), a
 * decision's or withdrawal's comment, and each acknowledgement of a warning. One reading for the revision routes
 * (`remarks`), the review page and the report's review record.
 */
import type { Actor } from '@leadline/contracts';

/** One thing said on a revision (GET /revisions/:id, remarks). */
export interface Remark {
  kind: 'comment' | 'decision' | 'acknowledgement' | 'withdrawal';
  by: Actor | null;
  at: string;
  text: string;
  target: { field: string } | { finding: string } | { result: string } | null;
}

/** A stored target as the remark's target: an input field, a finding or a result, else null (an unknown shape is not guessed). */
export function remarkTarget(t: unknown): Remark['target'] {
  if (t === null || typeof t !== 'object') return null;
  const o = t as Record<string, unknown>;
  if (typeof o.field === 'string') return { field: o.field };
  if (typeof o.finding === 'string') return { finding: o.finding };
  if (typeof o.result === 'string') return { result: o.result };
  return null;
}

/** The remarks of one event of the review workflow (none for an event that says nothing). */
export function remarksOfEvent(type: string, by: Actor | null, at: string, data: Record<string, any> | null): Remark[] {
  const d = data ?? {};
  if (type === 'comment') return typeof d.text === 'string' ? [{ kind: 'comment', by, at, text: d.text, target: remarkTarget(d.target) }] : [];
  if (type !== 'approved' && type !== 'rejected' && type !== 'withdrawn') return [];
  const out: Remark[] = [];
  const kind = type === 'withdrawn' ? 'withdrawal' : 'decision';
  if (typeof d.comment === 'string' && d.comment) out.push({ kind, by, at, text: d.comment, target: null });
  for (const a of d.acknowledgements ?? []) out.push({ kind: 'acknowledgement', by, at, text: a.comment, target: { finding: a.finding } });
  for (const c of d.comments ?? []) out.push({ kind: 'comment', by, at, text: c.text, target: remarkTarget(c.target) });
  return out;
}

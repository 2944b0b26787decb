/**
 * What was said on a revision, read from its events: a comment (on the revision, an input field, a finding or a
 * result: one of the revision's numeric checks, by its id), a
 * decision's or withdrawal's comment, and each acknowledgement of a warning. One reading for the revision routes
 * (`remarks`), the review page and the report's review record.
 */
import { designFieldLabel, type Actor } from '@leadline/contracts';
import { checkLabel } from '@leadline/rules';

/** One thing said on a revision (GET /revisions/:id, remarks). */
export interface Remark {
  kind: 'comment' | 'decision' | 'acknowledgement' | 'withdrawal';
  by: Actor | null;
  at: string;
  text: string;
  target: { field: string } | { finding: string } | { result: string } | null;
  /** What it is on, in words (remarkOn); null for the revision as a whole */
  on: string | null;
}

/**
 * What a remark is on, in words, the one wording of the review page, My work and the revision routes: an input by its
 * label (from the option the input chose, when the revision's input is given), a finding by its rule id, a result by
 * its check's label; null for the revision as a whole.
 */
export function remarkOn(target: Remark['target'], input?: unknown): string | null {
  if (target === null) return null;
  if ('field' in target) return `input “${designFieldLabel(target.field, input)}”`;
  if ('finding' in target) return `finding ${target.finding}`;
  return `result “${checkLabel(target.result)}”`;
}

/** A remark with its words (the one constructor of a Remark); `input` is the revision's input, when at hand. */
function remark(kind: Remark['kind'], by: Actor | null, at: string, text: string, target: Remark['target'], input: unknown): Remark {
  return { kind, by, at, text, target, on: remarkOn(target, input) };
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

/**
 * The remarks of one event of the review workflow (none for an event that says nothing); with the revision's input
 * an input inside a choice is worded from the option it chose.
 */
export function remarksOfEvent(type: string, by: Actor | null, at: string, data: Record<string, any> | null, input?: unknown): Remark[] {
  const d = data ?? {};
  if (type === 'comment') return typeof d.text === 'string' ? [remark('comment', by, at, d.text, remarkTarget(d.target), input)] : [];
  if (type !== 'approved' && type !== 'rejected' && type !== 'withdrawn') return [];
  const out: Remark[] = [];
  const kind = type === 'withdrawn' ? 'withdrawal' : 'decision';
  if (typeof d.comment === 'string' && d.comment) out.push(remark(kind, by, at, d.comment, null, input));
  for (const a of d.acknowledgements ?? []) out.push(remark('acknowledgement', by, at, a.comment, { finding: a.finding }, input));
  for (const c of d.comments ?? []) out.push(remark('comment', by, at, c.text, remarkTarget(c.target), input));
  return out;
}

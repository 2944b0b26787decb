/**
 * Text that can be stored and printed: no U+0000 (PostgreSQL text and jsonb cannot hold it) and no unpaired
 * UTF-16 surrogate (not a Unicode scalar value; it cannot be encoded as UTF-8). One check for every free string.
 */
import { z } from 'zod';
import type { FieldIssue } from './design-input';

const NUL = /\u0000/;
// A high surrogate not followed by a low one, or a low surrogate not preceded by a high one.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Why a string cannot be stored as text, or null when it can. */
export function textProblem(s: string): string | null {
  if (NUL.test(s)) return 'must not contain the NUL character (U+0000)';
  if (LONE_SURROGATE.test(s)) return 'must not contain an unpaired surrogate (U+D800..U+DFFF); send valid Unicode text';
  return null;
}

/** zod refinement for one text field: `z.string().superRefine(storableText)`. */
export function storableText(value: string, ctx: z.RefinementCtx): void {
  const problem = textProblem(value);
  if (problem) ctx.addIssue({ code: 'custom', message: problem });
}

/** A text field: a string that is storable (see textProblem). */
export const text = () => z.string().superRefine(storableText);

/**
 * Every string (and object key) inside a parsed JSON value that cannot be stored, with its dotted path.
 * Used where request bodies enter the service, so no field is forgotten. Stops after `limit` issues.
 */
export function findTextIssues(value: unknown, prefix = '', limit = 20): FieldIssue[] {
  const out: FieldIssue[] = [];
  const seen = new Set<object>();
  const walk = (v: unknown, path: string): void => {
    if (out.length >= limit) return;
    if (typeof v === 'string') {
      const problem = textProblem(v);
      if (problem) out.push({ path: path || '(body)', message: problem });
      return;
    }
    if (v === null || typeof v !== 'object' || seen.has(v)) return;
    seen.add(v);
    if (Array.isArray(v)) {
      v.forEach((item, i) => walk(item, path ? `${path}.${i}` : String(i)));
      return;
    }
    for (const [key, item] of Object.entries(v)) {
      const at = path ? `${path}.${key}` : key;
      const keyProblem = textProblem(key);
      if (keyProblem) {
        out.push({ path: path ? `${path}.(key)` : '(key)', message: `field name ${keyProblem}` });
        if (out.length >= limit) return;
        continue;
      }
      walk(item, at);
    }
  };
  walk(value, prefix.replace(/\.$/, ''));
  return out;
}

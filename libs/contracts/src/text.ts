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

/**
 * Bidirectional controls: the explicit embeddings, overrides and isolates (U+202A-U+202E, U+2066-U+2069) and the
 * implicit marks (U+200E, U+200F, U+061C) of Unicode Standard Annex #9, the Bidirectional Algorithm (sections 2.1-2.6).
 * In a name they reorder what a reader sees ("Trojan Source", CVE-2021-42574).
 */
const BIDI_CONTROL = /[\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/;
/**
 * Zero-width and invisible characters: zero width space, non-joiner and joiner (U+200B-U+200D), word joiner and the
 * invisible operators (U+2060-U+2064), zero width no-break space (U+FEFF); The Unicode Standard, ch. 23.2 "Layout
 * Controls". In a name or code they make two names that look the same differ (Unicode Technical Report #36, 2).
 */
const INVISIBLE = /[\u200B-\u200D\u2060-\u2064\uFEFF]/;

const codePoint = (ch: string) => `U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}`;

/** Why a string cannot be a name or code (storable, no bidirectional controls, nothing invisible), or null. */
export function nameProblem(s: string): string | null {
  const stored = textProblem(s);
  if (stored) return stored;
  const bidi = BIDI_CONTROL.exec(s);
  if (bidi) return `must not contain bidirectional control characters (found ${codePoint(bidi[0])} at position ${bidi.index + 1})`;
  const invisible = INVISIBLE.exec(s);
  if (invisible) return `must not contain zero-width or invisible characters (found ${codePoint(invisible[0])} at position ${invisible.index + 1})`;
  return null;
}

/** zod refinement for a name or code: `z.string().superRefine(displayableName)`. */
export function displayableName(value: string, ctx: z.RefinementCtx): void {
  const problem = nameProblem(value);
  if (problem) ctx.addIssue({ code: 'custom', message: problem });
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

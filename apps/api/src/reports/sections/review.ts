/**
 * Sections 7 and 8 of the report: the review record (events of this revision) and the revision history.
 */
import { designFieldLabel, type Actor, type ProductEvent } from '@leadline/contracts';
import { remarksOfEvent, remarkTarget } from '../../reviews/remarks';
import { EVENTS, formatDate, wordFor } from '@leadline/presentation';
import { SIGNATURE_METHOD_LABELS, signatureOf, type Signature } from '../../reviews/signature';
import type { EventView, SafetyFactorRow, SignatureView } from '../report-view';

// ---------------------------------------------------------------------------------------------------------
// Events and history

/** Where the review workflow puts an event's own words: a comment's text, a decision's or withdrawal's comment. */
export const TEXT_KEYS = ['text', 'comment'];

export function scalarText(value: unknown): string {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'string') return value;
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (Array.isArray(value)) return value.map(scalarText).join(', ');
  if (typeof value === 'object') {
    const o = value as Record<string, unknown>;
    return Object.entries(o)
      .map(([k, v]) => `${k}: ${scalarText(v)}`)
      .join('; ');
  }
  return String(value);
}

/** The signature block of each decision of this revision, in chain order (reviews/signature.ts). */
export function buildSignatures(events: readonly ProductEvent[]): SignatureView[] {
  return [...events]
    .sort((a, b) => a.seq - b.seq)
    .filter((ev) => ev.type === 'approved' || ev.type === 'rejected')
    .map((ev) => signatureOf(ev.data, ev.createdAt, ev.hash))
    .filter((s): s is Signature => s !== null)
    .map((s) => ({
      printedName: s.printedName, meaning: s.meaning, signedAt: s.signedAt, signedDate: s.signedAt.slice(0, 10), signedTime: s.signedAt.slice(11),
      method: SIGNATURE_METHOD_LABELS[s.method] ?? s.method, fingerprint: s.fingerprint, revisionHash: s.revisionHash,
    }));
}

/** The event data the review record prints as remarks or in the signature block, not as details. */
const SHOWN_ELSEWHERE = new Set(['text', 'comment', 'comments', 'acknowledgements', 'target', 'signature']);

/**
 * The review record's events, each remark with what it is on: an input by its label, a finding by its rule id, a
 * result by its check's label with its value and limit as the check table prints them (`results`: that table's rows).
 */
export function buildEvents(events: readonly ProductEvent[], results: readonly SafetyFactorRow[] = []): EventView[] {
  const byId = new Map(results.map((r) => [r.key, r]));
  return [...events]
    .sort((a, b) => a.seq - b.seq)
    .map((ev) => {
      const textKey = TEXT_KEYS.find((k) => typeof ev.data[k] === 'string');
      // a target of a shape the remarks do not read stays in the details, printed as stored
      const details = Object.entries(ev.data)
        .filter(([k, v]) => !SHOWN_ELSEWHERE.has(k) || (k === 'target' && v != null && remarkTarget(v) === null))
        .map(([k, v]) => `${k}: ${scalarText(v)}`);
      // what was said, each remark with what it is on (the same reading as the revision routes' `remarks`)
      const remarks = remarksOfEvent(ev.type, ev.actor, ev.createdAt, ev.data).map((r) => ({
        kind: r.kind,
        text: r.text,
        onField: r.target && 'field' in r.target ? designFieldLabel(r.target.field) : null,
        onFinding: r.target && 'finding' in r.target ? r.target.finding : null,
        onResult: r.target && 'result' in r.target ? resultOf(r.target.result, byId) : null,
      }));
      return {
        seq: ev.seq,
        type: ev.type,
        typeLabel: wordFor(EVENTS, ev.type),
        actor: actorName(ev.actor),
        at: formatDate(ev.createdAt),
        text: textKey ? (ev.data[textKey] as string) : null,
        remarks,
        signed: ev.data.signature !== undefined && ev.data.signature !== null,
        details,
      };
    });
}

/** A result a remark is on, as the check table prints it; an id the table lacks is printed as the id. */
function resultOf(id: string, byId: ReadonlyMap<string, SafetyFactorRow>): EventView['remarks'][number]['onResult'] {
  const row = byId.get(id);
  return row ? { id, label: row.label, valueText: row.valueText, limitText: row.limitText } : { id, label: id, valueText: null, limitText: null };
}

export const actorName = (a: Actor | null | undefined): string => a?.name ?? '—';


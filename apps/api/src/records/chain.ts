/**
 * Tamper evidence: each product's records (revisions and events) form one hash chain.
 * hash = SHA-256 over the RFC 8785 canonical JSON of { record, previousHash }.
 */
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';

/** SQL that renders a timestamptz exactly (microseconds, UTC) so the hashed text survives a round trip. */
export const TS_TEXT = (column: string) => `to_char(${column} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`;

/** Hash of one chain link. The record is taken in its JSON form, as stored. */
export function linkHash(record: Record<string, unknown>, previousHash: string | null): string {
  const text = canonicalize({ record: JSON.parse(JSON.stringify(record)), previousHash });
  return createHash('sha256').update(text as string, 'utf8').digest('hex');
}

/** The fields of a revision that its hash covers. */
export interface RevisionLink {
  kind: 'revision';
  id: string;
  productId: string;
  calculationId: string;
  revision: number;
  seq: number;
  note: string | null;
  input: unknown;
  normalized: unknown;
  evaluation: unknown;
  findings: unknown;
  verdict: string;
  engineVersion: string;
  ruleSetVersion: string;
  author: unknown;
  createdAt: string;
}

/** The fields of an event that its hash covers. */
export interface EventLink {
  kind: 'event';
  id: string;
  productId: string;
  seq: number;
  type: string;
  calculationId: string | null;
  revisionId: string | null;
  actor: unknown;
  data: unknown;
  createdAt: string;
}

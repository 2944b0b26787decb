/**
 * Tamper evidence: each product's records (revisions and events) form one hash chain.
 * hash = SHA-256 over the RFC 8785 canonical JSON of { record, previousHash }.
 * A revision's large parts (input, normalized input, evaluation, findings) are stored as verbatim JSON text and
 * enter its record as one SHA-256 digest of those bytes, computed before the chain is locked; a change to any
 * byte of them changes the link hash.
 */
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';

/** SQL that renders a timestamptz exactly (microseconds, UTC) so the hashed text survives a round trip. */
export const TS_TEXT = (column: string) => `to_char(${column} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`;

/** An event row of alias `e` as one JSON value (an EventRow), or null where the join found none. */
export const EVENT_ROW_JSON = (e: string) =>
  `CASE WHEN ${e}.id IS NOT NULL THEN json_build_object('id', ${e}.id, 'product_id', ${e}.product_id, 'seq', ${e}.seq, 'type', ${e}.type,
                'calculation_id', ${e}.calculation_id, 'revision_id', ${e}.revision_id, 'actor', ${e}.actor, 'data', ${e}.data,
                'created_at', ${TS_TEXT(`${e}.created_at`)}, 'hash', ${e}.hash, 'previous_hash', ${e}.previous_hash, 'link_version', ${e}.link_version,
                'token_id', ${e}.token_id, 'mac', ${e}.mac) END`;

/** Hash of one chain link. The record is taken in its JSON form, as stored. */
export function linkHash(record: Record<string, unknown>, previousHash: string | null): string {
  const text = canonicalize({ record: JSON.parse(JSON.stringify(record)), previousHash });
  return createHash('sha256').update(text as string, 'utf8').digest('hex');
}

/** The large, content-bearing parts of a revision, as the JSON texts stored verbatim in its row. */
export interface RevisionContentText {
  input: string;
  normalized: string;
  evaluation: string;
  findings: string;
}

/** SHA-256 over the stored texts of a revision's content, each length-prefixed so no boundary can shift. */
export function contentDigest(c: RevisionContentText): string {
  const h = createHash('sha256');
  for (const part of [c.input, c.normalized, c.evaluation, c.findings]) h.update(`${Buffer.byteLength(part, 'utf8')}:`).update(part, 'utf8');
  return h.digest('hex');
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
  /** contentDigest of input, normalized, evaluation and findings */
  content: string;
  verdict: string;
  engineVersion: string;
  ruleSetVersion: string;
  author: unknown;
  createdAt: string;
  /** Link format 2 and later: the format version itself and the id of the bearer token that submitted it */
  linkVersion?: number;
  tokenId?: string | null;
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
  /** Link format 2 and later: the format version itself and the id of the bearer token that acted */
  linkVersion?: number;
  tokenId?: string | null;
}

/**
 * Link format versions. 1: the original links (no token id). 2: the record names its format version and the token
 * id used, so the hash covers who acted with which credential. 3: as 2, and the link is sealed: column `mac` holds
 * HMAC-SHA256 over the link hash with the record key (record-key.ts), which the database never holds, so only the
 * service can write a link that verifies (migrations/20261204230000 says what older links still prove). Stored rows
 * keep the version they were written with (column link_version, default 1 for rows written before format 2 existed).
 */
export const LINK_VERSION = 3;

/** The first link format that carries a MAC; from the first such link on, every link of a chain must carry one. */
export const SEALED_LINK_VERSION = 3;

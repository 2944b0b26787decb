/**
 * Appends records to a product's chain inside a transaction and reads them back.
 * The chain head row is locked FOR UPDATE, so appends to one product are serialized and every link
 * names the true previous hash; heads are found by primary key, never by scanning history.
 */
import { Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import type { Actor, EventType, Finding, Verdict } from '@leadline/contracts';
import { Database, PG_NO_DATA_FOUND, pgErrorCode, type Queryer } from '../infra/database/database.service';
import { notFound } from '../infra/http/problem';
import { contentDigest, linkHash, TS_TEXT, type EventLink, type RevisionLink } from './chain';

export interface ChainCursor {
  seq: number;
  hash: string | null;
  /** Transaction time (server clock), exact text */
  now: string;
}

export interface RevisionSubmission {
  input: unknown;
  normalized: unknown;
  evaluation: unknown;
  findings: readonly Finding[];
  verdict: Verdict;
  engineVersion: string;
  ruleSetVersion: string;
  note: string | null;
}

/** A submission with its JSON texts and content digest computed ahead, outside the chain lock. */
export interface PreparedSubmission extends RevisionSubmission {
  json: { input: string; normalized: string; evaluation: string; findings: string };
  content: string;
}

export function prepareSubmission(s: RevisionSubmission): PreparedSubmission {
  const json = {
    input: JSON.stringify(s.input),
    normalized: JSON.stringify(s.normalized),
    evaluation: JSON.stringify(s.evaluation),
    findings: JSON.stringify(s.findings),
  };
  return { ...s, json, content: contentDigest(json) };
}

export interface AppendedRevision {
  id: string;
  revision: number;
  hash: string;
  previousHash: string | null;
  createdAt: string;
}

@Injectable()
export class RecordStore {
  constructor(readonly db: Database) {}

  /** Locks the product's chain head for the rest of the transaction. */
  async lockHead(q: Queryer, productId: string): Promise<ChainCursor | null> {
    const rows = await q.query<{ seq: string; hash: string; now: string }>(
      `SELECT seq, hash, ${TS_TEXT('now()')} AS now FROM chain_heads WHERE product_id = $1 FOR UPDATE`,
      [productId],
    );
    if (rows.length === 0) return null;
    return { seq: Number(rows[0].seq), hash: rows[0].hash === '' ? null : rows[0].hash, now: rows[0].now };
  }

  async saveHead(q: Queryer, productId: string, cursor: ChainCursor): Promise<void> {
    await q.query(`UPDATE chain_heads SET seq = $2, hash = $3 WHERE product_id = $1`, [productId, cursor.seq, cursor.hash ?? '']);
  }

  /** Appends one event to the chain; advances the cursor. */
  async appendEvent(
    q: Queryer,
    cursor: ChainCursor,
    e: { productId: string; type: EventType; calculationId: string | null; revisionId: string | null; actor: Actor | null; data: Record<string, unknown> },
  ): Promise<EventLink & { hash: string; previousHash: string | null }> {
    const link: EventLink = {
      kind: 'event',
      id: randomUUID(),
      productId: e.productId,
      seq: cursor.seq + 1,
      type: e.type,
      calculationId: e.calculationId,
      revisionId: e.revisionId,
      actor: e.actor,
      data: e.data,
      createdAt: cursor.now,
    };
    const hash = linkHash(link as unknown as Record<string, unknown>, cursor.hash);
    await q.query(
      `INSERT INTO events (id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, created_at, hash, previous_hash)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10::timestamptz, $11, $12)`,
      [link.id, link.productId, link.seq, link.type, link.calculationId, link.revisionId, e.actor?.id ?? null,
        e.actor ? JSON.stringify(e.actor) : null, JSON.stringify(link.data), link.createdAt, hash, cursor.hash],
    );
    const previousHash = cursor.hash;
    cursor.seq = link.seq;
    cursor.hash = hash;
    return { ...link, hash, previousHash };
  }

  /**
   * Appends the next revision of a calculation and its submission event and moves the chain head, in one
   * database call (leadline_append_revision, migrations/20261201220600): it locks the head, numbers the revision
   * after the lock and computes both link hashes exactly as chain.ts does. Works inside a transaction or alone.
   * @param cursor - when given (inside a transaction that already holds the head), it is advanced past the new links
   */
  async appendRevision(
    q: Queryer,
    productId: string,
    calculationId: string,
    s: PreparedSubmission,
    actor: Actor | null,
    cursor?: ChainCursor,
  ): Promise<AppendedRevision> {
    const id = randomUUID();
    let rows: { revision: number; seq: string; hash: string; previous_hash: string | null; created_at: string; event_hash: string }[];
    try {
      rows = await q.query(
        `SELECT * FROM leadline_append_revision($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15)`,
        [productId, calculationId, id, randomUUID(), s.note, s.json.input, s.json.normalized, s.json.evaluation, s.json.findings, s.content,
          s.verdict, s.engineVersion, s.ruleSetVersion, actor?.id ?? null, actor?.name ?? null],
      );
    } catch (err) {
      if (pgErrorCode(err) === PG_NO_DATA_FOUND) throw notFound(`product ${productId}`);
      throw err;
    }
    const r = rows[0];
    if (cursor) {
      cursor.seq = Number(r.seq);
      cursor.hash = r.event_hash;
    }
    return { id, revision: Number(r.revision), hash: r.hash, previousHash: r.previous_hash, createdAt: r.created_at };
  }

  /**
   * Recomputes a product's chain from its stored rows and names the first broken link.
   * Checks: contiguous seq from 1, each previous_hash equals the prior link's hash, each hash matches
   * its content, and the head points at the last link (a removed tail is caught too).
   */
  async verify(productId: string): Promise<ChainVerification> {
    // One snapshot for the head and every link, so concurrent appends cannot make a sound chain look broken.
    return this.db.transaction((q) => this.verifyIn(q, productId), 'repeatable read');
  }

  private async verifyIn(q: Queryer, productId: string): Promise<ChainVerification> {
    const head = await q.query<{ seq: string; hash: string }>(`SELECT seq, hash FROM chain_heads WHERE product_id = $1`, [productId]);
    if (head.length === 0) throw notFound(`product ${productId}`);
    const revisions = await q.query<RevisionRow>(
      `SELECT id, product_id, calculation_id, revision, seq, note, input::text AS input, normalized::text AS normalized,
              evaluation::text AS evaluation, findings::text AS findings, verdict,
              engine_version, rule_set_version, author, ${TS_TEXT('created_at')} AS created_at, hash, previous_hash
         FROM revisions WHERE product_id = $1`,
      [productId],
    );
    const events = await q.query<EventRow>(
      `SELECT id, product_id, seq, type, calculation_id, revision_id, actor, data, ${TS_TEXT('created_at')} AS created_at, hash, previous_hash
         FROM events WHERE product_id = $1`,
      [productId],
    );
    const links: { seq: number; kind: 'revision' | 'event'; id: string; body: Record<string, unknown>; hash: string; previousHash: string | null }[] = [
      ...revisions.map((r) => ({ seq: Number(r.seq), kind: 'revision' as const, id: r.id, body: revisionLinkOf(r) as unknown as Record<string, unknown>, hash: r.hash, previousHash: r.previous_hash })),
      ...events.map((e) => ({ seq: Number(e.seq), kind: 'event' as const, id: e.id, body: eventLinkOf(e) as unknown as Record<string, unknown>, hash: e.hash, previousHash: e.previous_hash })),
    ].sort((a, b) => a.seq - b.seq);

    let previous: string | null = null;
    for (let i = 0; i < links.length; i++) {
      const l = links[i];
      const at = { seq: l.seq, kind: l.kind, id: l.id };
      if (l.seq !== i + 1) return broken(productId, links.length, { ...at, reason: `sequence gap: expected link ${i + 1}, found ${l.seq}` });
      if (l.previousHash !== previous) return broken(productId, links.length, { ...at, reason: 'previous hash does not match the prior link' });
      if (linkHash(l.body, previous) !== l.hash) return broken(productId, links.length, { ...at, reason: 'content does not match its hash' });
      previous = l.hash;
    }
    if (Number(head[0].seq) !== links.length || (head[0].hash || null) !== previous) {
      const last = links[links.length - 1];
      return broken(productId, links.length, { seq: last?.seq ?? 0, kind: last?.kind ?? 'event', id: last?.id ?? '', reason: 'the chain head does not point at the last link (records missing)' });
    }
    return { productId, valid: true, links: links.length, headHash: previous, firstBrokenLink: null };
  }
}

export interface BrokenLink {
  seq: number;
  kind: 'revision' | 'event';
  id: string;
  reason: string;
}

export interface ChainVerification {
  productId: string;
  valid: boolean;
  links: number;
  headHash: string | null;
  firstBrokenLink: BrokenLink | null;
}

function broken(productId: string, links: number, at: BrokenLink): ChainVerification {
  return { productId, valid: false, links, headHash: null, firstBrokenLink: at };
}

/** A revision row as read for the chain: the content columns as their stored JSON text. */
export interface RevisionRow {
  id: string;
  product_id: string;
  calculation_id: string;
  revision: number;
  seq: string;
  note: string | null;
  input: string;
  normalized: string;
  evaluation: string;
  findings: string;
  verdict: string;
  engine_version: string;
  rule_set_version: string;
  author: unknown;
  created_at: string;
  hash: string;
  previous_hash: string | null;
}

export interface EventRow {
  id: string;
  product_id: string;
  seq: string;
  type: string;
  calculation_id: string | null;
  revision_id: string | null;
  actor: unknown;
  data: unknown;
  created_at: string;
  hash: string;
  previous_hash: string | null;
}

export function revisionLinkOf(r: RevisionRow): RevisionLink {
  return {
    kind: 'revision',
    id: r.id,
    productId: r.product_id,
    calculationId: r.calculation_id,
    revision: Number(r.revision),
    seq: Number(r.seq),
    note: r.note,
    content: contentDigest({ input: r.input, normalized: r.normalized, evaluation: r.evaluation, findings: r.findings }),
    verdict: r.verdict,
    engineVersion: r.engine_version,
    ruleSetVersion: r.rule_set_version,
    author: r.author ?? null,
    createdAt: r.created_at,
  };
}

export function eventLinkOf(e: EventRow): EventLink {
  return {
    kind: 'event',
    id: e.id,
    productId: e.product_id,
    seq: Number(e.seq),
    type: e.type,
    calculationId: e.calculation_id,
    revisionId: e.revision_id,
    actor: e.actor ?? null,
    data: e.data,
    createdAt: e.created_at,
  };
}

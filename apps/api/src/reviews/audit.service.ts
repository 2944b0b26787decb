/**
 * Read side of the review workflow: the review queue, a product's audit trail (paged by cursor, or downloaded
 * whole as CSV or JSON), and what changed between two revisions.
 */
import { Injectable } from '@nestjs/common';
import type { Finding } from '@leadline/contracts';
import { z } from 'zod';
import { Database } from '../infra/database/database.service';
import { notFound, validate } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { TS_TEXT } from '../records/chain';
import { CLOSED } from './reviews.service';

export const queueQuerySchema = z.object({
  productId: z.string().uuid().optional(),
  calculationId: z.string().uuid().optional(),
  verdict: z.enum(['blocked', 'needs-acknowledgement', 'clear']).optional(),
  authorId: z.string().uuid().optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});

export const auditQuerySchema = z.object({
  after: z.coerce.number().int().min(0).default(0).describe('cursor: the last seq of the previous page'),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  format: z.enum(['json', 'csv']).optional().describe('download the whole trail as a file'),
});

export interface AuditEntry {
  seq: number;
  kind: 'revision' | 'event';
  type: string;
  time: string;
  actor: { id: string; name: string } | null;
  calculationId: string | null;
  revisionId: string | null;
  revision: number | null;
  verdict: string | null;
  findings: { blocking: number; warning: number; info: number } | null;
  summary: string;
  hash: string;
  previousHash: string | null;
}

function summarize(findings: Finding[] | null) {
  if (!findings) return null;
  const n = { blocking: 0, warning: 0, info: 0 };
  for (const f of findings) n[f.severity]++;
  return n;
}

function describe(type: string, data: Record<string, any>, revision: number | null): string {
  switch (type) {
    case 'revision':
      return `revision ${revision} recorded${data?.note ? `: ${data.note}` : ''}`;
    case 'product-registered':
      return `product ${data.code} registered: ${data.name}`;
    case 'calculation-opened':
      return `calculation opened: ${data.title}`;
    case 'revision-submitted':
      return `revision ${data.revision} submitted for review (${data.verdict})`;
    case 'comment':
      return `comment on revision ${data.revision}${data.target ? ` (${data.target.field ?? data.target.finding ?? `result ${data.target.result}`})` : ''}: ${data.text}`;
    case 'approved':
      return `revision ${data.revision} approved${data.acknowledgements?.length ? ` acknowledging ${data.acknowledgements.map((a: { finding: string }) => a.finding).join(', ')}` : ''}${data.comment ? `: ${data.comment}` : ''}`;
    case 'rejected':
      return `revision ${data.revision} rejected: ${data.comment}`;
    case 'withdrawn':
      return `revision ${data.revision} withdrawn by its author${data.comment ? `: ${data.comment}` : ''}`;
    default:
      return type;
  }
}

@Injectable()
export class AuditService {
  constructor(private readonly db: Database) {}

  /**
   * Revisions awaiting review, oldest first. The access path is the latest revision of each calculation (one
   * backward probe of (calculation_id, revision) per calculation), so the cost follows the number of calculations,
   * never their superseded history. The latest revision is by definition the one that SUPERSEDED (reviews.service)
   * does not hold for; testing that predicate again here let the planner hash-join every revision of every
   * calculation (a cost that grew with superseded history again), so it is not repeated.
   */
  async queue(query: unknown) {
    const q = validate(queueQuerySchema, query);
    const params: unknown[] = [];
    // CLOSED: only a closure that indexes a real decision or withdrawal event takes a revision out of the queue
    const where: string[] = [`NOT ${CLOSED('r')}`];
    const add = (sql: string, value: unknown) => {
      params.push(value);
      where.push(sql.replace('?', `$${params.length}`));
    };
    if (q.productId) add('c.product_id = ?', q.productId);
    if (q.calculationId) add('c.id = ?', q.calculationId);
    if (q.verdict) add('r.verdict = ?', q.verdict);
    if (q.authorId) add('r.author_id = ?', q.authorId);
    params.push(q.limit);
    const rows = await this.db.query<Record<string, any>>(
      `SELECT r.id, r.product_id, p.code AS product_code, p.name AS product_name, r.calculation_id, c.title, r.revision, r.verdict,
              r.author, r.findings, ${TS_TEXT('r.created_at')} AS created_at
         FROM calculations c
        CROSS JOIN LATERAL (
              SELECT l.id, l.product_id, l.calculation_id, l.revision, l.verdict, l.author, l.author_id, l.findings, l.created_at, l.seq
                FROM revisions l WHERE l.calculation_id = c.id ORDER BY l.revision DESC LIMIT 1) r
         JOIN products p ON p.id = r.product_id
        WHERE ${where.join(' AND ')}
        ORDER BY r.created_at, r.seq
        LIMIT $${params.length}`,
      params,
    );
    return {
      items: rows.map((r) => ({
        revisionId: r.id, productId: r.product_id, productCode: r.product_code, productName: r.product_name, calculationId: r.calculation_id,
        title: r.title, revision: Number(r.revision), verdict: r.verdict, author: r.author, findings: summarize(r.findings), submittedAt: r.created_at,
        state: 'submitted',
      })),
    };
  }

  /** One page of the trail after the cursor, oldest first. */
  async trail(productId: string, after: number, limit: number): Promise<{ items: AuditEntry[]; nextCursor: number | null }> {
    checkUuid(productId, 'product');
    const exists = await this.db.query(`SELECT 1 FROM products WHERE id = $1`, [productId]);
    if (exists.length === 0) throw notFound(`product ${productId}`);
    const rows = await this.page(productId, after, limit + 1);
    const items = rows.slice(0, limit);
    return { items, nextCursor: rows.length > limit ? items[items.length - 1].seq : null };
  }

  /**
   * Up to `limit` entries with after < seq <= upTo. ORDER BY seq LIMIT inside each branch lets PostgreSQL read
   * each table's (product_id, seq) index from the cursor and stop after `limit` rows, so a page costs the same at
   * any depth and any trail length (without it, every row after the cursor is appended and sorted).
   */
  private async page(productId: string, after: number, limit: number, upTo: number | null = null): Promise<AuditEntry[]> {
    const rows = await this.db.query<Record<string, any>>(
      auditPageSql(upTo !== null),
      upTo === null ? [productId, after, limit] : [productId, after, limit, upTo],
    );
    return rows.map((r): AuditEntry => {
      const revision = r.revision === null ? (r.data?.revision ?? null) : Number(r.revision);
      return {
        seq: Number(r.seq), kind: r.kind, type: r.type, time: r.time, actor: r.actor ?? null, calculationId: r.calculation_id,
        revisionId: r.revision_id, revision, verdict: r.verdict ?? r.data?.verdict ?? null, findings: summarize(r.findings),
        summary: describe(r.type, r.data ?? {}, revision), hash: r.hash, previousHash: r.previous_hash,
      };
    });
  }

  /**
   * The whole trail for downloads, read in keyset batches up to the chain head as it stood when the download
   * began (a consistent end; appends are serialized by the head, so no lower seq commits later). Each batch is
   * one flat page query; on the embedded database no connection is held between batches.
   */
  async *entries(productId: string, batch = 1000): AsyncGenerator<AuditEntry[]> {
    const [head] = await this.db.query<{ seq: string }>(`SELECT seq FROM chain_heads WHERE product_id = $1`, [checkUuid(productId, 'product')]);
    if (!head) throw notFound(`product ${productId}`);
    const upTo = Number(head.seq);
    let after = 0;
    while (after < upTo) {
      const rows = await this.page(productId, after, batch, upTo);
      if (rows.length === 0) return;
      yield rows;
      after = rows[rows.length - 1].seq;
    }
  }

  /** The whole trail in memory (for small trails; downloads stream through entries()). */
  async fullTrail(productId: string): Promise<AuditEntry[]> {
    const all: AuditEntry[] = [];
    for await (const rows of this.entries(productId)) all.push(...rows);
    return all;
  }

  /** The whole trail as CSV text chunks, written as they are read (constant memory). */
  async *csv(productId: string): AsyncGenerator<string> {
    yield AUDIT_CSV_COLUMNS.join(',') + '\r\n';
    for await (const rows of this.entries(productId)) yield rows.map(AuditService.csvLine).join('');
  }

  /** The whole trail as one JSON document `{ product, entries }`, in chunks as read. */
  async *json(productId: string, product: unknown): AsyncGenerator<string> {
    yield `{"product":${JSON.stringify(product)},"entries":[`;
    let first = true;
    for await (const rows of this.entries(productId)) {
      yield (first ? '' : ',') + rows.map((e) => JSON.stringify(e)).join(',');
      first = false;
    }
    yield ']}';
  }

  /** One CSV line (CRLF-terminated) of an entry. */
  static csvLine(e: AuditEntry): string {
    return [e.seq, e.time, e.kind, e.type, e.actor?.name ?? '', e.calculationId, e.revisionId, e.revision, e.verdict, e.findings?.blocking, e.findings?.warning,
      e.findings?.info, e.summary, e.hash, e.previousHash].map(csvCell).join(',') + '\r\n';
  }

  static toCsv(entries: AuditEntry[]): string {
    return AUDIT_CSV_COLUMNS.join(',') + '\r\n' + entries.map(AuditService.csvLine).join('');
  }
}

/**
 * The audit page query: $1 product, $2 cursor (seq after), $3 limit, $4 (when bounded) the last seq to include.
 * Exported so a test can check its plan.
 */
export function auditPageSql(bounded: boolean): string {
  const bound = bounded ? 'AND seq <= $4' : '';
  return `SELECT * FROM (
         (SELECT seq, 'revision' AS kind, 'revision' AS type, ${TS_TEXT('created_at')} AS time, author AS actor, calculation_id, id AS revision_id,
                 revision, verdict, findings, jsonb_build_object('note', note) AS data, hash, previous_hash
            FROM revisions WHERE product_id = $1 AND seq > $2 ${bound} ORDER BY seq LIMIT $3)
         UNION ALL
         (SELECT seq, 'event', type, ${TS_TEXT('created_at')}, actor, calculation_id, revision_id, NULL, NULL, NULL, data, hash, previous_hash
            FROM events WHERE product_id = $1 AND seq > $2 ${bound} ORDER BY seq LIMIT $3)
       ) t ORDER BY seq LIMIT $3`;
}

export const AUDIT_CSV_COLUMNS = ['seq', 'time', 'kind', 'type', 'actor', 'calculation_id', 'revision_id', 'revision', 'verdict', 'blocking', 'warning', 'info', 'summary', 'hash', 'previous_hash'];

/**
 * One CSV cell (RFC 4180 quoting). A text beginning with = + - @, tab or CR would be read by a spreadsheet as a
 * formula (CSV injection), so it is prefixed with an apostrophe, the OWASP-recommended neutralisation, and quoted.
 */
export function csvCell(v: unknown): string {
  let s = v === null || v === undefined ? '' : String(v);
  const formula = typeof v === 'string' && /^[=+\-@\t\r]/.test(s);
  if (formula) s = `'${s}`;
  return formula || /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

type Leaf = string | number | boolean | null;

/** Flattens JSON into dotted paths of leaves. */
export function flatten(value: unknown, prefix = '', out: Record<string, Leaf> = {}): Record<string, Leaf> {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    for (const [k, v] of Object.entries(value)) flatten(v, prefix ? `${prefix}.${k}` : k, out);
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => flatten(v, `${prefix}.${i}`, out));
  } else out[prefix] = (value ?? null) as Leaf;
  return out;
}

export function changes(a: Record<string, Leaf>, b: Record<string, Leaf>) {
  const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
  return keys
    .filter((k) => a[k] !== b[k])
    .map((k) => {
      const from = k in a ? a[k] : null;
      const to = k in b ? b[k] : null;
      const relative = typeof from === 'number' && typeof to === 'number' && from !== 0 ? (to - from) / Math.abs(from) : null;
      return { path: k, from, to, ...(relative !== null ? { relativeChange: relative } : {}) };
    });
}

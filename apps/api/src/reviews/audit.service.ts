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
import { SUPERSEDED } from './reviews.service';

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
      return `comment on revision ${data.revision}${data.target ? ` (${data.target.field ?? data.target.finding})` : ''}: ${data.text}`;
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

  async queue(query: unknown) {
    const q = validate(queueQuerySchema, query);
    const params: unknown[] = [];
    const where: string[] = [
      'NOT EXISTS (SELECT 1 FROM revision_closures x WHERE x.revision_id = r.id)',
      `NOT ${SUPERSEDED('r')}`,
    ];
    const add = (sql: string, value: unknown) => {
      params.push(value);
      where.push(sql.replace('?', `$${params.length}`));
    };
    if (q.productId) add('r.product_id = ?', q.productId);
    if (q.calculationId) add('r.calculation_id = ?', q.calculationId);
    if (q.verdict) add('r.verdict = ?', q.verdict);
    if (q.authorId) add('r.author_id = ?', q.authorId);
    params.push(q.limit);
    const rows = await this.db.query<Record<string, any>>(
      `SELECT r.id, r.product_id, p.code AS product_code, p.name AS product_name, r.calculation_id, c.title, r.revision, r.verdict,
              r.author, r.findings, ${TS_TEXT('r.created_at')} AS created_at
         FROM revisions r JOIN calculations c ON c.id = r.calculation_id JOIN products p ON p.id = r.product_id
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
    const rows = await this.db.query<Record<string, any>>(
      `SELECT * FROM (
         SELECT seq, 'revision' AS kind, 'revision' AS type, ${TS_TEXT('created_at')} AS time, author AS actor, calculation_id, id AS revision_id,
                revision, verdict, findings, jsonb_build_object('note', note) AS data, hash, previous_hash
           FROM revisions WHERE product_id = $1 AND seq > $2
         UNION ALL
         SELECT seq, 'event', type, ${TS_TEXT('created_at')}, actor, calculation_id, revision_id, NULL, NULL, NULL, data, hash, previous_hash
           FROM events WHERE product_id = $1 AND seq > $2
       ) t ORDER BY seq LIMIT $3`,
      [productId, after, limit + 1],
    );
    const page = rows.slice(0, limit);
    const items = page.map((r): AuditEntry => {
      const revision = r.revision === null ? (r.data?.revision ?? null) : Number(r.revision);
      return {
        seq: Number(r.seq), kind: r.kind, type: r.type, time: r.time, actor: r.actor ?? null, calculationId: r.calculation_id,
        revisionId: r.revision_id, revision, verdict: r.verdict ?? r.data?.verdict ?? null, findings: summarize(r.findings),
        summary: describe(r.type, r.data ?? {}, revision), hash: r.hash, previousHash: r.previous_hash,
      };
    });
    return { items, nextCursor: rows.length > limit ? items[items.length - 1].seq : null };
  }

  /** The whole trail, for downloads. */
  async fullTrail(productId: string): Promise<AuditEntry[]> {
    const all: AuditEntry[] = [];
    let after = 0;
    for (;;) {
      const page = await this.trail(productId, after, 500);
      all.push(...page.items);
      if (page.nextCursor === null) return all;
      after = page.nextCursor;
    }
  }

  static toCsv(entries: AuditEntry[]): string {
    const cols = ['seq', 'time', 'kind', 'type', 'actor', 'calculation_id', 'revision_id', 'revision', 'verdict', 'blocking', 'warning', 'info', 'summary', 'hash', 'previous_hash'];
    const esc = (v: unknown) => {
      const s = v === null || v === undefined ? '' : String(v);
      return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
    };
    const lines = entries.map((e) =>
      [e.seq, e.time, e.kind, e.type, e.actor?.name ?? '', e.calculationId, e.revisionId, e.revision, e.verdict, e.findings?.blocking, e.findings?.warning,
        e.findings?.info, e.summary, e.hash, e.previousHash].map(esc).join(','),
    );
    return [cols.join(','), ...lines].join('\r\n') + '\r\n';
  }
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

import { Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import type { Acting } from '../records/record-store';
import { z } from 'zod';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode } from '../infra/database/database.service';
import { ProblemError, notFound, validate } from '../infra/http/problem';
import { EVENT_ROW_JSON, TS_TEXT } from '../records/chain';
import { RecordStore, type EventRow } from '../records/record-store';
import { displayableName, type ReviewState } from '@leadline/contracts';
import { STATES } from '@leadline/presentation';

export const createProductSchema = z.strictObject({
  code: z.string().min(1).max(60).superRefine(displayableName).regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, 'letters, digits, ".", "_" and "-" only'),
  name: z.string().min(1).max(200).superRefine(displayableName),
  description: z.string().max(4000).optional(),
});

export interface Product {
  id: string;
  code: string;
  name: string;
  description: string | null;
  createdAt: string;
}

const PRODUCT_COLUMNS = `id, code, name, description, ${TS_TEXT('created_at')} AS "createdAt"`;

@Injectable()
export class ProductsService {
  constructor(
    private readonly db: Database,
    private readonly records: RecordStore,
  ) {}

  async create(body: unknown, actor: Acting | null): Promise<Product> {
    const input = validate(createProductSchema, body);
    const id = randomUUID();
    try {
      // the product row, its chain head and its first link, in one record function (leadline_register_product)
      await this.db.transaction((q) => this.records.registerProduct(q, { id, code: input.code, name: input.name, description: input.description ?? null }, actor));
    } catch (err) {
      if (pgErrorCode(err) === PG_UNIQUE_VIOLATION) {
        const [held] = await this.db.query<{ code: string }>(`SELECT code FROM products WHERE lower(code) = lower($1) ORDER BY created_at LIMIT 1`, [input.code]);
        const same = !held || held.code === input.code;
        throw new ProblemError(409, 'Product code exists', same
          ? `a product with code "${input.code}" already exists`
          : `a product with code "${held.code}" already exists (codes are unique regardless of case)`, { errors: [{ path: 'code', message: 'already in use' }] });
      }
      throw err;
    }
    return this.get(id);
  }

  async get(id: string): Promise<Product> {
    const rows = await this.db.query<Product>(`SELECT ${PRODUCT_COLUMNS} FROM products WHERE id = $1`, [checkUuid(id, 'product')]);
    if (rows.length === 0) throw notFound(`product ${id}`);
    return rows[0];
  }

  /**
   * One page of products, oldest first. `q` finds a product by its code or name, the title of one of its
   * calculations, the thread size or the author of one of its revisions (case-insensitive, anywhere in the text;
   * LIKE wildcards in q are taken literally; a size also matches without its spaces: "Tr55" finds "Tr 55x9").
   * `state` keeps the products with a calculation whose latest revision is in that review state, derived as
   * everywhere else: a closure counts only through its decision or withdrawal event at or below the chain head whose
   * link verifies (RecordStore.sealedEvent); otherwise the latest revision awaits review.
   */
  async list(limit: number, offset: number, q?: string, state?: ListedState): Promise<ProductPage> {
    const escaped = q ? q.replace(/[\\%_]/g, (c) => '\\' + c) : null;
    const pattern = escaped === null ? null : `%${escaped}%`;
    const compact = escaped === null ? null : `%${escaped.replace(/\s+/g, '')}%`;
    const matched = `SELECT p.id, p.created_at, p.code,
              p.code ILIKE $1 AS by_code, p.name ILIKE $1 AS by_name,
              EXISTS (SELECT 1 FROM calculations c WHERE c.product_id = p.id AND c.title ILIKE $1) AS by_calculation,
              EXISTS (SELECT 1 FROM revisions r WHERE r.product_id = p.id
                        AND replace(r.input->'thread'->>'size', ' ', '') ILIKE $2) AS by_size,
              EXISTS (SELECT 1 FROM revisions r WHERE r.product_id = p.id AND r.author->>'name' ILIKE $1) AS by_author
         FROM products p`;
    const where = `WHERE $1::text IS NULL OR by_code OR by_name OR by_calculation OR by_size OR by_author`;
    type Row = { id: string; by_code: boolean; by_name: boolean; by_calculation: boolean; by_size: boolean; by_author: boolean };
    let rows: Row[];
    let total: number;
    if (!state) {
      const [page, count] = await Promise.all([
        this.db.query<Row>(`SELECT * FROM (${matched}) m ${where} ORDER BY created_at, code LIMIT $3 OFFSET $4`, [pattern, compact, limit, offset]),
        this.db.query<{ n: string }>(`SELECT count(*) AS n FROM (${matched}) m ${where}`, [pattern, compact]),
      ]);
      rows = page;
      total = Number(count[0].n);
    } else {
      const all = await this.db.query<Row>(`SELECT * FROM (${matched}) m ${where} ORDER BY created_at, code`, [pattern, compact]);
      const inState = await this.productsInState(all.map((r) => r.id), state);
      const kept = all.filter((r) => inState.has(r.id));
      rows = kept.slice(offset, offset + limit);
      total = kept.length;
    }
    const ids = rows.map((r) => r.id);
    const products = ids.length === 0 ? [] : await this.db.query<Product>(`SELECT ${PRODUCT_COLUMNS} FROM products WHERE id = ANY($1::uuid[])`, [ids]);
    const byId = new Map(products.map((p) => [p.id, p]));
    const items = rows.map((r): ListedProduct => {
      const matchedBy: MatchField[] = [];
      if (q) {
        if (r.by_code) matchedBy.push('code');
        if (r.by_name) matchedBy.push('name');
        if (r.by_calculation) matchedBy.push('calculation');
        if (r.by_size) matchedBy.push('size');
        if (r.by_author) matchedBy.push('author');
      }
      return { ...byId.get(r.id)!, matchedBy };
    });
    return { items, total, limit, offset };
  }

  /** The products (of `ids`) with a calculation whose latest revision is in `state`. */
  private async productsInState(ids: readonly string[], state: ListedState): Promise<Set<string>> {
    if (ids.length === 0) return new Set();
    const latest = await this.db.query<{ product_id: string; closure: string | null; event: EventRow | null }>(
      `SELECT DISTINCT ON (r.calculation_id) r.product_id, c.kind AS closure,
              ${EVENT_ROW_JSON('e')} AS event
         FROM revisions r
         LEFT JOIN revision_closures c ON c.revision_id = r.id
         LEFT JOIN events e ON e.id = c.event_id AND e.revision_id = r.id AND e.type = c.kind
              AND e.seq <= (SELECT h.seq FROM chain_heads h WHERE h.product_id = e.product_id)
        WHERE r.product_id = ANY($1::uuid[])
        ORDER BY r.calculation_id, r.revision DESC`,
      [ids],
    );
    const found = new Set<string>();
    for (const r of latest) {
      const event = typeof r.event === 'string' ? (JSON.parse(r.event) as EventRow) : r.event;
      const latestState = r.closure && event && this.records.sealedEvent(event) ? r.closure : 'submitted';
      if (latestState === state) found.add(r.product_id);
    }
    return found;
  }
}

/** Which of a product's texts a search matched. */
export type MatchField = 'code' | 'name' | 'calculation' | 'size' | 'author';
export interface ListedProduct extends Product {
  /** The fields `q` matched (empty without q) */
  matchedBy: MatchField[];
}
export interface ProductPage {
  items: ListedProduct[];
  total: number;
  limit: number;
  offset: number;
}

/** Review states a calculation's latest revision can be in (never superseded: nothing newer exists), named as the pages name states. */
export const LISTED_STATES = Object.keys(STATES).filter((s) => s !== 'superseded') as [ListedState, ...ListedState[]];
export type ListedState = Exclude<ReviewState, 'superseded'>;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Route ids are UUIDs; anything else is simply not found (never a database error). */
export function checkUuid(id: string, what: string): string {
  if (!UUID.test(id)) throw notFound(`${what} ${id}`);
  return id;
}

export const pageSchema = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

/** GET /products: a page, optionally only the products a search finds. */
export const productListSchema = pageSchema.extend({
  q: z.string().trim().max(200).optional()
    .describe('search: the code, the name, a calculation title, a thread size (spaces optional) or a revision author contains this text (any case)'),
  state: z.enum(LISTED_STATES, { error: `a state is one of ${LISTED_STATES.join(', ')}` }).optional()
    .describe('only products with a calculation whose latest revision is in this review state'),
});

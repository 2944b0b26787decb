import { Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import type { Acting } from '../records/record-store';
import { z } from 'zod';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode } from '../infra/database/database.service';
import { ProblemError, notFound, validate } from '../infra/http/problem';
import { TS_TEXT } from '../records/chain';
import { RecordStore } from '../records/record-store';
import { displayableName } from '@leadline/contracts';

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

  /** One page of products, oldest first. */
  async list(limit: number, offset: number, q?: string): Promise<{ items: Product[]; total: number; limit: number; offset: number }> {
    // ?q= matches code or name, case-insensitively, anywhere in the text (LIKE wildcards in q are taken literally)
    const pattern = q ? `%${q.replace(/[\\%_]/g, (c) => '\\' + c)}%` : null;
    const where = pattern ? `WHERE code ILIKE $1 OR name ILIKE $1` : '';
    const args = pattern ? [pattern] : [];
    const [items, total] = await Promise.all([
      this.db.query<Product>(`SELECT ${PRODUCT_COLUMNS} FROM products ${where} ORDER BY created_at, code LIMIT $${args.length + 1} OFFSET $${args.length + 2}`, [...args, limit, offset]),
      this.db.query<{ n: string }>(`SELECT count(*) AS n FROM products ${where}`, args),
    ]);
    return { items, total: Number(total[0].n), limit, offset };
  }
}

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

/** GET /products: a page, optionally only products whose code or name contains q. */
export const productListSchema = pageSchema.extend({ q: z.string().trim().max(200).optional().describe('search: code or name contains this text (any case)') });

/**
 * Baseline routes for the benchmark only, mounted in the same app and adapter as the real routes:
 *   GET  /bench/hello          hello-world, public (reference)
 *   POST /bench/io-floor       public: parses the body, answers a fixed pre-serialized body of the Evaluation's size (reference)
 *   POST /bench/io-floor-auth  the fair floor of POST /evaluations: the same authentication (bearer token through the
 *                              global guard), the same body parsed, and a fresh object of the Evaluation's size serialized
 *   POST /bench/insert         the fair floor of a durable submission: the same authentication and body, then one bare
 *                              INSERT of a revision-sized row (the same stored bytes: input, normalized, evaluation,
 *                              findings as json, and the small columns) on the same database pool
 */
import { Body, Controller, Get, HttpCode, Module, Post, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { Public } from '../apps/api/src/identities/auth.guard';
import { Database } from '../apps/api/src/infra/database/database.service';

export const BENCH_ROWS_DDL = `CREATE TABLE IF NOT EXISTS bench_rows (
  id bigserial PRIMARY KEY, product_id uuid, note text, input json NOT NULL, normalized json NOT NULL, evaluation json NOT NULL,
  findings json NOT NULL, content text, verdict text, engine_version text, rule_set_version text, author jsonb,
  created_at timestamptz NOT NULL DEFAULT clock_timestamp())`;

/** The stored bytes of one revision, as the benchmark's submission stores them. */
export interface BenchRow {
  note: string | null;
  json: { input: string; normalized: string; evaluation: string; findings: string };
  content: string;
  verdict: string;
  engineVersion: string;
  ruleSetVersion: string;
}

let row: BenchRow | null = null;
let products: string[] = [];
let k = 0;
export function setBenchRow(r: BenchRow, productIds: string[]): void {
  row = r;
  products = productIds;
}

/** The fixed response for the public floor, and the template whose fresh copies the authenticated floor serializes. */
let fixedResponse = JSON.stringify({ filler: 'x'.repeat(3000) });
let template: Record<string, unknown> = JSON.parse(fixedResponse);
export function setFixedResponse(json: string): void {
  fixedResponse = json;
  template = JSON.parse(json);
}

/** A deep copy built field by field, as a handler builds its answer (not a cached string). */
function fresh(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(fresh);
  if (v !== null && typeof v === 'object') {
    const out: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(v)) out[key] = fresh(value);
    return out;
  }
  return v;
}

@Controller('bench')
class BaselineController {
  constructor(private readonly db: Database) {}

  @Get('hello')
  @Public()
  hello() {
    return { hello: 'world' };
  }

  /** Public: reads and parses a JSON body and answers a fixed body (reference row only: it skips authentication). */
  @Post('io-floor')
  @Public()
  @HttpCode(200)
  ioFloor(@Body() _body: unknown, @Res({ passthrough: true }) reply: FastifyReply) {
    reply.header('content-type', 'application/json; charset=utf-8');
    return fixedResponse;
  }

  /** Authenticated like POST /evaluations: parses the body, builds and serializes a fresh Evaluation-sized object. */
  @Post('io-floor-auth')
  @HttpCode(200)
  ioFloorAuth(@Body() _body: unknown) {
    return fresh(template);
  }

  /** Authenticated like a submission: one bare INSERT of a revision-sized row, spread over the benchmark's products. */
  @Post('insert')
  @HttpCode(201)
  async insert(@Body() _body: unknown) {
    if (!row) throw new Error('setBenchRow first');
    const r = row;
    await this.db.query(
      `INSERT INTO bench_rows (product_id, note, input, normalized, evaluation, findings, content, verdict, engine_version, rule_set_version, author)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11)`,
      [products.length ? products[k++ % products.length] : null, r.note, r.json.input, r.json.normalized, r.json.evaluation, r.json.findings, r.content,
        r.verdict, r.engineVersion, r.ruleSetVersion, JSON.stringify({ id: '00000000-0000-0000-0000-000000000000', name: 'Benchmark author' })],
    );
    return { ok: true };
  }
}

@Module({ controllers: [BaselineController] })
export class BaselineModule {}

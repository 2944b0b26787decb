/**
 * Baseline routes for the benchmark only, mounted in the same app and adapter as the real routes:
 * a hello-world GET, a POST that parses the body and answers a fixed evaluation-sized body (the I/O floor),
 * and a bare single INSERT of a 2 KB jsonb row on the same database pool.
 */
import { Body, Controller, Get, HttpCode, Module, Post, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { Public } from '../apps/api/src/identities/auth.guard';
import { Database } from '../apps/api/src/infra/database/database.service';

const ROW = JSON.stringify({ payload: 'x'.repeat(2000) });

/** A fixed response the size of an Evaluation without its trace, for the I/O floor of a POST of that size. */
let fixedResponse = JSON.stringify({ filler: 'x'.repeat(3000) });
export function setFixedResponse(json: string): void {
  fixedResponse = json;
}

/** Public: a bare baseline pays no authentication (the measured routes do). */
@Controller('bench')
@Public()
class BaselineController {
  constructor(private readonly db: Database) {}

  @Get('hello')
  hello() {
    return { hello: 'world' };
  }

  /** Reads and parses a JSON body and answers a fixed body: the HTTP and JSON cost of an evaluation with no work. */
  @Post('io-floor')
  @HttpCode(200)
  ioFloor(@Body() _body: unknown, @Res({ passthrough: true }) reply: FastifyReply) {
    reply.header('content-type', 'application/json; charset=utf-8');
    return fixedResponse;
  }

  @Post('insert')
  @HttpCode(201)
  async insert(@Body() _body: unknown) {
    await this.db.query(`INSERT INTO bench_rows (body) VALUES ($1)`, [ROW]);
    return { ok: true };
  }
}

@Module({ controllers: [BaselineController] })
export class BaselineModule {}

/**
 * Baseline routes for the benchmark only, mounted in the same app and adapter as the real routes:
 * a hello-world GET and a bare single INSERT of a 2 KB jsonb row on the same database pool.
 */
import { Body, Controller, Get, HttpCode, Module, Post } from '@nestjs/common';
import { Public } from '../apps/api/src/identities/auth.guard';
import { Database } from '../apps/api/src/infra/database/database.service';

const ROW = JSON.stringify({ payload: 'x'.repeat(2000) });

/** Public: a bare baseline pays no authentication (the measured routes do). */
@Controller('bench')
@Public()
class BaselineController {
  constructor(private readonly db: Database) {}

  @Get('hello')
  hello() {
    return { hello: 'world' };
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

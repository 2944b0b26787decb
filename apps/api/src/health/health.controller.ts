import { Controller, Get, HttpException } from '@nestjs/common';
import { Public } from '../identities/auth.guard';
import { Database } from '../infra/database/database.service';

@Controller('health')
export class HealthController {
  constructor(private readonly db: Database) {}

  /** Healthy when the database answers. */
  @Get()
  @Public()
  async health() {
    try {
      await this.db.query('SELECT 1');
      return { status: 'ok', database: this.db.embedded ? 'embedded' : 'postgresql' };
    } catch {
      throw new HttpException({ status: 'unavailable', message: 'database unreachable' }, 503);
    }
  }
}

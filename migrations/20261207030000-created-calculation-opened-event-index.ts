import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The event that opened a calculation, by the calculation (its first author, read by every submission's owner check:
 * calculations.service.ts OWNER_OF). Without it the planner, estimating from a table where most events belong to
 * few calculations, read every event of the product's chain for each submission (a sequential scan per submission,
 * measured by `bench/growth.ts`: 124 submissions a second at 1k revisions, 16 at 100k); with it the read is one
 * index entry whatever the chain's length.
 */
export class CreatedCalculationOpenedEventIndex20261207030000 implements MigrationInterface {
  name = 'CreatedCalculationOpenedEventIndex20261207030000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX events_opened_idx ON events (calculation_id, seq) WHERE type = 'calculation-opened'`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX events_opened_idx`);
  }
}

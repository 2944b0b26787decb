import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Who owns a calculation is read on every submission (leadline_append_revision) from its latest
 * calculation-reassigned event. Through events_calculation_idx that read walked back over every event of the
 * calculation (one per revision) to find there was none, so each submission cost its calculation's history:
 * a partial index holds the reassignments alone.
 */
export class CreatedReassignmentIndex20261202120000 implements MigrationInterface {
  name = 'CreatedReassignmentIndex20261202120000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX events_reassigned_idx ON events (calculation_id, seq) WHERE type = 'calculation-reassigned'`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX events_reassigned_idx`);
  }
}

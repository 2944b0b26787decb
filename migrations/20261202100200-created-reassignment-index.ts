import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Who owns a calculation is its latest calculation-reassigned event; leadline_append_revision asks on every
 * submission. A partial index over those events alone keeps that one index probe, however long the calculation's
 * history (without it the lookup walks every event of the calculation: submission cost would grow with history).
 */
export class CreatedReassignmentIndex20261202100200 implements MigrationInterface {
  name = 'CreatedReassignmentIndex20261202100200';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX events_reassigned_idx ON events (calculation_id, seq) WHERE type = 'calculation-reassigned'`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX events_reassigned_idx`);
  }
}

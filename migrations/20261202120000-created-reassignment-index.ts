import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Who owns a calculation is read on every submission (leadline_append_revision) from its latest
 * calculation-reassigned event. Through events_calculation_idx that read walked back over every event of the
 * calculation (one per revision) to find there was none, so each submission cost its calculation's history:
 * a partial index holds the reassignments alone. IF NOT EXISTS: migration 20261202100200 (ownership) may create
 * the same index first; either alone, or both, leave exactly one.
 */
export class CreatedReassignmentIndex20261202120000 implements MigrationInterface {
  name = 'CreatedReassignmentIndex20261202120000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX IF NOT EXISTS events_reassigned_idx ON events (calculation_id, seq) WHERE type = 'calculation-reassigned'`);
  }

  /** Leaves the index: it may belong to migration 20261202100200, whose down drops it. */
  async down(): Promise<void> {
    return undefined;
  }
}

import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Link format versions and token ids. Rows written before this migration keep link_version 1 (the default) and
 * verify as they always did; new links are written as version 2, whose hash also covers the link version and the
 * id of the bearer token that acted (token_id). Adding a column with a constant default rewrites no row, so the
 * insert-only triggers are not involved.
 */
export class AddedLinkVersionsAndTokenIds20261202100000 implements MigrationInterface {
  name = 'AddedLinkVersionsAndTokenIds20261202100000';

  async up(q: QueryRunner): Promise<void> {
    for (const table of ['revisions', 'events']) {
      await q.query(`ALTER TABLE ${table} ADD COLUMN link_version smallint NOT NULL DEFAULT 1, ADD COLUMN token_id uuid`);
    }
    // Review closures are an index of the decision and withdrawal events; verify cross-checks the two by event id.
    await q.query(`CREATE INDEX revision_closures_event_idx ON revision_closures (event_id)`);
  }

  async down(): Promise<void> {
    throw new Error('link versions are part of the records: this migration is not reversible');
  }
}

import type { MigrationInterface, QueryRunner } from 'typeorm';

/** The per-user comment rate limit counts a user's comments of the last minute: index them by actor and time. */
export class CreatedCommentRateIndex20261202110000 implements MigrationInterface {
  name = 'CreatedCommentRateIndex20261202110000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX events_comment_actor_idx ON events (actor_id, created_at) WHERE type = 'comment'`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX events_comment_actor_idx`);
  }
}

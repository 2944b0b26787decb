import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Keeps a revision's normalized input, evaluation and findings as verbatim `json` text (like its input), so the
 * content digest in the hash chain is taken over the stored bytes themselves: no canonicalization is needed to
 * write or verify it, and any edit of a single byte breaks the chain.
 */
export class ChangedRevisionContentToVerbatimJson20261201220300 implements MigrationInterface {
  name = 'ChangedRevisionContentToVerbatimJson20261201220300';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE revisions
      ALTER COLUMN normalized TYPE json USING normalized::json,
      ALTER COLUMN evaluation TYPE json USING evaluation::json,
      ALTER COLUMN findings TYPE json USING findings::json`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE revisions
      ALTER COLUMN normalized TYPE jsonb USING normalized::jsonb,
      ALTER COLUMN evaluation TYPE jsonb USING evaluation::jsonb,
      ALTER COLUMN findings TYPE jsonb USING findings::jsonb`);
  }
}

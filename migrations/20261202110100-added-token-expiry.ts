import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Tokens carry an expiry. A constant-default column rewrites no row (the insert-only triggers are not involved);
 * tokens issued before this migration have none stored and expire LEADLINE_TOKEN_TTL_DAYS after their creation.
 */
export class AddedTokenExpiry20261202110100 implements MigrationInterface {
  name = 'AddedTokenExpiry20261202110100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE tokens ADD COLUMN expires_at timestamptz`);
  }

  async down(): Promise<void> {
    throw new Error('token expiries are part of the identity record: this migration is not reversible');
  }
}

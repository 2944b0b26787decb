import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The design-file jobs of a product, newest first (GET /api/v1/products/:id/design-files, by which the product page
 * finds a file still being prepared after a reload): an index over the product the job's payload names.
 */
export class CreatedDesignFileJobIndex20261207020000 implements MigrationInterface {
  name = 'CreatedDesignFileJobIndex20261207020000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX jobs_design_file_product_idx ON queue.jobs ((payload->>'productId'), created_at DESC) WHERE kind = 'design-file'`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX queue.jobs_design_file_product_idx`);
  }
}

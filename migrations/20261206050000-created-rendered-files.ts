import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Files rendered by the queue's workers (a product's design file), kept by the record hash they were rendered from,
 * and a lease heartbeat for long jobs.
 *
 * `queue.rendered_files` is insert-only for the runtime role (SELECT, INSERT, granted in infra/database/migrate.ts,
 * grantQueue): a file is written once, under the unique key (kind, subject, record hash, paper), and a later request
 * for the same record (the product's chain head hash, which the file prints) reads it instead of rendering again.
 * A new link on the product's chain gives a new head hash and so a new file; the earlier ones stay as rendered.
 * A file of a chain that does not verify has no record hash (NULL): it is kept for its job and never reused.
 *
 * `queue.extend_lease` moves a running job's lease forward for the worker that holds it (a heartbeat while a long
 * render runs); once the worker dies the heartbeat stops, the lease runs out and another instance takes the job.
 */
export class CreatedRenderedFiles20261206050000 implements MigrationInterface {
  name = 'CreatedRenderedFiles20261206050000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE queue.rendered_files (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        kind text NOT NULL CHECK (kind ~ '^[a-z][a-z0-9.-]{0,63}$'),
        subject_id uuid NOT NULL,
        record_hash text CHECK (record_hash ~ '^[0-9a-f]{64}$'),
        paper text NOT NULL CHECK (paper IN ('A4', 'Letter')),
        file_name text NOT NULL,
        media_type text NOT NULL,
        content bytea NOT NULL,
        job_id uuid REFERENCES queue.jobs(id),
        created_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (kind, subject_id, record_hash, paper)
      )`);
    await q.query(`
      CREATE FUNCTION queue.extend_lease(p_id uuid, p_worker text, p_lease_until timestamptz)
      RETURNS boolean LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, pg_temp AS $$
      BEGIN
        UPDATE queue.jobs SET locked_until = greatest(locked_until, p_lease_until)
         WHERE id = p_id AND state = 'running' AND locked_by = p_worker;
        RETURN FOUND;
      END $$`);
    await q.query(`REVOKE ALL ON FUNCTION queue.extend_lease(uuid, text, timestamptz) FROM PUBLIC`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP FUNCTION queue.extend_lease(uuid, text, timestamptz)`);
    await q.query(`DROP TABLE queue.rendered_files`);
  }
}

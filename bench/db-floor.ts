/**
 * The database side of a durable submission alone, with no HTTP and no engine: the service's transaction (the chain
 * head locked, then RecordStore.appendRevision, i.e. leadline_append_revision) from 50 clients over 50 products on a raw pool of 10,
 * side by side with a bare INSERT of the same stored bytes (a revision-sized row) on the same pool. This is the floor
 * the HTTP submission cannot beat.
 */
import { Pool } from 'pg';
import type { Queryer } from '../apps/api/src/infra/database/database.service';
import { RecordStore, type PreparedSubmission } from '../apps/api/src/records/record-store';

async function drive(seconds: number, op: () => Promise<unknown>): Promise<number> {
  let n = 0;
  const end = Date.now() + seconds * 1000;
  await Promise.all(Array.from({ length: 50 }, async () => {
    while (Date.now() < end) {
      await op();
      n++;
    }
  }));
  return n / seconds;
}

/**
 * @param targets - [productId, calculationId] pairs opened through the service by `acting`
 */
export async function benchDbFloor(url: string, records: RecordStore, targets: [string, string][], acting: { id: string; name: string }, real: PreparedSubmission, seconds: number, rounds: number) {
  const pool = new Pool({ connectionString: url, max: 10 });
  pool.on('error', () => undefined); // an idle client dropped by the server must not crash the run
  try {
    const empty = { ...real, json: { input: '{}', normalized: '{}', evaluation: '{}', findings: '[]' }, content: 'empty', verdict: 'clear' as const }; // no findings: the record function requires the verdict they give
    let k = 0;
    // As the service appends (CalculationsService.addRevision): one transaction that locks the product's chain head,
    // then the record function; a link is timed by its transaction's clock, so the call cannot run outside one
    const append = (s: PreparedSubmission) => async () => {
      const [p, c] = targets[k++ % targets.length];
      const client = await pool.connect();
      const tq: Queryer = { query: async (sql, params) => (await client.query(sql, params)).rows };
      try {
        await client.query('BEGIN');
        const cursor = await records.lockHead(tq, p);
        if (!cursor) throw new Error(`no chain head for product ${p}`);
        await records.appendRevision(tq, p, c, s, acting as never, cursor);
        await client.query('COMMIT');
      } catch (err) {
        await client.query('ROLLBACK');
        throw err;
      } finally {
        client.release();
      }
    };
    const author = JSON.stringify(acting);
    const insert = () => {
      const [p] = targets[k++ % targets.length];
      return pool.query(
        `INSERT INTO bench_rows (product_id, note, input, normalized, evaluation, findings, content, verdict, engine_version, rule_set_version, author)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11)`,
        [p, real.note, real.json.input, real.json.normalized, real.json.evaluation, real.json.findings, real.content, real.verdict, real.engineVersion, real.ruleSetVersion, author],
      );
    };
    const r = { insert: 0, appendReal: 0, appendEmpty: 0 };
    for (let i = 0; i < rounds; i++) {
      r.insert += (await drive(seconds, insert)) / rounds;
      r.appendReal += (await drive(seconds, append(real))) / rounds;
      r.appendEmpty += (await drive(seconds, append(empty))) / rounds;
    }
    return {
      bareInsertPerS: Math.round(r.insert),
      appendPerS: Math.round(r.appendReal),
      appendEmptyContentPerS: Math.round(r.appendEmpty),
      ratio: +(r.appendReal / r.insert).toFixed(3),
      ratioEmptyContent: +(r.appendEmpty / r.insert).toFixed(3),
    };
  } finally {
    await pool.end();
  }
}

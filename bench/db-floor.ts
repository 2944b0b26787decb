/**
 * The database side of a durable submission alone, with no HTTP and no engine: the one append call
 * (leadline_append_revision) from 50 clients over 50 products on a pool of 10, with real and with empty content,
 * side by side with a bare 2 KB INSERT on the same pool. This is the floor the HTTP submission cannot beat.
 */
import { randomUUID } from 'node:crypto';
import { Pool } from 'pg';
import type { RevisionSubmission } from '../apps/api/src/records/record-store';
import { prepareSubmission } from '../apps/api/src/records/record-store';

async function drive(pool: Pool, seconds: number, op: () => Promise<unknown>): Promise<number> {
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

export async function benchDbFloor(url: string, submission: RevisionSubmission, seconds: number, rounds: number) {
  const pool = new Pool({ connectionString: url, max: 10 });
  try {
    await pool.query(`CREATE TABLE IF NOT EXISTS bench_rows (id bigserial PRIMARY KEY, body jsonb NOT NULL, created_at timestamptz NOT NULL DEFAULT now())`);
    const targets: [string, string][] = [];
    for (let i = 0; i < 50; i++) {
      const p = randomUUID();
      const c = randomUUID();
      await pool.query(`INSERT INTO products (id, code, name) VALUES ($1, $2, 'db floor')`, [p, `DBF-${i}-${p.slice(0, 8)}`]);
      await pool.query(`INSERT INTO chain_heads (product_id, seq, hash) VALUES ($1, 0, '')`, [p]);
      await pool.query(`INSERT INTO calculations (id, product_id, title) VALUES ($1, $2, 'db floor')`, [c, p]);
      targets.push([p, c]);
    }
    const real = prepareSubmission(submission);
    const empty = { ...real, json: { input: '{}', normalized: '{}', evaluation: '{}', findings: '[]' }, content: 'empty' };
    let k = 0;
    const append = (s: typeof real) => () => {
      const [p, c] = targets[k++ % targets.length];
      return pool.query(`SELECT * FROM leadline_append_revision($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15)`, [
        p, c, randomUUID(), randomUUID(), s.note, s.json.input, s.json.normalized, s.json.evaluation, s.json.findings, s.content,
        s.verdict, s.engineVersion, s.ruleSetVersion, null, null,
      ]);
    };
    const row = JSON.stringify({ payload: 'x'.repeat(2000) });
    const insert = () => pool.query(`INSERT INTO bench_rows (body) VALUES ($1)`, [row]);
    const r = { insert: 0, appendReal: 0, appendEmpty: 0 };
    for (let i = 0; i < rounds; i++) {
      r.insert += (await drive(pool, seconds, insert)) / rounds;
      r.appendReal += (await drive(pool, seconds, append(real))) / rounds;
      r.appendEmpty += (await drive(pool, seconds, append(empty))) / rounds;
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

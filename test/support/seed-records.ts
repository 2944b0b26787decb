/**
 * Bulk state for a test, written through the same record functions the service uses (RecordStore: the chain-head
 * lock, the link hashes and MACs, the record functions that insert them and move the head), in one transaction, instead of thousands of HTTP calls. The HTTP routes
 * themselves, and their limits, are tested with a few real requests.
 */
import { Database } from '../../apps/api/src/infra/database/database.service';
import { RecordStore, type PreparedSubmission } from '../../apps/api/src/records/record-store';
import type { TestApp, Who } from './harness';

/** The test user `who` as the records name an actor. */
async function actorOf(t: TestApp, who: Exclude<Who, 'anonymous'>): Promise<{ id: string; name: string }> {
  const [u] = await t.db.query<{ id: string; name: string }>(`SELECT id, name FROM users WHERE id = $1`, [t.users[who]]);
  return u;
}

/** Appends comment events to a revision's chain, in order, as the given users. */
export async function appendComments(t: TestApp, revisionId: string, comments: readonly { text: string; as: Exclude<Who, 'anonymous'> }[]): Promise<void> {
  const [rev] = await t.db.query<{ product_id: string; calculation_id: string; revision: number }>(
    `SELECT product_id, calculation_id, revision FROM revisions WHERE id = $1`,
    [revisionId],
  );
  const actors = new Map<string, { id: string; name: string }>();
  for (const c of comments) if (!actors.has(c.as)) actors.set(c.as, await actorOf(t, c.as));
  const records = t.app.get(RecordStore);
  await t.app.get(Database).transaction(async (q) => {
    const cursor = await records.lockHead(q, rev.product_id);
    if (!cursor) throw new Error(`no chain head for product ${rev.product_id}`);
    for (const c of comments) {
      await records.appendEvent(q, cursor, {
        productId: rev.product_id, type: 'comment', calculationId: rev.calculation_id, revisionId, actor: actors.get(c.as)!,
        data: { revision: Number(rev.revision), text: c.text, target: null },
      });
    }
  });
}

/**
 * Appends `count` revisions of one submission to a calculation, in order, as its owner (the service acting for the
 * test's author: the record functions take the service credential), in one transaction.
 */
export async function appendRevisions(t: TestApp, calculationId: string, count: number, submission: PreparedSubmission): Promise<void> {
  const [calc] = await t.db.query<{ product_id: string; created_by: string }>(`SELECT product_id, created_by FROM calculations WHERE id = $1`, [calculationId]);
  const [owner] = await t.db.query<{ id: string; name: string }>(`SELECT id, name FROM users WHERE id = $1`, [calc.created_by]);
  const records = t.app.get(RecordStore);
  await t.app.get(Database).transaction(async (q) => {
    const cursor = await records.lockHead(q, calc.product_id);
    if (!cursor) throw new Error(`no chain head for product ${calc.product_id}`);
    for (let i = 0; i < count; i++) await records.appendRevision(q, calc.product_id, calculationId, submission, owner, cursor);
  });
}

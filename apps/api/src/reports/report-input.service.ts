/** Gathers what a report prints about one revision: product, calculation, record, review state, events, history. */
import { Inject, Injectable } from '@nestjs/common';
import type { Actor, ProductEvent, Verdict } from '@leadline/contracts';
import { CalculationsService } from '../calculations/calculations.service';
import { CheckpointsService } from '../checkpoints/checkpoints.service';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database } from '../infra/database/database.service';
import { ProductsService } from '../products/products.service';
import { ProblemError } from '../infra/http/problem';
import { TS_TEXT } from '../records/chain';
import { RecordStore, type EventRow } from '../records/record-store';
import { ReviewsService } from '../reviews/reviews.service';
import type { ReportInput } from './report-model';

/** Revisions the history table lists on each side of the reported one. */
export const HISTORY_AROUND = 25;
const historyWindow = (revision: number): [number, number] => [Math.max(1, revision - HISTORY_AROUND), revision + HISTORY_AROUND];

@Injectable()
export class ReportInputService {
  constructor(
    private readonly db: Database,
    private readonly calculations: CalculationsService,
    private readonly products: ProductsService,
    private readonly reviews: ReviewsService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly checkpoints: CheckpointsService,
    private readonly records: RecordStore,
  ) {}

  async forRevision(revisionId: string): Promise<ReportInput> {
    const revision = await this.calculations.revision(revisionId);
    const [product, calculation, review, all, [outside], events, [omitted], now] = await Promise.all([
      this.products.get(revision.productId),
      this.calculations.get(revision.calculationId),
      this.reviews.state(revisionId),
      // The history around this revision (a bounded window; the count of the others is printed)
      this.db.query<{ id: string; revision: number; created_at: string; verdict: Verdict; author: Actor | null }>(
        `SELECT id, revision, ${TS_TEXT('created_at')} AS created_at, verdict, author FROM revisions
          WHERE calculation_id = $1 AND revision BETWEEN $2 AND $3 ORDER BY revision`,
        [revision.calculationId, ...historyWindow(revision.revision)],
      ),
      this.db.query<{ before: string; after: string }>(
        `SELECT count(*) FILTER (WHERE revision < $2) AS before, count(*) FILTER (WHERE revision > $3) AS after FROM revisions WHERE calculation_id = $1`,
        [revision.calculationId, ...historyWindow(revision.revision)],
      ),
      // Every non-comment event (submission, decision, withdrawal: a handful), and comments up to the bound
      this.db.query<Record<string, any>>(
        `SELECT id, product_id, seq, type, calculation_id, revision_id, actor, data, ${TS_TEXT('created_at')} AS created_at, hash, previous_hash,
                link_version, token_id, mac
           FROM events
          WHERE revision_id = $1 AND seq <= (SELECT h.seq FROM chain_heads h WHERE h.product_id = events.product_id)
            AND (type <> 'comment' OR seq IN (SELECT seq FROM events WHERE revision_id = $1 AND type = 'comment' ORDER BY seq LIMIT $2))
          ORDER BY seq`,
        [revisionId, this.config.LEADLINE_REPORT_COMMENTS],
      ),
      this.db.query<{ count: string; first: string | null; last: string | null }>(
        `SELECT count(*) AS count, min(seq) AS first, max(seq) AS last
           FROM (SELECT seq FROM events WHERE revision_id = $1 AND type = 'comment' ORDER BY seq OFFSET $2) rest`,
        [revisionId, this.config.LEADLINE_REPORT_COMMENTS],
      ),
      this.db.query<{ now: string }>(`SELECT ${TS_TEXT('now()')} AS now`),
    ]);
    const [from, to] = historyWindow(revision.revision);
    const states = await this.reviews.statesOfCalculation(revision.calculationId, { from, to });
    // The rules' declared checks under the rule set this revision was judged by (passing checks print their limits too)
    const { checks } = await this.calculations.checksOf(revision);
    return {
      product: { id: product.id, code: product.code, name: product.name, description: product.description },
      calculation: { id: calculation.id, title: calculation.title },
      revision,
      state: review.state,
      reviewer: review.decidedBy,
      decidedAt: review.decidedAt,
      // only links this service wrote (hash and MAC verify): a forged event is never printed as part of the record
      events: events.filter((e) => this.records.sealedEvent(e as EventRow)).map(
        (e): ProductEvent => ({
          id: e.id, productId: e.product_id, seq: Number(e.seq), type: e.type, calculationId: e.calculation_id, revisionId: e.revision_id,
          actor: e.actor ?? null, data: e.data, createdAt: e.created_at, hash: e.hash, previousHash: e.previous_hash,
        }),
      ),
      omittedComments: Number(omitted.count) > 0 ? { count: Number(omitted.count), firstSeq: Number(omitted.first), lastSeq: Number(omitted.last) } : null,
      history: all.map((r) => ({ id: r.id, revision: Number(r.revision), createdAt: r.created_at, verdict: r.verdict, state: states.get(r.id)!.state, author: r.author ?? null })),
      omittedHistory: Number(outside.before) + Number(outside.after) > 0 ? { before: Number(outside.before), after: Number(outside.after) } : null,
      generatedAt: now[0].now,
      // no checkpoint over a chain that does not verify (the report then prints none; GET /products/:id/verify names the link)
      checkpoint: await this.checkpoints.signHead(revision.productId, now[0].now).catch((err: unknown) => {
        if (err instanceof ProblemError && err.status === 409) return undefined;
        throw err;
      }),
      checks,
    };
  }
}

/**
 * The design author's own work: every revision they submitted, with its review state, the decision and the
 * reviewer's comments on it (a rejection's reasons), newest first.
 */
import { Injectable } from '@nestjs/common';
import type { Finding, ReviewState } from '@leadline/contracts';
import { z } from 'zod';
import { Database } from '../infra/database/database.service';
import { RecordStore, type EventRow } from '../records/record-store';
import { validate } from '../infra/http/problem';
import { TS_TEXT } from '../records/chain';
import { remarksOfEvent } from '../reviews/remarks';
import { SUPERSEDED } from '../reviews/reviews.service';

export const myRevisionsQuerySchema = z.object({
  state: z.enum(['submitted', 'approved', 'rejected', 'withdrawn', 'superseded']).optional().describe('only revisions in this review state'),
  limit: z.coerce.number().int().min(1).max(500).default(200),
});

export interface ReviewerComment {
  by: { id: string; name: string } | null;
  at: string;
  kind: 'decision' | 'comment';
  text: string;
  target: { field?: string; finding?: string; result?: string } | null;
  /** What it is on, in words (reviews/remarks.ts remarkOn): "input “Axial load”", "finding nut-pv", "result “Nut pV over its limit, pV / pV_allow”" */
  on: string | null;
}

export interface MyRevision {
  revisionId: string;
  revision: number;
  calculationId: string;
  title: string;
  productId: string;
  productCode: string;
  productName: string;
  note: string | null;
  verdict: string;
  findings: { blocking: number; warning: number; info: number };
  submittedAt: string;
  hash: string;
  state: ReviewState;
  decidedBy: { id: string; name: string } | null;
  decidedAt: string | null;
  /** The decision's comment and every comment by someone other than the author, oldest first */
  comments: ReviewerComment[];
  /** True while the revision awaits review: its author may withdraw it */
  canWithdraw: boolean;
}

@Injectable()
export class MyWorkService {
  constructor(
    private readonly db: Database,
    private readonly records: RecordStore,
  ) {}

  async revisions(authorId: string, query: unknown): Promise<{ items: MyRevision[] }> {
    const q = validate(myRevisionsQuerySchema, query);
    // The review state is derived as everywhere else (closure, else superseded, else submitted), then filtered.
    const rows = await this.db.query<Record<string, any>>(
      `SELECT * FROM (
         SELECT r.id, r.revision, r.calculation_id, c.title, r.product_id, p.code, p.name, r.note, r.verdict, r.findings, r.hash, r.seq,
                r.created_at AS created, ${TS_TEXT('r.created_at')} AS created_at, x.kind AS closure, d.actor AS decided_by,
                ${TS_TEXT('x.created_at')} AS decided_at,
                coalesce(x.kind, CASE WHEN ${SUPERSEDED('r')} THEN 'superseded' ELSE 'submitted' END) AS state,
                ${SUPERSEDED('r')} AS superseded,
                CASE WHEN d.id IS NOT NULL THEN json_build_object('id', d.id, 'product_id', d.product_id, 'seq', d.seq, 'type', d.type,
                  'calculation_id', d.calculation_id, 'revision_id', d.revision_id, 'actor', d.actor, 'data', d.data,
                  'created_at', ${TS_TEXT('d.created_at')}, 'hash', d.hash, 'previous_hash', d.previous_hash, 'link_version', d.link_version,
                  'token_id', d.token_id, 'mac', d.mac) END AS decision,
                (SELECT coalesce(json_agg(json_build_object('type', e.type, 'actor', e.actor, 'at', ${TS_TEXT('e.created_at')}, 'data', e.data) ORDER BY e.seq), '[]'::json)
                   FROM events e WHERE e.revision_id = r.id AND e.type IN ('comment', 'approved', 'rejected')
                    AND e.actor_id IS DISTINCT FROM r.author_id) AS remarks
           FROM revisions r JOIN calculations c ON c.id = r.calculation_id JOIN products p ON p.id = r.product_id
           LEFT JOIN revision_closures x ON x.revision_id = r.id
           LEFT JOIN events d ON d.id = x.event_id AND d.revision_id = r.id AND d.type = x.kind
                AND d.seq <= (SELECT h.seq FROM chain_heads h WHERE h.product_id = d.product_id)
          WHERE r.author_id = $1
       ) mine
       WHERE $2::text IS NULL OR state = $2
       ORDER BY created DESC, seq DESC
       LIMIT $3`,
      [authorId, q.state ?? null, q.limit],
    );
    // as everywhere else, a closure counts only through a decision event whose link verifies (hash and MAC)
    const sealed = rows.map((r): Record<string, any> => {
      const closure = r.closure && r.decision && this.records.sealedEvent(r.decision as EventRow) ? r.closure : null;
      return Object.assign(r, { closure, state: closure ?? (r.superseded ? 'superseded' : 'submitted') });
    });
    const items = sealed.filter((r) => !q.state || r.state === q.state).map((r): MyRevision => {
      const state = r.state as ReviewState;
      // read as the revision routes read them (reviews/remarks.ts); an author is told comments and decisions
      const comments: ReviewerComment[] = [];
      for (const e of (typeof r.remarks === 'string' ? JSON.parse(r.remarks) : r.remarks) as { type: string; actor: any; at: string; data: any }[]) {
        for (const m of remarksOfEvent(e.type, e.actor, e.at, e.data)) {
          if (m.kind === 'comment' || m.kind === 'decision') comments.push({ by: m.by, at: m.at, kind: m.kind, text: m.text, target: m.target, on: m.on });
        }
      }
      const findings = { blocking: 0, warning: 0, info: 0 };
      for (const f of r.findings as Finding[]) findings[f.severity]++;
      return {
        revisionId: r.id, revision: Number(r.revision), calculationId: r.calculation_id, title: r.title, productId: r.product_id, productCode: r.code,
        productName: r.name, note: r.note, verdict: r.verdict, findings, submittedAt: r.created_at, hash: r.hash, state,
        decidedBy: r.closure ? (r.decided_by ?? null) : null, decidedAt: r.closure ? r.decided_at : null, comments, canWithdraw: state === 'submitted',
      };
    });
    return { items };
  }
}

/**
 * Drafts: the author's unsubmitted design input of a calculation. Saved insert-only through leadline_save_draft
 * (migrations/20261206010000): every save is a new row and the newest one is the draft; never reviewed, never on the
 * product's chain. Only the author who may add revisions to the calculation (its owner) reads or writes it.
 */
import { Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import type { Actor } from '@leadline/contracts';
import { z } from 'zod';
import { AssessmentService } from '../evaluations/assessment.service';
import { Database, pgErrorCode } from '../infra/database/database.service';
import { notFound, ProblemError, validate } from '../infra/http/problem';
import { TS_TEXT } from '../records/chain';
import { functionRefusal, PG_NOT_OWNER, splitActing, type Acting } from '../records/record-store';
import { RuleSetsService } from '../rules/rule-sets.service';
import { CalculationsService } from './calculations.service';

export const saveDraftSchema = z.strictObject({
  design: z.unknown().describe('the design input, validated as a revision\'s is (422 naming the field; nothing stored)'),
  note: z.string().max(4000).optional().describe('the note the author means to submit with it'),
});

export const draftSchema = z.object({
  id: z.string().uuid(),
  calculationId: z.string().uuid(),
  design: z.unknown(),
  note: z.string().nullable(),
  author: z.object({ id: z.string(), name: z.string() }),
  savedAt: z.string(),
  latestRevision: z
    .object({ id: z.string().uuid(), revision: z.number().int(), sameDesign: z.boolean().describe('the draft\'s normalized design equals this revision\'s') })
    .nullable(),
});
export type Draft = z.infer<typeof draftSchema>;

const NOT_OWNER = 'only the author who owns a calculation keeps its draft (the same person who may add revisions to it)';

@Injectable()
export class DraftsService {
  constructor(
    private readonly db: Database,
    private readonly calculations: CalculationsService,
    private readonly assessor: AssessmentService,
    private readonly ruleSets: RuleSetsService,
  ) {}

  /** Appends a draft; the newest one wins. Validation happens before any database work. */
  async save(calculationId: string, body: unknown, acting: Acting): Promise<Draft> {
    await this.calculations.get(calculationId);
    const input = validate(saveDraftSchema, body);
    const assessment = this.assessor.assess(input.design, this.ruleSets.current(), 'design.');
    await this.checkOwner(calculationId, acting);
    const { actor, tokenId } = splitActing(acting);
    const id = randomUUID();
    try {
      await this.db.query(`SELECT leadline_save_draft($1, $2, $3, $4, $5, $6, $7, $8)`, [
        acting.credential ?? null, id, calculationId, JSON.stringify(actor), tokenId, input.note ?? null,
        JSON.stringify(input.design), JSON.stringify(assessment.design),
      ]);
    } catch (err) {
      if (pgErrorCode(err) === PG_NOT_OWNER) throw new ProblemError(403, 'Not the owner of this calculation', NOT_OWNER);
      throw functionRefusal(err) ?? err;
    }
    return (await this.latest(calculationId, acting))!;
  }

  /** The caller's newest draft of the calculation (404 when there is none). */
  async get(calculationId: string, acting: Acting): Promise<Draft> {
    await this.calculations.get(calculationId);
    await this.checkOwner(calculationId, acting);
    const draft = await this.latest(calculationId, acting);
    if (!draft) throw notFound(`a draft of calculation ${calculationId}`);
    return draft;
  }

  private async checkOwner(calculationId: string, acting: Actor): Promise<void> {
    const owner = await this.calculations.owner(this.db, calculationId);
    if (owner?.id !== acting.id) throw new ProblemError(403, 'Not the owner of this calculation', NOT_OWNER);
  }

  private async latest(calculationId: string, acting: Actor): Promise<Draft | null> {
    const [row] = await this.db.query<{
      id: string; input: string; note: string | null; author: Actor; saved_at: string; rev_id: string | null; rev: number | null; same: boolean | null;
    }>(
      `SELECT d.id, d.input::text AS input, d.note, d.author, ${TS_TEXT('d.created_at')} AS saved_at,
              r.id AS rev_id, r.revision AS rev, (r.normalized::jsonb = d.normalized::jsonb) AS same
         FROM (SELECT * FROM drafts WHERE calculation_id = $1 AND author_id = $2 ORDER BY seq DESC LIMIT 1) d
         LEFT JOIN LATERAL (SELECT x.id, x.revision, x.normalized FROM revisions x WHERE x.calculation_id = d.calculation_id ORDER BY x.revision DESC LIMIT 1) r ON true`,
      [calculationId, acting.id],
    );
    if (!row) return null;
    return {
      id: row.id,
      calculationId,
      design: JSON.parse(row.input),
      note: row.note,
      author: { id: row.author.id, name: row.author.name },
      savedAt: row.saved_at,
      latestRevision: row.rev_id === null ? null : { id: row.rev_id, revision: Number(row.rev), sameDesign: row.same === true },
    };
  }
}

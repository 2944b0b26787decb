/**
 * Calculations (one screw position of a product) and their immutable revisions.
 * A durable submission evaluates, judges, and appends the revision and its event to the product's chain
 * in one transaction.
 */
import { Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import type { Actor, RevisionRecord } from '@leadline/contracts';
import { displayableName } from '@leadline/contracts';
import { z } from 'zod';
import { checksOf, governingCheck, type Check } from '@leadline/rules';
import { AssessmentService } from '../evaluations/assessment.service';
import type { Assessment } from '../evaluations/assess-design';
import { Database, type Queryer } from '../infra/database/database.service';
import { notFound, ProblemError, validate, ValidationProblem } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { CURRENT_ROLES, USER_ACTIVE } from '../identities/identities.service';
import { TS_TEXT } from '../records/chain';
import { checkKey, findIdempotent, requestHash, storeIdempotent, type StoredResponse } from '../records/idempotency';
import { prepareSubmission, RecordStore, type RevisionRow } from '../records/record-store';
import { RuleSetsService } from '../rules/rule-sets.service';

export const openCalculationSchema = z.strictObject({
  title: z.string().min(1).max(200).superRefine(displayableName),
  design: z.unknown(),
});

export const addRevisionSchema = z.strictObject({
  design: z.unknown(),
  note: z.string().max(4000).optional(),
});

export const reassignSchema = z.strictObject({
  userId: z.string().uuid().describe('the author who takes the calculation over'),
  reason: z.string().trim().min(1).max(4000).optional(),
});

export interface Calculation {
  id: string;
  productId: string;
  title: string;
  createdAt: string;
}

const REVISION_COLUMNS = `r.id, r.product_id, r.calculation_id, r.revision, r.seq, r.note, r.input::text AS input, r.normalized::text AS normalized,
  r.evaluation::text AS evaluation, r.findings::text AS findings, r.verdict, r.engine_version, r.rule_set_version, r.author, ${TS_TEXT('r.created_at')} AS created_at, r.hash, r.previous_hash`;

export const revisionsQuerySchema = z.object({
  after: z.coerce.number().int().min(0).default(0).describe('cursor: the last revision number of the previous page'),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  view: z.enum(['full', 'summary']).default('full').describe('summary: number, verdict, author, note, hash and dates only'),
});

const SUMMARY_COLUMNS = `r.id, r.product_id, r.calculation_id, r.revision, r.seq, r.note, r.verdict, r.author, ${TS_TEXT('r.created_at')} AS created_at, r.hash, r.previous_hash`;

/** The light form of a revision for long histories (GET /calculations/:id/revisions?view=summary). */
export interface RevisionSummary {
  id: string;
  calculationId: string;
  revision: number;
  verdict: RevisionRecord['verdict'];
  author: Actor | null;
  note: string | null;
  createdAt: string;
  hash: string;
  previousHash: string | null;
}

export function toRevisionSummary(r: Pick<RevisionRow, 'id' | 'calculation_id' | 'revision' | 'verdict' | 'author' | 'note' | 'created_at' | 'hash' | 'previous_hash'>): RevisionSummary {
  return {
    id: r.id,
    calculationId: r.calculation_id,
    revision: Number(r.revision),
    verdict: r.verdict as RevisionRecord['verdict'],
    author: (r.author as Actor | null) ?? null,
    note: r.note,
    createdAt: r.created_at,
    hash: r.hash,
    previousHash: r.previous_hash,
  };
}

export function toRevisionRecord(r: RevisionRow): RevisionRecord {
  return {
    id: r.id,
    productId: r.product_id,
    calculationId: r.calculation_id,
    revision: Number(r.revision),
    note: r.note,
    input: JSON.parse(r.input),
    normalized: JSON.parse(r.normalized) as RevisionRecord['normalized'],
    evaluation: JSON.parse(r.evaluation) as RevisionRecord['evaluation'],
    findings: JSON.parse(r.findings) as RevisionRecord['findings'],
    verdict: r.verdict as RevisionRecord['verdict'],
    engineVersion: r.engine_version,
    ruleSetVersion: r.rule_set_version,
    author: (r.author as Actor | null) ?? null,
    createdAt: r.created_at,
    hash: r.hash,
    previousHash: r.previous_hash,
  };
}

@Injectable()
export class CalculationsService {
  constructor(
    private readonly db: Database,
    private readonly records: RecordStore,
    private readonly assessor: AssessmentService,
    private readonly ruleSets: RuleSetsService,
  ) {}

  /** Opens a calculation with revision 1. Validation happens before any database work, so bad input stores nothing. */
  async open(productId: string, body: unknown, actor: Actor | null, idempotencyKey?: string): Promise<StoredResponse> {
    checkUuid(productId, 'product');
    const input = validate(openCalculationSchema, body);
    const assessment = this.assessor.assess(input.design, this.ruleSets.current(), 'design.');
    const prepared = prepareSubmission(submission(assessment, input.design, null));
    return this.idempotent(`open:${productId}:${actor?.id ?? '-'}`, idempotencyKey, body, async (q) => {
      const cursor = await this.records.lockHead(q, productId);
      if (!cursor) throw notFound(`product ${productId}`);
      const calculationId = randomUUID();
      // the calculation-opened link writes the calculation row too (leadline_append_event)
      await this.records.appendEvent(q, cursor, {
        productId, type: 'calculation-opened', calculationId, revisionId: null, actor, data: { title: input.title },
      });
      const revision = await this.records.appendRevision(q, productId, calculationId, prepared, actor, cursor);
      return {
        status: 201,
        body: { calculationId, revisionId: revision.id, revision: revision.revision, verdict: assessment.verdict, hash: revision.hash },
      };
    });
  }

  /** Adds the next revision of a calculation. */
  async addRevision(calculationId: string, body: unknown, actor: Actor | null, idempotencyKey?: string): Promise<StoredResponse> {
    checkUuid(calculationId, 'calculation');
    const input = validate(addRevisionSchema, body);
    const assessment = this.assessor.assess(input.design, this.ruleSets.current(), 'design.');
    const prepared = prepareSubmission(submission(assessment, input.design, input.note ?? null));
    return this.idempotent(`revise:${calculationId}:${actor?.id ?? '-'}`, idempotencyKey, body, async (q) => {
      // Four statements in all: the head locked (found through the calculation), who owns it with its latest
      // revision, the record function; the calculation's revisions only grow under this lock, so the latest read
      // here is the one the new revision follows
      const locked = await this.records.lockHeadOfCalculation(q, calculationId);
      if (!locked) throw notFound(`calculation ${calculationId}`);
      const latest = await this.ownerAndLatest(q, calculationId, prepared.json.normalized);
      refuseUnchanged(latest, actor);
      const revision = await this.records.appendRevision(q, locked.productId, calculationId, prepared, actor, locked.cursor, {
        nextRevision: (latest.revision ?? 0) + 1,
      });
      return {
        status: 201,
        body: { calculationId, revisionId: revision.id, revision: revision.revision, verdict: assessment.verdict, hash: revision.hash },
      };
    });
  }

  /**
   * The owner of a calculation with its latest revision, and whether that revision's normalized design equals the
   * given one (`jsonb` equality: "18 kN" equals "18000 N"), in one statement.
   */
  private async ownerAndLatest(q: Queryer, calculationId: string, normalized: string): Promise<LatestRevision> {
    const [row] = await q.query<{ owner: Actor | null; id: string | null; revision: number | null; same: boolean | null }>(
      `SELECT ${OWNER_OF('$1')} AS owner, p.id, p.revision, p.same
         FROM (SELECT 1) one LEFT JOIN LATERAL (
           SELECT r.id, r.revision, r.normalized::jsonb = $2::jsonb AS same FROM revisions r WHERE r.calculation_id = $1 ORDER BY r.revision DESC LIMIT 1
         ) p ON true`,
      [calculationId, normalized],
    );
    return { owner: row?.owner ?? null, id: row?.id ?? null, revision: row?.revision === null || row?.revision === undefined ? null : Number(row.revision), same: row?.same === true };
  }

  /**
   * Hands a calculation to another author (admin): a calculation-reassigned event on the product's chain, which
   * leadline_append_revision reads (under the same head lock) to decide who may add revisions.
   */
  async reassign(calculationId: string, body: unknown, actor: Actor) {
    const calc = await this.get(calculationId);
    const input = validate(reassignSchema, body);
    // roles and deactivation as the identity events say (the record function checks the same)
    const [user] = await this.db.query<{ id: string; name: string; roles: string[]; active: boolean }>(
      `SELECT u.id, u.name, ${CURRENT_ROLES('u')} AS roles, ${USER_ACTIVE('u')} AS active FROM users u WHERE u.id = $1`,
      [input.userId],
    );
    if (!user) throw new ValidationProblem([{ path: 'userId', message: `no user ${input.userId}` }]);
    if (!user.active) throw new ValidationProblem([{ path: 'userId', message: `${user.name} is deactivated` }]);
    if (!user.roles.includes('author')) throw new ValidationProblem([{ path: 'userId', message: `${user.name} does not have the author role` }]);
    return this.db.transaction(async (q) => {
      const cursor = (await this.records.lockHead(q, calc.productId))!;
      const from = await this.owner(q, calculationId);
      if (from?.id === user.id) throw new ProblemError(409, 'Already the owner', `${user.name} already owns this calculation`);
      const to = { id: user.id, name: user.name };
      const event = await this.records.appendEvent(q, cursor, {
        productId: calc.productId, type: 'calculation-reassigned', calculationId, revisionId: null, actor,
        data: { from, to, reason: input.reason ?? null },
      });
      return { calculationId, owner: to, previousOwner: from, eventId: event.id, hash: event.hash, seq: event.seq, createdAt: event.createdAt };
    });
  }

  /** Who may add revisions: the user of the latest calculation-reassigned event, else the one who opened it. */
  async owner(q: Queryer, calculationId: string): Promise<Actor | null> {
    const [row] = await q.query<{ owner: Actor | null }>(`SELECT ${OWNER_OF('$1')} AS owner`, [calculationId]);
    return row?.owner ?? null;
  }

  private async idempotent(
    scope: string,
    rawKey: string | undefined,
    body: unknown,
    work: (q: Queryer) => Promise<StoredResponse>,
    singleStatement = false,
  ): Promise<StoredResponse> {
    const key = checkKey(rawKey);
    // One statement is atomic on its own: without a key, a single-call body needs no explicit transaction.
    if (!key) return singleStatement ? work(this.db) : this.db.transaction(work);
    const hash = requestHash(body);
    try {
      return await this.db.transaction(async (q) => {
        const earlier = await findIdempotent(q, scope, key, hash);
        if (earlier) return earlier;
        const response = await work(q);
        await storeIdempotent(q, scope, key, hash, response);
        return response;
      });
    } catch (err) {
      // A concurrent retry with the same key committed first: answer with its result.
      const earlier = await this.db.transaction((q) => findIdempotent(q, scope, key, hash));
      if (earlier) return earlier;
      throw err;
    }
  }

  async get(id: string): Promise<Calculation> {
    const rows = await this.db.query<Calculation>(
      `SELECT id, product_id AS "productId", title, ${TS_TEXT('created_at')} AS "createdAt" FROM calculations WHERE id = $1`,
      [checkUuid(id, 'calculation')],
    );
    if (rows.length === 0) throw notFound(`calculation ${id}`);
    return rows[0];
  }

  async listForProduct(productId: string): Promise<Calculation[]> {
    return this.db.query<Calculation>(
      `SELECT id, product_id AS "productId", title, ${TS_TEXT('created_at')} AS "createdAt" FROM calculations WHERE product_id = $1 ORDER BY created_at, id`,
      [checkUuid(productId, 'product')],
    );
  }

  async revisions(calculationId: string): Promise<RevisionRecord[]> {
    await this.get(calculationId);
    const rows = await this.db.query<RevisionRow>(`SELECT ${REVISION_COLUMNS} FROM revisions r WHERE r.calculation_id = $1 ORDER BY r.revision`, [calculationId]);
    return rows.map(toRevisionRecord);
  }

  /**
   * One page of a calculation's revisions after the cursor (a revision number), oldest first; the (calculation_id,
   * revision) index makes a page cost the same at any depth. `view: 'summary'` reads only the light columns.
   */
  async revisionsPage(calculationId: string, query: unknown): Promise<{ items: (RevisionRecord | RevisionSummary)[]; nextCursor: number | null }> {
    const q = validate(revisionsQuerySchema, query);
    await this.get(calculationId);
    const columns = q.view === 'summary' ? SUMMARY_COLUMNS : REVISION_COLUMNS;
    const rows = await this.db.query<RevisionRow>(
      `SELECT ${columns} FROM revisions r WHERE r.calculation_id = $1 AND r.revision > $2 ORDER BY r.revision LIMIT $3`,
      [calculationId, q.after, q.limit + 1],
    );
    const page = rows.slice(0, q.limit);
    const items = page.map((r) => (q.view === 'summary' ? toRevisionSummary(r) : toRevisionRecord(r)));
    return { items, nextCursor: rows.length > q.limit ? items[items.length - 1].revision : null };
  }

  /**
   * The declared checks of a stored revision and the governing one, under the rule set it was judged by: derived on
   * reading from its stored design and evaluation (an earlier engine's missing figures read as not computed).
   */
  async checksOf(record: RevisionRecord): Promise<{ checks: Check[]; governing: Check | null }> {
    const { thresholds } = (await this.ruleSets.get(record.ruleSetVersion)).definition;
    const checks = checksOf(record.normalized, record.evaluation, thresholds);
    return { checks, governing: governingCheck(checks) };
  }

  async revision(id: string): Promise<RevisionRecord> {
    const rows = await this.db.query<RevisionRow>(`SELECT ${REVISION_COLUMNS} FROM revisions r WHERE r.id = $1`, [checkUuid(id, 'revision')]);
    if (rows.length === 0) throw notFound(`revision ${id}`);
    return toRevisionRecord(rows[0]);
  }
}

function submission(a: Assessment, input: unknown, note: string | null) {
  return {
    input,
    normalized: a.design,
    evaluation: a.evaluation,
    findings: a.findings,
    verdict: a.verdict,
    engineVersion: a.engineVersion,
    ruleSetVersion: a.ruleSetVersion,
    note,
  };
}

/**
 * Who may add revisions to a calculation (SQL expression over the calculation id `param`): the user of its latest
 * calculation-reassigned event, else the one who opened it (leadline_append_revision decides by the same).
 */
const OWNER_OF = (param: string): string => `coalesce(
  (SELECT e.data->'to' FROM events e WHERE e.calculation_id = ${param} AND e.type = 'calculation-reassigned' ORDER BY e.seq DESC LIMIT 1),
  (SELECT e.actor FROM events e WHERE e.calculation_id = ${param} AND e.type = 'calculation-opened' ORDER BY e.seq LIMIT 1))`;

interface LatestRevision {
  readonly owner: Actor | null;
  /** The latest revision (null: none yet) and whether its design equals the submitted one */
  readonly id: string | null;
  readonly revision: number | null;
  readonly same: boolean;
}

/**
 * A submission whose normalized design equals the previous revision's is refused (409 naming that revision): a
 * revision records a change, and an accidental resubmission must not pass for one. Checked by the service, not in
 * leadline_append_revision, because bulk test and benchmark state appends one stored design many times through
 * the record function. The owner check comes first, so a stranger learns nothing of the design.
 */
function refuseUnchanged(latest: LatestRevision, actor: Actor | null): void {
  if (latest.owner && actor && latest.owner.id !== actor.id) return; // leadline_append_revision refuses it with 403
  if (latest.same && latest.revision !== null) {
    const n = latest.revision;
    throw new ProblemError(409, 'Unchanged design', `the design equals revision ${n} (${latest.id}): change an input before submitting a new revision`, {
      revision: n,
      revisionId: latest.id,
      errors: [{ path: 'design', message: `equals revision ${n} (${latest.id}): nothing changed` }],
    });
  }
}

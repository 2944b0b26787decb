/**
 * The review workflow: decisions, comments and withdrawals as events on the product's chain, and the review
 * state of a revision derived from the log (closure row, written in the same transaction, or a newer revision).
 */
import { Inject, Injectable } from '@nestjs/common';
import type { Actor, Finding, ReviewState } from '@leadline/contracts';
import { ACKNOWLEDGEMENT_MIN_LENGTH } from '@leadline/contracts';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode, type Queryer } from '../infra/database/database.service';
import { ProblemError, ValidationProblem, notFound, validate } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { EVENT_ROW_JSON, TS_TEXT } from '../records/chain';
import { RecordStore, type Acting, type EventRow } from '../records/record-store';
import { checkCommentRate } from './comment-limit';
import { SIGNATURE_MEANING, signatureOf, type Signature } from './signature';

export { SIGNATURE_MEANING, signatureOf, type Signature } from './signature';
import { AccountsService } from '../identities/accounts.service';
import type { Principal } from '../identities/identities.service';
import { ReauthenticationsService } from '../identities/reauthentications.service';
import { PASSWORD_MAX } from '../identities/passwords';
import { authenticationResponseSchema, PasskeysService } from '../identities/passkeys.service';
import type { StoredAssertion } from '../records/passkey-signature';
import { remarkOn, remarksOfEvent, remarkTarget, type Remark } from './remarks';
import { CalculationsService } from '../calculations/calculations.service';

export const targetSchema = z.union([
  z.strictObject({ field: z.string().min(1).max(200).describe('input field path, e.g. "thread.pitch"') }),
  z.strictObject({ finding: z.string().min(1).max(100).describe('rule id of one of the revision\'s findings') }),
  z.strictObject({ result: z.string().min(1).max(100).describe('id of one of the revision\'s numeric checks (its `checks`, e.g. "screw-strength")') }),
]);

export const commentSchema = z.strictObject({ text: z.string().trim().min(1, 'a comment needs text').max(8000), target: targetSchema.optional() });

/** How the decider signs, at the moment of deciding (docs/reliability.md, electronic signatures). */
export const signatureSchema = z.discriminatedUnion('method', [
  z.strictObject({ method: z.literal('password'), password: z.string().min(1).max(PASSWORD_MAX).describe("the signer's own password") }),
  z.strictObject({
    method: z.literal('oidc'),
    reauthentication: z.uuid().optional().describe('id of the fresh identity-provider login (default: your newest unused one for this revision; GET /api/v1/auth/oidc/start?purpose=sign&revision=)'),
  }),
  z.strictObject({
    method: z.literal('passkey'),
    challengeId: z.uuid().describe('the challenge of POST /api/v1/revisions/:id/passkey-challenges'),
    response: authenticationResponseSchema.describe("your passkey's assertion over that challenge (navigator.credentials.get, as JSON)"),
  }),
]);

export const decisionSchema = z.strictObject({
  decision: z.enum(['approve', 'reject']),
  signature: signatureSchema.optional().describe('required: the decider signs with something only they hold'),
  comment: z.string().max(8000).optional(),
  acknowledgements: z.array(z.strictObject({ finding: z.string().min(1).max(100), comment: z.string().trim().min(1, 'an acknowledgement needs a comment').min(ACKNOWLEDGEMENT_MIN_LENGTH, `give the reason for accepting this warning in at least ${ACKNOWLEDGEMENT_MIN_LENGTH} characters`).max(4000) })).max(100).optional(),
  comments: z.array(commentSchema).max(100).optional().describe('comments attached to input fields, findings or results'),
});

export type { Remark } from './remarks';

export const withdrawSchema = z.strictObject({ comment: z.string().max(8000).optional() }).optional();

/**
 * SQL: a newer revision of the same calculation exists (the revision aliased `alias` is superseded). Revision
 * numbers are contiguous (a trigger admits only max + 1, and nothing is deleted), so "newer exists" is "the next
 * number exists": one equality probe of (calculation_id, revision) whatever the plan, where a range test let the
 * planner hash-join every revision of the calculation and made a page of late revisions cost their whole history.
 */
export const SUPERSEDED = (alias: string) =>
  `EXISTS (SELECT 1 FROM revisions n WHERE n.calculation_id = ${alias}.calculation_id AND n.revision = ${alias}.revision + 1)`;

/**
 * SQL: the revision aliased `alias` is closed (optionally as `kind`) by a closure that indexes a real decision or
 * withdrawal event of that revision; a closure row without its event closes nothing (verify reports it).
 */
export const CLOSED = (alias: string, kind?: 'approved' | 'rejected' | 'withdrawn') =>
  `EXISTS (SELECT 1 FROM revision_closures x JOIN events xe ON xe.id = x.event_id AND xe.revision_id = x.revision_id AND xe.type = x.kind
            JOIN chain_heads xh ON xh.product_id = xe.product_id AND xe.seq <= xh.seq
            WHERE x.revision_id = ${alias}.id${kind ? ` AND x.kind = '${kind}'` : ''})`;

/** Who is deciding, and how they authenticated on this request. */
export interface SignerContext {
  principal: Principal;
  /** Client address key of the failure limiter */
  client: string;
  /** The request's host name (the passkeys' relying party when LEADLINE_PUBLIC_URL is unset) */
  hostname: string;
}

/** A second decision that lost the race for the revision's one closure (its primary key). */
function raced(err: unknown): never {
  if (pgErrorCode(err) === PG_UNIQUE_VIOLATION) throw new ProblemError(409, 'Revision is not awaiting review', 'another decision was recorded first');
  throw err;
}

export interface RevisionState {
  id: string;
  productId: string;
  calculationId: string;
  revision: number;
  authorId: string | null;
  findings: Finding[];
  input: unknown;
  state: ReviewState;
  decidedBy: Actor | null;
  decidedAt: string | null;
  signature: Signature | null;
}

@Injectable()
export class ReviewsService {
  constructor(
    private readonly db: Database,
    private readonly records: RecordStore,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly accounts: AccountsService,
    private readonly reauthentications: ReauthenticationsService,
    private readonly passkeys: PasskeysService,
    private readonly calculations: CalculationsService,
  ) {}

  /**
   * What was said on a revision, oldest first, as events up to the product's head: comments (general or on an input
   * field or a finding), the decision's comment, its acknowledgements and comments, and a withdrawal's comment.
   */
  async remarks(revisionId: string): Promise<Remark[]> {
    return (await this.remarksOf([checkUuid(revisionId, 'revision')])).get(revisionId) ?? [];
  }

  /** The remarks of several revisions (a page of a calculation's revisions) in one read of the events' revision index. */
  async remarksOf(revisionIds: readonly string[]): Promise<Map<string, Remark[]>> {
    const byRevision = new Map<string, Remark[]>(revisionIds.map((id) => [id, []]));
    if (revisionIds.length === 0) return byRevision;
    // with each event the revision's input, by which a comment on an input inside a choice is worded
    const rows = await this.db.query<{ revision_id: string; type: string; actor: Actor | null; at: string; data: Record<string, any>; input: unknown }>(
      `SELECT e.revision_id, e.type, e.actor, ${TS_TEXT('e.created_at')} AS at, e.data, r.input FROM events e JOIN revisions r ON r.id = e.revision_id
        WHERE e.revision_id = ANY ($1::uuid[]) AND e.type IN ('comment', 'approved', 'rejected', 'withdrawn')
          AND e.seq <= (SELECT h.seq FROM chain_heads h WHERE h.product_id = e.product_id)
        ORDER BY e.seq`,
      [revisionIds],
    );
    for (const e of rows) byRevision.get(e.revision_id)!.push(...remarksOfEvent(e.type, e.actor, e.at, e.data, e.input));
    return byRevision;
  }

  async state(id: string, q: Queryer = this.db): Promise<RevisionState> {
    const [r] = await this.states(q, 'r.id = $1', [checkUuid(id, 'revision')]);
    if (!r) throw notFound(`revision ${id}`);
    return r;
  }

  /** Review states of every revision of a calculation (or of revision numbers in [from, to]), in one query, by revision id. */
  async statesOfCalculation(calculationId: string, range?: { from: number; to: number }): Promise<Map<string, RevisionState>> {
    const rows = range
      ? await this.states(this.db, 'r.calculation_id = $1 AND r.revision BETWEEN $2 AND $3', [checkUuid(calculationId, 'calculation'), range.from, range.to])
      : await this.states(this.db, 'r.calculation_id = $1', [checkUuid(calculationId, 'calculation')]);
    return new Map(rows.map((r) => [r.id, r]));
  }

  private async states(q: Queryer, where: string, params: unknown[]): Promise<RevisionState[]> {
    const rows = await q.query<{
      id: string; product_id: string; calculation_id: string; revision: number; author_id: string | null; findings: Finding[]; input: string;
      closure: ReviewState | null; superseded: boolean; decided_at: string | null; event: EventRow | null;
    }>(
      // A closure counts only as the index of a decision or withdrawal event of this very revision, at or below the
      // chain head, whose link verifies (hash and MAC: the service wrote it); anything else changes nothing and verify
      // reports it. The author is the hashed one.
      `SELECT r.id, r.product_id, r.calculation_id, r.revision, (r.author->>'id')::uuid AS author_id, r.findings, r.input::text AS input,
              CASE WHEN e.id IS NOT NULL THEN c.kind END AS closure,
              ${SUPERSEDED('r')} AS superseded, ${TS_TEXT('e.created_at')} AS decided_at,
              ${EVENT_ROW_JSON('e')} AS event
         FROM revisions r
         LEFT JOIN revision_closures c ON c.revision_id = r.id
         LEFT JOIN events e ON e.id = c.event_id AND e.revision_id = r.id AND e.type = c.kind
              AND e.seq <= (SELECT h.seq FROM chain_heads h WHERE h.product_id = e.product_id)
        WHERE ${where}`,
      params,
    );
    return rows.map((r) => {
      const closure = r.closure && r.event && this.records.sealedEvent(r.event) ? r.closure : null;
      return {
        id: r.id, productId: r.product_id, calculationId: r.calculation_id, revision: Number(r.revision), authorId: r.author_id,
        findings: r.findings, input: JSON.parse(r.input),
        state: closure ?? (r.superseded ? 'superseded' : 'submitted'),
        decidedBy: closure ? ((r.event!.actor as Actor | null) ?? null) : null,
        decidedAt: closure ? r.decided_at : null,
        signature: closure === 'approved' || closure === 'rejected' ? signatureOf(r.event!.data, r.decided_at, r.event!.hash) : null,
      };
    });
  }

  /**
   * Approve or reject: four-eyes (the decider is not the author, and acts with a token the author did not issue),
   * never with an admin's token, no blocking findings, every warning acknowledged, exactly one decision.
   * @param roles - the deciding caller's roles
   */
  async decide(revisionId: string, body: unknown, actor: Acting, roles: readonly string[], signer: SignerContext) {
    if (roles.includes('admin')) {
      throw new ProblemError(403, 'Admins do not decide', 'an admin identity can issue tokens, so it may not approve or reject; decide with a reviewer identity that is not an admin');
    }
    const input = validate(decisionSchema, body);
    const head = await this.state(revisionId);
    const results = await this.resultIds(head.id, input.comments ?? []);
    const assertion = await this.checkSignature(input.signature, signer, head);
    return this.db.transaction(async (q) => {
      const cursor = (await this.records.lockHead(q, head.productId))!;
      const rev = await this.state(revisionId, q);
      if (rev.authorId !== null && rev.authorId === actor.id) {
        throw new ProblemError(403, 'Four-eyes rule', 'a revision must be decided by a reviewer other than its author');
      }
      if (rev.authorId !== null && actor.tokenId) {
        const [token] = await q.query<{ created_by: string | null }>(`SELECT created_by FROM tokens WHERE id = $1`, [actor.tokenId]);
        if (token?.created_by === rev.authorId) {
          throw new ProblemError(403, 'Four-eyes rule', "a revision cannot be decided with a token issued by its author");
        }
      }
      if (rev.state !== 'submitted') {
        throw new ProblemError(409, 'Revision is not awaiting review', `revision ${rev.revision} is ${rev.state}`, { state: rev.state });
      }
      const comments = input.comments ?? [];
      this.checkTargets(rev, comments.map((c, i) => ({ comment: c, path: `comments.${i}.target` })), results);
      const acknowledgements = input.acknowledgements ?? [];
      if (input.decision === 'approve') {
        const blocking = rev.findings.filter((f) => f.severity === 'blocking');
        if (blocking.length > 0) {
          throw new ProblemError(409, 'Blocking findings', `cannot approve while blocking findings stand: ${blocking.map((f) => f.ruleId).join(', ')}`, {
            blocking: blocking.map((f) => f.ruleId),
          });
        }
        const warnings = new Set(rev.findings.filter((f) => f.severity === 'warning').map((f) => f.ruleId));
        const issues = acknowledgements
          .map((a, i) => (warnings.has(a.finding) ? null : { path: `acknowledgements.${i}.finding`, message: `"${a.finding}" is not a warning of this revision` }))
          .filter((x): x is { path: string; message: string } => x !== null);
        const acked = new Set(acknowledgements.map((a) => a.finding));
        for (const w of warnings) if (!acked.has(w)) issues.push({ path: 'acknowledgements', message: `warning "${w}" must be acknowledged with a comment` });
        if (issues.length) throw new ValidationProblem(issues);
      } else {
        if (!input.comment || input.comment.trim() === '') throw new ValidationProblem([{ path: 'comment', message: 'a rejection needs a comment' }]);
        if (acknowledgements.length) throw new ValidationProblem([{ path: 'acknowledgements', message: 'acknowledgements belong to an approval' }]);
      }
      const kind = input.decision === 'approve' ? 'approved' : 'rejected';
      const [{ hash: revisionHash }] = await q.query<{ hash: string }>(`SELECT hash FROM revisions WHERE id = $1`, [rev.id]);
      const signature = {
        signerId: actor.id, printedName: actor.name, meaning: SIGNATURE_MEANING[kind], method: input.signature!.method, revisionHash,
        ...(assertion ? { passkey: assertion } : {}),
      };
      const event = await this.records.appendEvent(q, cursor, {
        productId: rev.productId, type: kind, calculationId: rev.calculationId, revisionId: rev.id, actor,
        data: { revision: rev.revision, comment: input.comment ?? null, acknowledgements, comments, signature },
      }).catch(raced);
      return {
        revisionId: rev.id, state: kind, eventId: event.id, hash: event.hash, decidedAt: event.createdAt, seq: event.seq, productId: rev.productId,
        signature: signatureOf({ signature }, event.createdAt, event.hash),
      };
    });
  }

  /**
   * Nobody signs for anyone else: the decider acts with their own session or a token they issued themselves, and
   * signs with something only they hold, checked now. Refusals are 403 naming `signature`.
   */
  private async checkSignature(signature: z.infer<typeof signatureSchema> | undefined, signer: SignerContext, rev: RevisionState): Promise<StoredAssertion | null> {
    const p = signer.principal;
    const refuse = (path: string, detail: string): never => {
      throw new ProblemError(403, 'Signature not accepted', detail, { errors: [{ path, message: detail }] });
    };
    if (p.authMethod === 'token' && p.tokenIssuedBy !== p.id) {
      refuse('signature', 'this token was issued by another person: a decision needs your own session or a token you issued yourself (POST /api/v1/account/tokens)');
    }
    if (!signature) refuse('signature', 'a decision is an electronic signature: send signature {method, ...} with your own credential');
    const sig = signature!;
    if (!this.config.LEADLINE_SIGNATURE_METHODS.includes(sig.method)) {
      refuse('signature.method', `this site accepts signatures by ${this.config.LEADLINE_SIGNATURE_METHODS.join(', ')}`);
    }
    if (sig.method === 'password') {
      if (!(await this.accounts.verifySignerPassword(p.id, sig.password, signer.client))) refuse('signature.password', 'not your password');
      return null;
    }
    if (sig.method === 'passkey') {
      return this.passkeys.sign(sig, p, { id: rev.id, hash: await this.revisionHash(rev.id) }, this.passkeys.relyingParty(signer.hostname), refuse);
    }
    await this.reauthentications.consume(sig.reauthentication, p, rev.id, refuse);
    return null;
  }

  private async revisionHash(id: string): Promise<string> {
    const [row] = await this.db.query<{ hash: string }>(`SELECT hash FROM revisions WHERE id = $1`, [id]);
    return row.hash;
  }

  /**
   * A challenge for signing a revision with a passkey (reviewer): bound to the revision's record hash, one use,
   * answered by navigator.credentials.get and sent back as signature {method: "passkey", challengeId, response}.
   */
  async passkeyChallenge(revisionId: string, principal: Principal, hostname: string) {
    if (!this.config.LEADLINE_SIGNATURE_METHODS.includes('passkey')) {
      throw new ProblemError(403, 'Signature not accepted', `this site accepts signatures by ${this.config.LEADLINE_SIGNATURE_METHODS.join(', ')}`, {
        errors: [{ path: 'signature.method', message: 'passkey signatures are not accepted here' }],
      });
    }
    const rev = await this.state(revisionId);
    if (rev.state !== 'submitted') throw new ProblemError(409, 'Revision is not awaiting review', `revision ${rev.revision} is ${rev.state}`, { state: rev.state });
    return this.passkeys.signingOptions(principal, rev.id, await this.revisionHash(rev.id), this.passkeys.relyingParty(hostname));
  }

  async comment(revisionId: string, body: unknown, actor: Actor) {
    const input = validate(commentSchema, body);
    const head = await this.state(revisionId);
    this.checkTargets(head, [{ comment: input, path: 'target' }], await this.resultIds(head.id, [input]));
    return this.db.transaction(async (q) => {
      const cursor = (await this.records.lockHead(q, head.productId))!;
      await checkCommentRate(q, { perRevisionPerMinute: this.config.LEADLINE_COMMENTS_PER_REVISION_PER_MINUTE, perUserPerMinute: this.config.LEADLINE_COMMENTS_PER_USER_PER_MINUTE }, head.id, actor.id);
      const event = await this.records.appendEvent(q, cursor, {
        productId: head.productId, type: 'comment', calculationId: head.calculationId, revisionId: head.id, actor,
        data: { revision: head.revision, text: input.text, target: input.target ?? null },
      });
      // what it is on, worded as the revision's remarks word it (an input from the option this input chose)
      return { eventId: event.id, hash: event.hash, createdAt: event.createdAt, on: remarkOn(remarkTarget(input.target ?? null), head.input) };
    });
  }

  /** The author takes a revision back before anyone decides on it. */
  async withdraw(revisionId: string, body: unknown, actor: Actor) {
    const input = validate(withdrawSchema, body) ?? {};
    const head = await this.state(revisionId);
    return this.db.transaction(async (q) => {
      const cursor = (await this.records.lockHead(q, head.productId))!;
      const rev = await this.state(revisionId, q);
      if (rev.authorId !== actor.id) throw new ProblemError(403, 'Not the author', 'only the author of a revision can withdraw it');
      if (rev.state !== 'submitted') throw new ProblemError(409, 'Revision is not awaiting review', `revision ${rev.revision} is ${rev.state}`, { state: rev.state });
      const event = await this.records.appendEvent(q, cursor, {
        productId: rev.productId, type: 'withdrawn', calculationId: rev.calculationId, revisionId: rev.id, actor,
        data: { revision: rev.revision, comment: input.comment ?? null },
      }).catch(raced);
      return { revisionId: rev.id, state: 'withdrawn', eventId: event.id, hash: event.hash, seq: event.seq, productId: rev.productId, withdrawnAt: event.createdAt };
    });
  }

  /**
   * The ids of the revision's numeric checks (the `checks` its routes answer, derived from the rules' declarations
   * under the rule set it was judged by), read only when a comment is on a result. Read before any transaction: the
   * stored revision never changes, and the embedded database serves one statement at a time.
   */
  private async resultIds(revisionId: string, comments: readonly z.infer<typeof commentSchema>[]): Promise<ReadonlySet<string>> {
    if (!comments.some((c) => c.target !== undefined && 'result' in c.target)) return new Set();
    const { checks } = await this.calculations.checksOf(await this.calculations.revision(revisionId));
    return new Set(checks.map((c) => c.id));
  }

  /** Comment targets must name a field of the submitted input, one of the revision's findings or one of its checks. */
  private checkTargets(rev: RevisionState, comments: readonly { comment: z.infer<typeof commentSchema>; path: string }[], results: ReadonlySet<string>): void {
    const issues: { path: string; message: string }[] = [];
    for (const { comment, path } of comments) {
      const t = comment.target;
      if (!t) continue;
      if ('field' in t) {
        let node: unknown = rev.input;
        for (const part of t.field.replace(/^design\./, '').split('.')) {
          node = node !== null && typeof node === 'object' ? (node as Record<string, unknown>)[part] : undefined;
        }
        if (node === undefined) issues.push({ path: `${path}.field`, message: `"${t.field}" is not a field of revision ${rev.revision}'s input` });
      } else if ('result' in t) {
        if (!results.has(t.result)) {
          issues.push({ path: `${path}.result`, message: `"${t.result}" is not a result of revision ${rev.revision}: name one of its checks (${[...results].join(', ') || 'none'})` });
        }
      } else if (!rev.findings.some((f) => f.ruleId === t.finding)) {
        issues.push({ path: `${path}.finding`, message: `"${t.finding}" is not a finding of revision ${rev.revision}` });
      }
    }
    if (issues.length) throw new ValidationProblem(issues);
  }
}

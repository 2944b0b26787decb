import { Body, Controller, Get, HttpCode, Param, Post, Query, Req, StreamableFile } from '@nestjs/common';
import type { FastifyRequest } from 'fastify';
import { clientKey } from '../identities/failure-limiter';
import type { Principal } from '../identities/identities.service';
import { Readable } from 'node:stream';
import type { Actor } from '@leadline/contracts';
import { CalculationsService } from '../calculations/calculations.service';
import { CheckpointsService } from '../checkpoints/checkpoints.service';
import { Roles } from '../identities/auth.guard';
import { CurrentActor, CurrentRoles } from '../infra/http/actor';
import { ProblemError, validate } from '../infra/http/problem';
import { ProductsService } from '../products/products.service';
import { designFieldLabel } from '@leadline/contracts';
import { resultPresentation } from '../reports/sections/calculation';
import { AuditService, auditQuerySchema, changes, flatten } from './audit.service';
import { ReviewsService } from './reviews.service';

@Controller('api/v1')
export class ReviewsController {
  constructor(
    private readonly reviews: ReviewsService,
    private readonly checkpoints: CheckpointsService,
    private readonly audit: AuditService,
    private readonly calculations: CalculationsService,
    private readonly products: ProductsService,
  ) {}

  /** Approve or reject a revision (reviewer, not its author). */
  @Post('revisions/:id/decisions')
  @Roles('reviewer')
  @HttpCode(201)
  async decide(@Param('id') id: string, @Body() body: unknown, @CurrentActor() actor: Actor, @CurrentRoles() roles: string[], @Req() req: FastifyRequest & { principal: Principal }) {
    const decided = await this.reviews.decide(id, body, actor, roles, { principal: req.principal, client: clientKey(req.ip), hostname: req.hostname });
    return { ...decided, checkpoint: await this.checkpoints.afterDecision(decided.productId, decided.seq, decided.hash, decided.decidedAt) };
  }

  /** A challenge for signing this revision with your passkey: {challengeId, revisionHash, options} for navigator.credentials.get. */
  @Post('revisions/:id/passkey-challenges')
  @Roles('reviewer')
  @HttpCode(201)
  passkeyChallenge(@Param('id') id: string, @Req() req: FastifyRequest & { principal: Principal }) {
    return this.reviews.passkeyChallenge(id, req.principal, req.hostname);
  }

  /** A comment without a decision, general or on an input field, a finding or a result (one of the revision's checks). */
  @Post('revisions/:id/comments')
  @Roles('author', 'reviewer')
  @HttpCode(201)
  comment(@Param('id') id: string, @Body() body: unknown, @CurrentActor() actor: Actor) {
    return this.reviews.comment(id, body, actor);
  }

  /** The author takes a revision back before a decision. */
  @Post('revisions/:id/withdraw')
  @Roles('author')
  @HttpCode(200)
  async withdraw(@Param('id') id: string, @Body() body: unknown, @CurrentActor() actor: Actor) {
    const withdrawn = await this.reviews.withdraw(id, body, actor);
    return { ...withdrawn, checkpoint: await this.checkpoints.afterDecision(withdrawn.productId, withdrawn.seq, withdrawn.hash, withdrawn.withdrawnAt) };
  }

  /** Revisions awaiting review, oldest first; filter by productId, calculationId, verdict, authorId. */
  @Get('reviews/queue')
  queue(@Query() query: unknown) {
    return this.audit.queue(query);
  }

  /** The chronological trail of a product: every revision, finding summary, event, actor, time and hash. */
  @Get('products/:id/audit')
  async trail(@Param('id') id: string, @Query() query: unknown) {
    const q = validate(auditQuerySchema, query);
    if (!q.format) return this.audit.trail(id, q.after, q.limit);
    const product = await this.products.get(id);
    const name = `audit-${product.code}`;
    // Streamed as read, batch by batch (constant memory at any trail length); a client that goes away stops the reads.
    const chunks = q.format === 'csv' ? this.audit.csv(id) : this.audit.json(id, product);
    const stream = Readable.from(chunks, { objectMode: false });
    return new StreamableFile(stream, {
      type: q.format === 'csv' ? 'text/csv; charset=utf-8' : 'application/json; charset=utf-8',
      disposition: `attachment; filename="${name}.${q.format}"`,
    });
  }

  /** What changed in inputs, friction sources, results and findings between two revisions. */
  @Get('revisions/:id/diff')
  async diff(@Param('id') id: string, @Query('against') against?: string) {
    if (!against) throw new ProblemError(422, 'The request has invalid fields', 'against: required', { errors: [{ path: 'against', message: 'the revision id to compare with' }] });
    const [to, from] = await Promise.all([this.calculations.revision(id), this.calculations.revision(against)]);
    const results = (r: typeof to) => {
      const { trace: _t, findings: _f, ...rest } = r.evaluation as unknown as Record<string, unknown>;
      return flatten(rest);
    };
    const friction = (r: typeof to) => ({ thread: r.normalized.friction.thread, collar: r.normalized.friction.collar });
    const byRule = (r: typeof to) => new Map(r.findings.map((f) => [f.ruleId, f]));
    const [resultsFrom, resultsTo] = [results(from), results(to)];
    const a = byRule(from);
    const b = byRule(to);
    return {
      revision: { id: to.id, revision: to.revision, calculationId: to.calculationId },
      against: { id: from.id, revision: from.revision, calculationId: from.calculationId },
      sameCalculation: to.calculationId === from.calculationId,
      // each changed input with its name in words (from the design input's contract)
      inputs: changes(flatten(from.input), flatten(to.input)).map((c) => ({ ...c, label: designFieldLabel(c.path) })),
      frictionSources: changes(flatten(friction(from)), flatten(friction(to))),
      // each changed result with the report's label for its path and the kind of quantity it is (to print it with its unit)
      // A figure one revision's engine did not compute is named as such (an earlier engine), not shown as a null value
      results: changes(resultsFrom, resultsTo).map((c) => ({
        ...c,
        ...resultPresentation(c.path, to.evaluation.trace[c.path] ? to.evaluation : from.evaluation),
        notComputed: !(c.path in resultsFrom) ? 'from' : !(c.path in resultsTo) ? 'to' : null,
      })),
      findings: {
        added: [...b.values()].filter((f) => !a.has(f.ruleId)),
        removed: [...a.values()].filter((f) => !b.has(f.ruleId)),
        changed: [...b.values()]
          .filter((f) => a.has(f.ruleId) && (a.get(f.ruleId)!.severity !== f.severity || a.get(f.ruleId)!.message !== f.message))
          .map((f) => ({ ruleId: f.ruleId, from: a.get(f.ruleId), to: f })),
      },
      versions: {
        engine: { from: from.engineVersion, to: to.engineVersion },
        ruleSet: { from: from.ruleSetVersion, to: to.ruleSetVersion },
      },
    };
  }
}

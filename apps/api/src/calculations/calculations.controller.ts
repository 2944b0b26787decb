import { Body, Controller, Get, Headers, HttpCode, Param, Post, Put, Query, Res } from '@nestjs/common';
import { UserLimit } from '../infra/http/user-limits';
import type { FastifyReply } from 'fastify';
import { designInputFields, type Actor } from '@leadline/contracts';
import { Roles } from '../identities/auth.guard';
import { CurrentActor } from '../infra/http/actor';
import { ReviewsService } from '../reviews/reviews.service';
import { CalculationsService } from './calculations.service';
import { DraftsService } from './drafts.service';

@Controller('api/v1')
export class CalculationsController {
  constructor(
    private readonly calculations: CalculationsService,
    private readonly reviews: ReviewsService,
    private readonly drafts: DraftsService,
  ) {}

  /** Saves the owner's draft of the design (insert-only: a new row each time; the newest is the draft). Never reviewed. */
  @Put('calculations/:id/draft')
  @Roles('author')
  @HttpCode(200)
  saveDraft(@Param('id') calculationId: string, @Body() body: unknown, @CurrentActor() actor: Actor) {
    return this.drafts.save(calculationId, body, actor);
  }

  /** The owner's newest draft of the design (404 when there is none). */
  @Get('calculations/:id/draft')
  @Roles('author')
  draft(@Param('id') calculationId: string, @CurrentActor() actor: Actor) {
    return this.drafts.get(calculationId, actor);
  }

  /** Opens a calculation (one screw position) with revision 1. */
  @Post('products/:id/calculations')
  @Roles('author')
  @UserLimit('submissions')
  async open(
    @Param('id') productId: string,
    @Body() body: unknown,
    @CurrentActor() actor: Actor | null,
    @Headers('idempotency-key') key: string | undefined,
    @Res({ passthrough: true }) reply: FastifyReply,
  ) {
    const r = await this.calculations.open(productId, body, actor, key);
    reply.status(r.status);
    return r.body;
  }

  @Get('calculations/:id')
  get(@Param('id') id: string) {
    return this.calculations.get(id);
  }

  /** Adds the next revision; the previous one becomes superseded. */
  @Post('calculations/:id/revisions')
  @Roles('author')
  @UserLimit('submissions')
  async addRevision(
    @Param('id') calculationId: string,
    @Body() body: unknown,
    @CurrentActor() actor: Actor | null,
    @Headers('idempotency-key') key: string | undefined,
    @Res({ passthrough: true }) reply: FastifyReply,
  ) {
    const r = await this.calculations.addRevision(calculationId, body, actor, key);
    reply.status(r.status);
    return r.body;
  }

  /** An admin hands the calculation to another author (a chained, audited event); only its owner may add revisions. */
  @Post('calculations/:id/reassignments')
  @Roles('admin')
  @HttpCode(201)
  reassign(@Param('id') calculationId: string, @Body() body: unknown, @CurrentActor() actor: Actor) {
    return this.calculations.reassign(calculationId, body, actor);
  }

  /** A calculation's revisions, oldest first, cursor-paged (after, limit; view=summary for long histories). */
  @Get('calculations/:id/revisions')
  async revisions(@Param('id') calculationId: string, @Query() query: unknown) {
    const page = await this.calculations.revisionsPage(calculationId, query);
    if (page.items.length === 0) return page;
    const states = await this.reviews.statesOfCalculation(calculationId, { from: page.items[0].revision, to: page.items[page.items.length - 1].revision });
    // full items carry what GET /revisions/:id carries, remarks included (one read for the page)
    const remarks = 'evaluation' in page.items[0] ? await this.reviews.remarksOf(page.items.map((r) => r.id)) : null;
    // A full revision carries its checks as GET /revisions/:id does (derived from the record under its rule set)
    const checks = await Promise.all(page.items.map((r) => ('evaluation' in r ? this.calculations.checksOf(r) : null)));
    return {
      items: page.items.map((r, i) => {
        const s = states.get(r.id)!;
        const c = checks[i];
        return c === null
          ? { ...r, review: { state: s.state, decidedBy: s.decidedBy, decidedAt: s.decidedAt, signature: s.signature } }
          : { ...r, checks: c.checks, governing: c.governing, remarks: remarks?.get(r.id) ?? [], review: { state: s.state, decidedBy: s.decidedBy, decidedAt: s.decidedAt, signature: s.signature } };
      }),
      nextCursor: page.nextCursor,
    };
  }

  /** One revision: input as submitted, evaluation, findings, versions and hashes; its review state and what was said on it. */
  @Get('revisions/:id')
  async revision(@Param('id') id: string) {
    const [record, review, remarks] = await Promise.all([this.calculations.revision(id), this.reviews.state(id), this.reviews.remarks(id)]);
    const { checks, governing } = await this.calculations.checksOf(record);
    return {
      ...record, checks, governing, remarks, review: { state: review.state, decidedBy: review.decidedBy, decidedAt: review.decidedAt, signature: review.signature },
      inputFields: designInputFields(record.input),
    };
  }
}

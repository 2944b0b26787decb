import { Body, Controller, Get, Headers, Param, Post, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import type { Actor } from '@leadline/contracts';
import { CurrentActor } from '../infra/http/actor';
import { CalculationsService } from './calculations.service';

@Controller('api/v1')
export class CalculationsController {
  constructor(private readonly calculations: CalculationsService) {}

  /** Opens a calculation (one screw position) with revision 1. */
  @Post('products/:id/calculations')
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

  @Get('calculations/:id/revisions')
  async revisions(@Param('id') calculationId: string) {
    return { items: await this.calculations.revisions(calculationId) };
  }

  /** One revision: input as submitted, evaluation, findings, versions and hashes. */
  @Get('revisions/:id')
  revision(@Param('id') id: string) {
    return this.calculations.revision(id);
  }
}

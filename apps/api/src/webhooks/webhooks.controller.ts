import { Body, Controller, Get, HttpCode, Param, Post } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';
import { CurrentActor } from '../infra/http/actor';
import { Roles } from '../identities/auth.guard';
import { WebhooksService } from './webhooks.service';

/** Admin API for webhook endpoints (Standard Webhooks); the secret is in the answer to create and rotate only. */
@Controller('api/v1/webhooks')
@Roles('admin')
export class WebhooksController {
  constructor(private readonly webhooks: WebhooksService) {}

  @Post()
  create(@Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.webhooks.create(body, actor?.id ?? null);
  }

  @Get()
  async list() {
    return { items: await this.webhooks.list() };
  }

  @Get(':id')
  get(@Param('id') id: string) {
    return this.webhooks.get(id);
  }

  @Post(':id/disable')
  @HttpCode(200)
  disable(@Param('id') id: string) {
    return this.webhooks.disable(id);
  }

  @Post(':id/rotate')
  @HttpCode(200)
  rotate(@Param('id') id: string) {
    return this.webhooks.rotate(id);
  }

  /** Every delivery attempt to the endpoint, newest first: status, error, outcome and the next attempt's time. */
  @Get(':id/attempts')
  async attempts(@Param('id') id: string) {
    return { items: await this.webhooks.attempts(id) };
  }
}

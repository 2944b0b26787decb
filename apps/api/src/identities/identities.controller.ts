import { Body, Controller, Get, HttpCode, Param, Post } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';
import { CurrentActor } from '../infra/http/actor';
import { Roles } from './auth.guard';
import { IdentitiesService } from './identities.service';

/** Admin API for users and tokens. */
@Controller('api/v1/users')
@Roles('admin')
export class IdentitiesController {
  constructor(private readonly identities: IdentitiesService) {}

  @Post()
  create(@Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.identities.createUser(body, actor?.id ?? null);
  }

  @Get()
  async list() {
    return { items: await this.identities.listUsers() };
  }

  /** Returns {token} once; only its hash is kept. */
  @Post(':id/tokens')
  issue(@Param('id') id: string, @Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.identities.issueToken(id, body, actor?.id ?? null);
  }

  @Get(':id/tokens')
  async tokens(@Param('id') id: string) {
    return { items: await this.identities.listTokens(id) };
  }

  @Post(':id/tokens/:tokenId/revoke')
  @HttpCode(200)
  revoke(@Param('id') id: string, @Param('tokenId') tokenId: string, @CurrentActor() actor: Actor | null) {
    return this.identities.revokeToken(id, tokenId, actor?.id ?? null);
  }
}

import { Body, Controller, Get, HttpCode, Param, Post, Query } from '@nestjs/common';
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
    return this.identities.createUser(body, actor);
  }

  @Get()
  async list() {
    return { items: await this.identities.listUsers() };
  }

  /** Returns {token} once (with its expiresAt); only its hash is kept. Audited. */
  @Post(':id/tokens')
  issue(@Param('id') id: string, @Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.identities.issueToken(id, body, actor);
  }

  @Get(':id/tokens')
  async tokens(@Param('id') id: string) {
    return { items: await this.identities.listTokens(id) };
  }

  @Post(':id/tokens/:tokenId/revoke')
  @HttpCode(200)
  revoke(@Param('id') id: string, @Param('tokenId') tokenId: string, @CurrentActor() actor: Actor | null) {
    return this.identities.revokeToken(id, tokenId, actor);
  }
}

/** The user-level audit: users created with their roles, tokens issued and revoked, by whom and with which token. */
@Controller('api/v1/identity-events')
@Roles('admin')
export class IdentityEventsController {
  constructor(private readonly identities: IdentitiesService) {}

  /** Newest first; ?user=<id> for one user's events, ?limit (at most 500). */
  @Get()
  async list(@Query() query: unknown) {
    return { items: await this.identities.events(query) };
  }

  /** Recomputes the identity chain (hashes, MACs, head) and the user, token and revocation rows it accounts for. */
  @Get('verify')
  verify() {
    return this.identities.verifyIdentities();
  }
}

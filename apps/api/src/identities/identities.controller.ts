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

  /** Creates a user ({name, email, roles}); the answer carries a one-time activationCode, never a password. */
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

  /** Sets the roles the user holds ({roles}); each added role is granted and each removed one revoked (audited). */
  @Post(':id/roles')
  @HttpCode(200)
  roles(@Param('id') id: string, @Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.identities.setRoles(id, body, actor);
  }

  /** Deactivates the user: their tokens and sessions stop at once; the user, their name and signatures stay. */
  @Post(':id/deactivate')
  @HttpCode(200)
  deactivate(@Param('id') id: string, @CurrentActor() actor: Actor | null) {
    return this.identities.setActive(id, false, actor);
  }

  @Post(':id/reactivate')
  @HttpCode(200)
  reactivate(@Param('id') id: string, @CurrentActor() actor: Actor | null) {
    return this.identities.setActive(id, true, actor);
  }

  /** A one-time code the admin hands to the user, who sets a new password with it; the admin never learns it. */
  @Post(':id/password-reset')
  @HttpCode(201)
  passwordReset(@Param('id') id: string, @CurrentActor() actor: Actor | null) {
    return this.identities.resetPassword(id, actor);
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

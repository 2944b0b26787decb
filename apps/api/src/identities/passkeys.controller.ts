import { Body, Controller, Get, HttpCode, Post, Req, Res } from '@nestjs/common';
import type { FastifyReply, FastifyRequest } from 'fastify';
import { Public } from './auth.guard';
import { clientKey } from './failure-limiter';
import { IdentitiesService, type Principal } from './identities.service';
import { PasskeysService } from './passkeys.service';
import { SESSION_COOKIE, setCookieHeader } from './session-cookie';

type Req = FastifyRequest & { principal?: Principal };

/**
 * Passkeys: a signed-in user adds their own (options, then the authenticator's answer), lists them, and signs in
 * with one (options, then the assertion). Signing a decision with a passkey: POST /api/v1/revisions/:id/passkey-challenges.
 */
@Controller('api/v1')
export class PasskeysController {
  constructor(
    private readonly passkeys: PasskeysService,
    private readonly identities: IdentitiesService,
  ) {}

  /** Your own passkeys. */
  @Get('account/passkeys')
  list(@Req() req: Req) {
    return this.passkeys.list(req.principal!.id).then((items) => ({ items }));
  }

  /** Options for adding a passkey (from your own page session): {challengeId, options} for navigator.credentials.create. */
  @Post('account/passkeys/options')
  @HttpCode(201)
  async registrationOptions(@Req() req: Req) {
    const p = req.principal!;
    const user = await this.identities.getUser(p.id);
    return this.passkeys.registrationOptions(p, user.email, this.passkeys.relyingParty(req.hostname));
  }

  /** Adds a passkey: {challengeId, response (the authenticator's answer, JSON), label?}; a passkey-registered identity event. */
  @Post('account/passkeys')
  @HttpCode(201)
  register(@Body() body: unknown, @Req() req: Req) {
    return this.passkeys.register(req.principal!, body, this.passkeys.relyingParty(req.hostname));
  }

  /** Options for signing in with a passkey: {challengeId, options} for navigator.credentials.get (30 a minute per address, then 429). */
  @Public()
  @Post('sessions/passkey/options')
  @HttpCode(201)
  signInOptions(@Req() req: Req, @Res({ passthrough: true }) reply: FastifyReply) {
    reply.header('cache-control', 'no-store');
    return this.passkeys.signInOptions(this.passkeys.relyingParty(req.hostname), clientKey(req.ip));
  }

  /** Signs in with a passkey: {challengeId, response}; sets the session cookie like POST /api/v1/sessions. */
  @Public()
  @Post('sessions/passkey')
  @HttpCode(201)
  async signIn(@Body() body: unknown, @Req() req: Req, @Res({ passthrough: true }) reply: FastifyReply) {
    const signed = await this.passkeys.signIn(body, clientKey(req.ip), this.passkeys.relyingParty(req.hostname));
    reply.header('set-cookie', setCookieHeader(SESSION_COOKIE, signed.cookie, req.protocol === 'https'));
    reply.header('cache-control', 'no-store');
    return { user: signed.user, expiresAt: signed.expiresAt };
  }
}

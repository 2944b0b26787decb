import { Body, Controller, Delete, HttpCode, Post, Req, Res } from '@nestjs/common';
import type { FastifyReply, FastifyRequest } from 'fastify';
import { ProblemError } from '../infra/http/problem';
import { AccountsService } from './accounts.service';
import { Public } from './auth.guard';
import { clientKey } from './failure-limiter';
import { IdentitiesService, type Principal } from './identities.service';
import { SESSION_COOKIE, setCookieHeader } from './session-cookie';

type Req = FastifyRequest & { principal?: Principal };

/** Sign-in and sign-out of the pages (a session cookie), and what a user does for their own account. */
@Controller('api/v1')
export class AccountsController {
  constructor(
    private readonly accounts: AccountsService,
    private readonly identities: IdentitiesService,
  ) {}

  /**
   * Signs in with {email, password}: sets the HttpOnly session cookie and answers who signed in. Failed attempts
   * count per client address (429 with Retry-After after ten in a minute); an account is never locked.
   */
  @Public()
  @Post('sessions')
  @HttpCode(201)
  async signIn(@Body() body: unknown, @Req() req: Req, @Res({ passthrough: true }) reply: FastifyReply) {
    const signed = await this.accounts.signIn(body, clientKey(req.ip));
    reply.header('set-cookie', setCookieHeader(SESSION_COOKIE, signed.cookie, req.protocol === 'https'));
    reply.header('cache-control', 'no-store');
    return { user: signed.user, expiresAt: signed.expiresAt };
  }

  /** Signs out of the current page session (appends its end) and clears the cookie. */
  @Delete('sessions/current')
  @HttpCode(204)
  async signOut(@Req() req: Req, @Res({ passthrough: true }) reply: FastifyReply) {
    const sessionId = req.principal?.sessionId;
    if (!sessionId) throw new ProblemError(409, 'Not a page session', 'a bearer token is revoked by an admin, not signed out');
    await this.accounts.signOut(req.principal!.credential);
    reply.removeHeader('set-cookie'); // the guard's renewed cookie
    reply.header('set-cookie', setCookieHeader(SESSION_COOKIE, '', req.protocol === 'https', 'Strict', 0));
  }

  /** Sets the caller's own password with the one-time code an admin issued ({activationCode, password}). */
  @Public()
  @Post('account/activate')
  @HttpCode(200)
  activate(@Body() body: unknown, @Req() req: Req) {
    return this.accounts.activate(body, clientKey(req.ip));
  }

  /**
   * Issues a bearer token to the signed-in user for their own API client (shown once). Only from a page session,
   * that is after the user authenticated themselves: a token cannot mint tokens, so a token issued by someone else
   * never becomes one of the user's own.
   */
  @Post('account/tokens')
  @HttpCode(201)
  ownToken(@Body() body: unknown, @Req() req: Req) {
    const p = req.principal!;
    if (!p.sessionId) throw new ProblemError(403, 'Sign in first', 'issue your own tokens from a signed-in session (POST /api/v1/sessions), not with a token');
    return this.identities.issueToken(p.id, body, { id: p.id, tokenId: p.tokenId ?? null, credential: p.credential });
  }
}

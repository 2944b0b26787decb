import { Controller, Get, Query, Req, Res } from '@nestjs/common';
import type { FastifyReply, FastifyRequest } from 'fastify';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Inject } from '@nestjs/common';
import { ProblemError } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { AccountsService } from './accounts.service';
import { Public } from './auth.guard';
import { IdentitiesService } from './identities.service';
import { OIDC_STATE_COOKIE, OidcService } from './oidc.service';
import { ReauthenticationsService } from './reauthentications.service';
import { cookieValue, SESSION_COOKIE, setCookieHeader } from './session-cookie';

/** A path of this site to return to (never another origin). */
const samePath = (next: unknown, fallback: string) => (typeof next === 'string' && /^\/(?![/\\])/.test(next) ? next : fallback);

/**
 * The browser's side of OpenID Connect: start (redirect to the provider) and callback (back from it). A login signs
 * in (a page session, method oidc); a login with purpose=sign records a fresh authentication for signing one revision.
 */
@Public()
@Controller('api/v1/auth/oidc')
export class OidcController {
  constructor(
    private readonly oidc: OidcService,
    private readonly accounts: AccountsService,
    private readonly identities: IdentitiesService,
    private readonly reauthentications: ReauthenticationsService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  private base(req: FastifyRequest): string {
    return (this.config.LEADLINE_PUBLIC_URL ?? `${req.protocol}://${req.host}`).replace(/\/$/, '');
  }

  /** ?next=<path>; ?purpose=sign&revision=<id> for a fresh login before signing that revision (max_age=0). */
  @Get('start')
  async start(@Query() query: Record<string, unknown>, @Req() req: FastifyRequest, @Res() reply: FastifyReply) {
    const purpose = query.purpose === 'sign' ? 'sign' : 'login';
    const revisionId = purpose === 'sign' ? checkUuid(String(query.revision ?? ''), 'revision') : null;
    const next = samePath(query.next, revisionId ? `/review/revisions/${revisionId}` : '/design');
    const { url, state } = await this.oidc.start(purpose, next, revisionId, `${this.base(req)}/api/v1/auth/oidc/callback`);
    // Lax: the cookie must come back on the provider's top-level redirect to the callback
    reply.header('set-cookie', setCookieHeader(OIDC_STATE_COOKIE, state, req.protocol === 'https', 'Lax', 600));
    reply.header('cache-control', 'no-store').redirect(url, 302);
  }

  @Get('callback')
  async callback(@Req() req: FastifyRequest, @Res() reply: FastifyReply) {
    const secure = req.protocol === 'https';
    const cookies = [setCookieHeader(OIDC_STATE_COOKIE, '', secure, 'Lax', 0)];
    const url = new URL(req.url, this.base(req));
    let target: string;
    try {
      if (url.searchParams.get('error')) throw new ProblemError(401, 'Identity provider refused', url.searchParams.get('error_description') ?? url.searchParams.get('error')!);
      const { pending, identity } = await this.oidc.finish(url, cookieValue(req.headers.cookie, OIDC_STATE_COOKIE));
      const user = await this.identities.providerUser(identity);
      if (pending.purpose === 'login') {
        const signed = await this.accounts.startSession({ id: user.id, name: user.name, email: user.email, roles: user.roles }, 'oidc', identity.authTime);
        cookies.push(setCookieHeader(SESSION_COOKIE, signed.cookie, secure));
        target = pending.next;
      } else {
        const recorded = await this.reauthentications.record(user.id, pending.revisionId!, pending.startedAt, identity.authTime);
        target = `${pending.next}#${recorded ? 'signed-at-provider' : 'provider-login-too-old'}`;
      }
    } catch (err) {
      const detail = err instanceof ProblemError ? err.message : 'the identity provider\'s answer was not accepted';
      target = `/sign-in?refused=${encodeURIComponent(detail)}`;
    }
    reply.header('set-cookie', cookies).header('cache-control', 'no-store').redirect(target, 302);
  }
}

/**
 * Every route needs a bearer token or a page session cookie (with its CSRF token on state-changing requests) unless
 * marked @Public(); @Roles(...) names who may call it.
 * Unauthenticated: 401. Wrong role: 403. Repeated failures from one address: 429 (with Retry-After) for the rest of
 * the window, for failures only; a valid token is always accepted.
 */
import { CanActivate, ExecutionContext, Inject, Injectable, SetMetadata } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { FastifyReply, FastifyRequest } from 'fastify';
import { AccountsService, SessionRefused } from './accounts.service';
import { ProblemError } from '../infra/http/problem';
import { CLOCK, type Clock } from '../infra/clock';
import { Database } from '../infra/database/database.service';
import { clientKey, FailureLimiter } from './failure-limiter';
import { IdentitiesService, type Principal, type Role } from './identities.service';

export { clientKey, FailureLimiter } from './failure-limiter';
import { cookieValue, CSRF_HEADER, sameText, SESSION_COOKIE, setCookieHeader } from './session-cookie';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export const PUBLIC = 'leadline:public';
export const ROLES_KEY = 'leadline:roles';
export const Public = () => SetMetadata(PUBLIC, true);
export const Roles = (...roles: Role[]) => SetMetadata(ROLES_KEY, roles);

@Injectable()
export class AuthGuard implements CanActivate {
  /** Failed bearer tokens and forged session cookies per client address, shared by every instance */
  readonly limiter: FailureLimiter;

  constructor(
    private readonly reflector: Reflector,
    private readonly identities: IdentitiesService,
    private readonly accounts: AccountsService,
    db: Database,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    this.limiter = new FailureLimiter(db, 'authentication');
  }

  async canActivate(ctx: ExecutionContext): Promise<boolean> {
    const targets = [ctx.getHandler(), ctx.getClass()];
    if (this.reflector.getAllAndOverride<boolean>(PUBLIC, targets)) return true;
    const req = ctx.switchToHttp().getRequest<FastifyRequest & { actor?: { id: string; name: string }; principal?: Principal }>();
    const client = clientKey(req.ip);
    const header = req.headers.authorization;
    const token = typeof header === 'string' && header.startsWith('Bearer ') ? header.slice(7).trim() : '';
    const session = token ? null : cookieValue(req.headers.cookie, SESSION_COOKIE);
    let principal: Principal | null = null;
    let refused = token ? 'the bearer token is unknown or revoked, or has expired' : 'sign in, or send Authorization: Bearer <token>';
    if (token) {
      // A valid token is never refused because of earlier failures from its address: look it up first.
      principal = await this.identities.authenticate(token);
    } else if (session) {
      try {
        const resolved = await this.accounts.resolveSession(session);
        principal = resolved.principal;
        const reply = ctx.switchToHttp().getResponse<FastifyReply>();
        reply.header('set-cookie', setCookieHeader(SESSION_COOKIE, resolved.cookie, req.protocol === 'https'));
        (req as { authTime?: number }).authTime = resolved.authTime;
      } catch (err) {
        if (!(err instanceof SessionRefused)) throw err;
        refused = err.message;
        ctx.switchToHttp().getResponse<FastifyReply>().header('set-cookie', setCookieHeader(SESSION_COOKIE, '', req.protocol === 'https', 'Strict', 0));
      }
    }
    if (!principal) {
      const wait = await this.limiter.blocked(client, this.clock.now());
      if (wait > 0) {
        throw new ProblemError(429, 'Too many failed authentications', `too many failed authentications from this address; try again in ${wait} s`, { retryAfter: wait });
      }
      // an expired or signed-out session is not a guess: only bad tokens and forged cookies count as failures
      if (token || refused === 'the session is unknown' || refused.startsWith('the session cookie')) await this.limiter.fail(client, this.clock.now());
      throw new ProblemError(401, 'Authentication required', refused);
    }
    // A page session's state-changing request must carry the session's CSRF token (OWASP CSRF Prevention Cheat
    // Sheet: synchronizer token in a custom header); bearer-token clients are not exposed to CSRF.
    if (principal.sessionId && !SAFE_METHODS.has(req.method)) {
      const sent = req.headers[CSRF_HEADER];
      if (typeof sent !== 'string' || !principal.csrfToken || !sameText(sent, principal.csrfToken)) {
        throw new ProblemError(403, 'CSRF token missing or wrong', `send the csrfToken of GET /api/v1/me as the ${CSRF_HEADER} header`, {
          errors: [{ path: `(header ${CSRF_HEADER})`, message: 'missing or not this session\'s' }],
        });
      }
    }
    req.principal = principal;
    req.actor = { id: principal.id, name: principal.name };
    const allowed = this.reflector.getAllAndOverride<Role[]>(ROLES_KEY, targets);
    if (allowed && !allowed.some((r) => principal.roles.includes(r))) {
      throw new ProblemError(403, 'Not permitted', `this action needs the role ${allowed.join(' or ')}`);
    }
    return true;
  }
}

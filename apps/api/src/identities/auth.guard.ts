/**
 * Every route needs a bearer token unless marked @Public(); @Roles(...) names who may call it.
 * Unauthenticated: 401. Wrong role: 403. Repeated failures from one address: 429 for the rest of the window.
 */
import { CanActivate, ExecutionContext, Injectable, SetMetadata } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { FastifyRequest } from 'fastify';
import { ProblemError } from '../infra/http/problem';
import { IdentitiesService, type Principal, type Role } from './identities.service';

export const PUBLIC = 'leadline:public';
export const ROLES_KEY = 'leadline:roles';
export const Public = () => SetMetadata(PUBLIC, true);
export const Roles = (...roles: Role[]) => SetMetadata(ROLES_KEY, roles);

/** Fixed-window counter of failed authentications per client address. */
export class FailureLimiter {
  private readonly windows = new Map<string, { start: number; failures: number }>();
  constructor(
    readonly maxFailures = 10,
    readonly windowMs = 60_000,
  ) {}

  blocked(key: string, now = Date.now()): number {
    const w = this.windows.get(key);
    if (!w || now - w.start >= this.windowMs) return 0;
    return w.failures >= this.maxFailures ? Math.ceil((w.start + this.windowMs - now) / 1000) : 0;
  }

  fail(key: string, now = Date.now()): void {
    const w = this.windows.get(key);
    if (!w || now - w.start >= this.windowMs) {
      if (this.windows.size > 50_000) this.windows.clear();
      this.windows.set(key, { start: now, failures: 1 });
    } else w.failures++;
  }
}

@Injectable()
export class AuthGuard implements CanActivate {
  readonly limiter = new FailureLimiter();

  constructor(
    private readonly reflector: Reflector,
    private readonly identities: IdentitiesService,
  ) {}

  async canActivate(ctx: ExecutionContext): Promise<boolean> {
    const targets = [ctx.getHandler(), ctx.getClass()];
    if (this.reflector.getAllAndOverride<boolean>(PUBLIC, targets)) return true;
    const req = ctx.switchToHttp().getRequest<FastifyRequest & { actor?: { id: string; name: string }; principal?: Principal }>();
    const client = req.ip ?? 'unknown';
    const wait = this.limiter.blocked(client);
    if (wait > 0) {
      throw new ProblemError(429, 'Too many failed authentications', `try again in ${wait} s`, { retryAfter: wait });
    }
    const header = req.headers.authorization;
    const token = typeof header === 'string' && header.startsWith('Bearer ') ? header.slice(7).trim() : '';
    const principal = token ? await this.identities.authenticate(token) : null;
    if (!principal) {
      this.limiter.fail(client);
      throw new ProblemError(401, 'Authentication required', token ? 'the bearer token is unknown or revoked' : 'send Authorization: Bearer <token>');
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

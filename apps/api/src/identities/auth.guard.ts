/**
 * Every route needs a bearer token unless marked @Public(); @Roles(...) names who may call it.
 * Unauthenticated: 401. Wrong role: 403. Repeated failures from one address: 429 (with Retry-After) for the rest of
 * the window, for failures only; a valid token is always accepted.
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

/**
 * Fixed-window counter of failed authentications per client address. Only failures are counted, and only
 * failures are refused: a valid token is accepted whatever its address did. Memory is bounded: when the
 * table is full, windows that have ended go first, then the oldest running one (the nearest to its end),
 * one at a time, so a flood of new addresses never wipes every other address's count at once.
 */
export class FailureLimiter {
  // Insertion order is window-start order: a new window is always (re)inserted at the end.
  private readonly windows = new Map<string, { start: number; failures: number }>();
  constructor(
    readonly maxFailures = 10,
    readonly windowMs = 60_000,
    readonly maxEntries = 10_000,
  ) {}

  /** Addresses currently tracked. */
  get size(): number {
    return this.windows.size;
  }

  /** Seconds until this address may fail again, or 0 when it is not limited. */
  blocked(key: string, now = Date.now()): number {
    const w = this.windows.get(key);
    if (!w || now - w.start >= this.windowMs) return 0;
    return w.failures >= this.maxFailures ? Math.max(1, Math.ceil((w.start + this.windowMs - now) / 1000)) : 0;
  }

  fail(key: string, now = Date.now()): void {
    const w = this.windows.get(key);
    if (w && now - w.start < this.windowMs) {
      w.failures++;
      return;
    }
    this.windows.delete(key);
    if (this.windows.size >= this.maxEntries) this.evict(now);
    this.windows.set(key, { start: now, failures: 1 });
  }

  private evict(now: number): void {
    for (const [k, w] of this.windows) {
      if (now - w.start < this.windowMs) break;
      this.windows.delete(k);
    }
    if (this.windows.size >= this.maxEntries) {
      const oldest = this.windows.keys().next();
      if (!oldest.done) this.windows.delete(oldest.value);
    }
  }
}

/**
 * The limiter's key for a client address: IPv4 as is, IPv6 by its /64 network (one host can hold a whole
 * /64, so counting single IPv6 addresses would let it rotate past the limit).
 */
export function clientKey(ip: string | undefined): string {
  if (!ip) return 'unknown';
  const v4 = /^(?:::ffff:)?(\d{1,3}(?:\.\d{1,3}){3})$/i.exec(ip);
  if (v4) return v4[1];
  if (!ip.includes(':')) return ip;
  const [head, tail = ''] = ip.toLowerCase().split('%')[0].split('::');
  const left = head ? head.split(':') : [];
  const right = ip.includes('::') && tail ? tail.split(':') : [];
  const groups = ip.includes('::') ? [...left, ...Array(Math.max(0, 8 - left.length - right.length)).fill('0'), ...right] : left;
  return `${groups.slice(0, 4).map((g) => g.replace(/^0+(?=.)/, '')).join(':')}::/64`;
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
    const client = clientKey(req.ip);
    const header = req.headers.authorization;
    const token = typeof header === 'string' && header.startsWith('Bearer ') ? header.slice(7).trim() : '';
    // A valid token is never refused because of earlier failures from its address: look it up first.
    const principal = token ? await this.identities.authenticate(token) : null;
    if (!principal) {
      const wait = this.limiter.blocked(client);
      if (wait > 0) {
        throw new ProblemError(429, 'Too many failed authentications', `too many failed authentications from this address; try again in ${wait} s`, { retryAfter: wait });
      }
      this.limiter.fail(client);
      throw new ProblemError(401, 'Authentication required', token ? 'the bearer token is unknown or revoked, or has expired' : 'send Authorization: Bearer <token>');
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

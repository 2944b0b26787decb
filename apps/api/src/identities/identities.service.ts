/**
 * Users, roles and bearer tokens. A token is 32 random bytes shown once; only its SHA-256 is stored.
 * Every token expires (LEADLINE_TOKEN_TTL_DAYS unless the issuer asks for less). Revocation appends a row and
 * clears this process's cache, so it takes effect at once here (other instances of a multi-instance deployment
 * stop accepting it within TOKEN_CACHE_MS). Creating a user (granting its roles), issuing and revoking a token
 * are appended to identity_events, with the acting user and the token they acted with.
 */
import { Injectable, OnModuleInit, Inject, Logger } from '@nestjs/common';
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { z } from 'zod';
import { displayableName } from '@leadline/contracts';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { CLOCK, type Clock } from '../infra/clock';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode, type Queryer } from '../infra/database/database.service';
import { notFound, ProblemError, validate, ValidationProblem } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { TS_TEXT } from '../records/chain';

export const ROLES = ['author', 'reviewer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** How the caller proved who they are on this request. */
export type AuthMethod = 'token' | 'password' | 'oidc';

export interface Principal {
  id: string;
  name: string;
  roles: Role[];
  /** The bearer token presented (null for a page session) */
  tokenId: string | null;
  /** Who issued that token (null: the service itself, at bootstrap) */
  tokenIssuedBy?: string | null;
  /** The page session (null for a bearer token) */
  sessionId?: string | null;
  authMethod: AuthMethod;
  /** The page session's CSRF token (sessions only) */
  csrfToken?: string | null;
}

/** An email address as a sign-in name: one @, something either side, no spaces (RFC 5321 §4.5.3.1.3 limits length to 254). */
export const emailSchema = z
  .string()
  .trim()
  .min(3)
  .max(254)
  .regex(/^[^\s@]+@[^\s@]+$/, 'an email address (name@domain)');

export const createUserSchema = z.strictObject({
  name: z.string().min(1).max(120).superRefine(displayableName).describe('printed name, as it appears on signatures; never changed'),
  email: emailSchema.optional().describe('sign-in name, unique (compared without case); a user without one has no password and uses tokens only'),
  roles: z.array(z.enum(ROLES)).min(1).max(3),
});

export const setRolesSchema = z.strictObject({ roles: z.array(z.enum(ROLES)).max(3).describe('the roles the user holds from now on') });

/**
 * SQL: the roles user `u` holds now: per role, the newest role-granted/role-revoked event decides; a role without
 * any event counts as granted when the user row was created with it (users created before role events existed).
 */
export const CURRENT_ROLES = (u: string) => `ARRAY(SELECT r FROM unnest(ARRAY['author', 'reviewer', 'admin']) AS r WHERE COALESCE(
    (SELECT ce.type = 'role-granted' FROM identity_events ce WHERE ce.subject_user_id = ${u}.id AND ce.type IN ('role-granted', 'role-revoked')
        AND ce.data->>'role' = r ORDER BY ce.created_at DESC, ce.id DESC LIMIT 1),
    r = ANY (${u}.roles)))`;

/** SQL: user `u` is active (not deactivated by its newest deactivation/reactivation event). */
export const USER_ACTIVE = (u: string) => `NOT COALESCE((SELECT ae.type = 'user-deactivated' FROM identity_events ae
    WHERE ae.subject_user_id = ${u}.id AND ae.type IN ('user-deactivated', 'user-reactivated') ORDER BY ae.created_at DESC, ae.id DESC LIMIT 1), false)`;

export const MAX_TOKEN_DAYS = 3650;

export const createTokenSchema = z
  .strictObject({
    label: z.string().max(120).optional(),
    expiresInDays: z.number().int().min(1).max(MAX_TOKEN_DAYS).optional().describe('lifetime in days (default LEADLINE_TOKEN_TTL_DAYS)'),
    expiresAt: z.iso.datetime({ offset: true }).optional().describe('expiry as an ISO 8601 time in the future (instead of expiresInDays)'),
  })
  .refine((b) => !(b.expiresInDays !== undefined && b.expiresAt !== undefined), { message: 'give expiresInDays or expiresAt, not both', path: ['expiresAt'] })
  .optional();

export const identityEventsQuerySchema = z.object({
  user: z.string().optional().describe('only events about this user id'),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

/** Who acts on identities: a user, with the id of the token they presented (null for the service itself). */
export type IdentityActor = { id: string; tokenId?: string | null } | null;

const actorTokenId = (actor: IdentityActor): string | null => (actor as { tokenId?: string | null } | null)?.tokenId ?? null;

export const TOKEN_CACHE_MS = 2000;
const DAY_MS = 86_400_000;

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

@Injectable()
export class IdentitiesService implements OnModuleInit {
  private readonly logger = new Logger('identities');
  private readonly cache = new Map<string, { principal: Principal | null; until: number }>();
  private readonly ttlDays: number;

  constructor(
    private readonly db: Database,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    this.ttlDays = config.LEADLINE_TOKEN_TTL_DAYS;
  }

  /**
   * Bootstraps the first admin of a fresh deployment from LEADLINE_ADMIN_TOKEN. Once an admin exists the variable
   * is ignored, unless no admin holds a live token any more (all expired or revoked): then a new value of it
   * restores admin access (audited), so expiry can never lock a deployment out for good.
   */
  async onModuleInit(): Promise<void> {
    const token = this.config.LEADLINE_ADMIN_TOKEN;
    if (!token) return;
    const admins = await this.db.query<{ id: string }>(`SELECT id FROM users u WHERE 'admin' = ANY (${CURRENT_ROLES('u')}) ORDER BY created_at, id LIMIT 1`);
    if (admins.length === 0) {
      const user = await this.insertUser({ name: 'Administrator (bootstrap)', email: null, roles: ['admin'] }, null);
      await this.storeToken(user.id, token, 'bootstrap (LEADLINE_ADMIN_TOKEN)', null, null);
      this.logger.log(`bootstrap admin created (${user.id})`);
      return;
    }
    const live = await this.db.query(
      `SELECT 1 FROM tokens t JOIN users u ON u.id = t.user_id
        WHERE 'admin' = ANY (${CURRENT_ROLES('u')}) AND ${USER_ACTIVE('u')} AND ${this.liveSql('t')} LIMIT 1`,
      [this.ttlDays, this.nowIso()],
    );
    if (live.length > 0) return;
    const known = await this.db.query(`SELECT 1 FROM tokens WHERE token_hash = $1`, [hashToken(token)]);
    if (known.length > 0) {
      this.logger.warn('no admin holds a live token and LEADLINE_ADMIN_TOKEN has expired or was revoked: set a new value to restore admin access');
      return;
    }
    await this.storeToken(admins[0].id, token, 'bootstrap recovery (LEADLINE_ADMIN_TOKEN)', null, null);
    this.logger.warn(`no admin held a live token: LEADLINE_ADMIN_TOKEN restored admin access for ${admins[0].id}`);
  }

  /** The service clock's time, as a query parameter: expiry is decided by the service clock, not the database's. */
  private nowIso(): string {
    return new Date(this.clock.now()).toISOString();
  }

  /**
   * SQL: the token aliased `t` is neither revoked nor expired ($1 = default lifetime in days, for tokens without a
   * stored expiry; `now` = the parameter holding the service clock's time).
   */
  private liveSql(t: string, now = '$2'): string {
    return `NOT EXISTS (SELECT 1 FROM token_revocations r WHERE r.token_id = ${t}.id)
            AND COALESCE(${t}.expires_at, ${t}.created_at + make_interval(days => $1::int)) > ${now}::timestamptz`;
  }

  /**
   * Creates a user with an email and roles, and a one-time activation code (returned once, stored as SHA-256) with
   * which the user sets their own password (POST /api/v1/account/activate). The creation, each role and the code
   * are audited in the same transaction.
   */
  async createUser(body: unknown, actor: IdentityActor) {
    const input = validate(createUserSchema, body);
    return this.insertUser({ ...input, email: input.email ?? null }, actor);
  }

  /**
   * The user an identity provider vouches for, by email: created on first sign-in (no activation code: they never
   * get a local password), with the roles of the provider's role claim, which then decides their roles at each
   * sign-in (changes are identity events by the service). A deactivated user stays refused.
   */
  async providerUser(identity: { email: string; name: string; roles: Role[] }) {
    const [found] = await this.db.query<{ id: string }>(`SELECT id FROM users WHERE lower(email) = lower($1)`, [identity.email]);
    if (!found) return this.insertUser({ ...identity, activation: false }, null);
    const user = await this.getUser(found.id);
    if (!user.active) throw new ProblemError(403, 'User deactivated', 'this account is deactivated; ask an admin');
    const same = user.roles.length === identity.roles.length && identity.roles.every((r) => user.roles.includes(r));
    return same ? user : this.setRoles(user.id, { roles: identity.roles }, null);
  }

  private async insertUser(input: { name: string; email: string | null; roles: Role[]; activation?: boolean }, actor: IdentityActor) {
    const id = randomUUID();
    const roles = [...new Set(input.roles)];
    let activation: { activationCode: string; activationExpiresAt: string } | null = null;
    await this.db.transaction(async (q) => {
      if (input.email !== null) {
        const taken = await q.query(`SELECT 1 FROM users WHERE lower(email) = lower($1)`, [input.email]);
        if (taken.length > 0) throw new ProblemError(409, 'Email in use', `${input.email} belongs to another user`, { errors: [{ path: 'email', message: 'already belongs to another user' }] });
      }
      try {
        await q.query(`INSERT INTO users (id, name, email, roles, created_by) VALUES ($1, $2, $3, $4, $5)`, [id, input.name, input.email, roles, actor?.id ?? null]);
      } catch (err) {
        if (pgErrorCode(err) === PG_UNIQUE_VIOLATION) throw new ProblemError(409, 'Email in use', `${input.email} belongs to another user`, { errors: [{ path: 'email', message: 'already belongs to another user' }] });
        throw err;
      }
      await this.audit(q, 'user-created', actor, id, null, { name: input.name, email: input.email, roles });
      for (const role of roles) await this.audit(q, 'role-granted', actor, id, null, { role });
      if (input.email !== null && input.activation !== false) activation = await this.issueCode(q, id, 'activation', actor);
    });
    const user = await this.getUser(id);
    const code = activation as { activationCode: string; activationExpiresAt: string } | null;
    return { ...user, activationCode: code?.activationCode ?? null, activationExpiresAt: code?.activationExpiresAt ?? null };
  }

  /** A one-time code for the user to set their password (activation or reset); only its SHA-256 is stored. */
  private async issueCode(q: Queryer, userId: string, purpose: 'activation' | 'reset', actor: IdentityActor) {
    const code = `act_${randomBytes(24).toString('base64url')}`;
    const id = randomUUID();
    const expiresAt = new Date(this.clock.now() + this.config.LEADLINE_ACTIVATION_HOURS * 3_600_000).toISOString();
    await q.query(`INSERT INTO activation_codes (id, user_id, code_hash, purpose, expires_at, created_by) VALUES ($1, $2, $3, $4, $5, $6)`, [
      id, userId, hashToken(code), purpose, expiresAt, actor?.id ?? null,
    ]);
    await this.audit(q, purpose === 'activation' ? 'activation-issued' : 'password-reset-issued', actor, userId, null, { codeId: id, expiresAt });
    return { activationCode: code, activationExpiresAt: expiresAt };
  }

  /**
   * A password reset: a new one-time code the admin hands to the user, who sets the new password with it. The admin
   * never sets or learns the password; the old one keeps working until the user sets the new one.
   */
  async resetPassword(userId: string, actor: IdentityActor) {
    const user = await this.getUser(userId);
    if (!user.email) throw new ProblemError(409, 'No account', 'this user has no email and so no password; create an account with an email');
    if (!user.active) throw new ProblemError(409, 'User deactivated', 'reactivate the user first');
    return this.db.transaction((q) => this.issueCode(q, user.id, 'reset', actor));
  }

  /** Sets the roles a user holds: each role added is granted, each removed revoked (audited, in one transaction). */
  async setRoles(userId: string, body: unknown, actor: IdentityActor) {
    const input = validate(setRolesSchema, body);
    const user = await this.getUser(userId);
    const wanted = new Set(input.roles);
    if (actor && actor.id === user.id && user.roles.includes('admin') && !wanted.has('admin')) {
      throw new ProblemError(409, 'Own admin role', 'an admin cannot revoke their own admin role; ask another admin', { errors: [{ path: 'roles', message: 'must keep admin for yourself' }] });
    }
    await this.db.transaction(async (q) => {
      for (const role of ROLES) {
        if (wanted.has(role) && !user.roles.includes(role)) await this.audit(q, 'role-granted', actor, user.id, null, { role });
        if (!wanted.has(role) && user.roles.includes(role)) await this.audit(q, 'role-revoked', actor, user.id, null, { role });
      }
    });
    this.cache.clear();
    return this.getUser(user.id);
  }

  /** Deactivates (active=false) or reactivates a user; never deletes or renames. Tokens and sessions stop at once here. */
  async setActive(userId: string, active: boolean, actor: IdentityActor) {
    const user = await this.getUser(userId);
    if (!active && actor && actor.id === user.id) throw new ProblemError(409, 'Own account', 'an admin cannot deactivate themselves; ask another admin');
    if (user.active !== active) await this.db.transaction((q) => this.audit(q, active ? 'user-reactivated' : 'user-deactivated', actor, user.id, null, {}));
    this.cache.clear();
    return this.getUser(user.id);
  }

  /** The user's own record of a password set with a code (the acting user is the user themselves). */
  async auditPasswordSet(q: Queryer, userId: string, data: Record<string, unknown>): Promise<void> {
    await this.audit(q, 'password-set', { id: userId, tokenId: null }, userId, null, data);
  }

  private async audit(q: Queryer, type: string, actor: IdentityActor, subjectUserId: string, tokenId: string | null, data: Record<string, unknown>): Promise<void> {
    await q.query(
      `INSERT INTO identity_events (id, type, actor_id, actor_token_id, subject_user_id, token_id, data) VALUES ($1, $2, $3, $4, $5, $6, $7)`,
      [randomUUID(), type, actor?.id ?? null, actorTokenId(actor), subjectUserId, tokenId, JSON.stringify(data)],
    );
  }

  /** The user-level audit, newest first. */
  async events(query: unknown) {
    const q = validate(identityEventsQuerySchema, query);
    const user = q.user === undefined ? null : checkUuid(q.user, 'user');
    return this.db.query(
      `SELECT e.id, e.type, e.actor_id AS "actorId", a.name AS "actorName", e.actor_token_id AS "actorTokenId",
              e.subject_user_id AS "subjectUserId", s.name AS "subjectName", e.token_id AS "tokenId", e.data, ${TS_TEXT('e.created_at')} AS "createdAt"
         FROM identity_events e JOIN users s ON s.id = e.subject_user_id LEFT JOIN users a ON a.id = e.actor_id
        WHERE ($1::uuid IS NULL OR e.subject_user_id = $1::uuid)
        ORDER BY e.created_at DESC, e.id DESC LIMIT $2`,
      [user, q.limit],
    );
  }

  /** SQL select list of a user as the API shows it (alias u). */
  private static readonly USER_COLUMNS = `u.id, u.name, u.email, ${CURRENT_ROLES('u')} AS roles, ${USER_ACTIVE('u')} AS active,
      EXISTS (SELECT 1 FROM password_credentials pc WHERE pc.user_id = u.id) AS "hasPassword", ${TS_TEXT('u.created_at')} AS "createdAt"`;

  async getUser(id: string) {
    const rows = await this.db.query<{ id: string; name: string; email: string | null; roles: Role[]; active: boolean; hasPassword: boolean; createdAt: string }>(
      `SELECT ${IdentitiesService.USER_COLUMNS} FROM users u WHERE u.id = $1`,
      [checkUuid(id, 'user')],
    );
    if (rows.length === 0) throw notFound(`user ${id}`);
    return rows[0];
  }

  async listUsers() {
    return this.db.query(`SELECT ${IdentitiesService.USER_COLUMNS} FROM users u ORDER BY u.created_at, u.id`);
  }

  /**
   * Issues a new random token for a user; the token is returned once and never stored. It expires after
   * expiresInDays, at expiresAt, or by default after LEADLINE_TOKEN_TTL_DAYS (at most MAX_TOKEN_DAYS).
   */
  async issueToken(userId: string, body: unknown, actor: IdentityActor, options: { ttlMs?: number } = {}): Promise<{ id: string; token: string; expiresAt: string }> {
    const user = await this.getUser(userId);
    if (!user.active) throw new ProblemError(409, 'User deactivated', 'a deactivated user gets no token');
    const input = validate(createTokenSchema, body) ?? {};
    const now = this.clock.now();
    let expiresAt: Date;
    if (input.expiresAt !== undefined) {
      expiresAt = new Date(input.expiresAt);
      if (!(expiresAt.getTime() > now)) throw new ValidationProblem([{ path: 'expiresAt', message: 'must lie in the future' }]);
      if (expiresAt.getTime() > now + MAX_TOKEN_DAYS * DAY_MS) throw new ValidationProblem([{ path: 'expiresAt', message: `must lie within ${MAX_TOKEN_DAYS} days` }]);
    } else {
      expiresAt = new Date(now + (input.expiresInDays !== undefined ? input.expiresInDays * DAY_MS : (options.ttlMs ?? this.ttlDays * DAY_MS)));
    }
    const token = `ll_${randomBytes(32).toString('base64url')}`;
    const id = await this.storeToken(userId, token, input.label ?? null, actor, expiresAt);
    return { id, token, expiresAt: expiresAt.toISOString() };
  }

  private async storeToken(userId: string, token: string, label: string | null, actor: IdentityActor, expiresAt: Date | null): Promise<string> {
    const id = randomUUID();
    await this.db.transaction(async (q) => {
      await q.query(`INSERT INTO tokens (id, user_id, token_hash, label, created_by, expires_at) VALUES ($1, $2, $3, $4, $5, $6)`, [
        id, userId, hashToken(token), label, actor?.id ?? null, expiresAt ? expiresAt.toISOString() : null,
      ]);
      const [row] = await q.query<{ expires_at: string }>(
        `SELECT ${TS_TEXT('COALESCE(expires_at, created_at + make_interval(days => $2::int))')} AS expires_at FROM tokens WHERE id = $1`,
        [id, this.ttlDays],
      );
      await this.audit(q, 'token-issued', actor, userId, id, { label, expiresAt: row.expires_at, forAnotherUser: actor !== null && actor.id !== userId });
    });
    return id;
  }

  async listTokens(userId: string) {
    await this.getUser(userId);
    const expiry = 'COALESCE(t.expires_at, t.created_at + make_interval(days => $2::int))';
    return this.db.query(
      `SELECT t.id, t.label, ${TS_TEXT('t.created_at')} AS "createdAt", r.token_id IS NOT NULL AS revoked, t.created_by AS "issuedBy",
              ${TS_TEXT(expiry)} AS "expiresAt", ${expiry} <= $3::timestamptz AS expired
         FROM tokens t LEFT JOIN token_revocations r ON r.token_id = t.id WHERE t.user_id = $1 ORDER BY t.created_at`,
      [userId, this.ttlDays, this.nowIso()],
    );
  }

  async revokeToken(userId: string, tokenId: string, actor: IdentityActor): Promise<{ id: string; revoked: true }> {
    const rows = await this.db.query(`SELECT id FROM tokens WHERE id = $1 AND user_id = $2`, [checkUuid(tokenId, 'token'), checkUuid(userId, 'user')]);
    if (rows.length === 0) throw notFound(`token ${tokenId} of user ${userId}`);
    await this.db.transaction(async (q) => {
      const added = await q.query(`INSERT INTO token_revocations (token_id, revoked_by) VALUES ($1, $2) ON CONFLICT (token_id) DO NOTHING RETURNING token_id`, [tokenId, actor?.id ?? null]);
      if (added.length > 0) await this.audit(q, 'token-revoked', actor, userId, tokenId, {});
    });
    this.cache.clear();
    return { id: tokenId, revoked: true };
  }

  /** Resolves a presented bearer token to its user, or null when unknown, revoked or expired. */
  async authenticate(token: string): Promise<Principal | null> {
    const hash = hashToken(token);
    const now = this.clock.now();
    const hit = this.cache.get(hash);
    if (hit && hit.until > now) return hit.principal;
    const rows = await this.db.query<{ id: string; name: string; roles: Role[]; token_id: string; created_by: string | null; ms_left: string }>(
      `SELECT u.id, u.name, ${CURRENT_ROLES('u')} AS roles, t.id AS token_id, t.created_by,
              floor(extract(epoch FROM COALESCE(t.expires_at, t.created_at + make_interval(days => $1::int)) - $3::timestamptz) * 1000) AS ms_left
         FROM tokens t JOIN users u ON u.id = t.user_id
        WHERE t.token_hash = $2 AND ${this.liveSql('t', '$3')} AND ${USER_ACTIVE('u')}`,
      [this.ttlDays, hash, new Date(now).toISOString()],
    );
    const principal: Principal | null = rows.length
      ? { id: rows[0].id, name: rows[0].name, roles: rows[0].roles, tokenId: rows[0].token_id, tokenIssuedBy: rows[0].created_by, authMethod: 'token' }
      : null;
    if (principal) {
      // Oldest entry out first when full; a cached token is never trusted past its expiry
      if (this.cache.size >= 10000) this.cache.delete(this.cache.keys().next().value as string);
      this.cache.set(hash, { principal, until: now + Math.min(TOKEN_CACHE_MS, Number(rows[0].ms_left)) });
    }
    return principal;
  }
}

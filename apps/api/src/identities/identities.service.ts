/**
 * Users, roles and bearer tokens. A token is 32 random bytes shown once; only its keyed hash is stored
 * (HMAC-SHA256 with the record key's token key, records/record-key.ts), so a token row cannot be made from the
 * database; tokens stored before keyed hashing (plain SHA-256) are accepted until they expire, unless
 * LEADLINE_LEGACY_TOKENS=refuse. Every write goes through a record function (migrations/20261204230000) that
 * checks the acting admin's own live token.
 * Every token expires (LEADLINE_TOKEN_TTL_DAYS unless the issuer asks for less). Revocation appends a row and
 * clears this process's cache, so it takes effect at once here; other instances on PostgreSQL clear theirs when the
 * revocation's NOTIFY arrives (notifications/revocation-listener.ts), at the latest after TOKEN_CACHE_MS. Creating a user (granting its roles), issuing and revoking a token
 * are appended to identity_events, with the acting user and the token they acted with.
 */
import { Injectable, OnModuleInit, Inject, Logger } from '@nestjs/common';
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { z } from 'zod';
import { displayableName } from '@leadline/contracts';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { CLOCK, type Clock } from '../infra/clock';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode, type Queryer } from '../infra/database/database.service';
import { lockLedger, nextLink, type LedgerCursor } from '../records/ledger';
import { notFound, ProblemError, validate, ValidationProblem } from '../infra/http/problem';
import { functionRefusal } from '../records/record-store';
import { ServiceKeys } from '../records/service-keys';
import { checkUuid } from '../products/products.service';
import { LINK_VERSION, linkHash, TS_TEXT } from '../records/chain';

export const ROLES = ['author', 'reviewer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** How the caller proved who they are on this request. */
export type AuthMethod = 'token' | 'password' | 'oidc' | 'passkey';

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
  /**
   * What the record functions accept for this user's acts: the stored keyed hash of the presented token, or the
   * page session's secret hash (neither readable by the runtime role)
   */
  credential: string;
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
export const CURRENT_ROLES = (u: string) => `leadline_user_roles(${u}.id)`;

/** SQL: user `u` is active (not deactivated by its newest deactivation/reactivation event; migrations/20261205000100). */
export const USER_ACTIVE = (u: string) => `leadline_user_active(${u}.id)`;

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
export type IdentityActor = { id: string; tokenId?: string | null; credential?: string | null } | null;

export const TOKEN_CACHE_MS = 2000;
const DAY_MS = 86_400_000;

/** A one-time activation or reset code as stored: SHA-256 (leadline_set_password hashes the code it is given the same way). */
export function codeHash(code: string): string {
  return createHash('sha256').update(code, 'utf8').digest('hex');
}

const emailInUse = (email: string | null) =>
  new ProblemError(409, 'Email in use', `${email} belongs to another user`, { errors: [{ path: 'email', message: 'already belongs to another user' }] });

/** A token as stored before keyed hashing (legacy rows, hash_kind 'sha256'). */
export function legacyTokenHash(token: string): string {
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
    private readonly keys: ServiceKeys,
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
    const known = await this.db.query(`SELECT 1 FROM leadline_find_token($1, $2)`, [this.keys.key.tokenHash(token), legacyTokenHash(token)]);
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
    const credential = await this.credentialOf(actor);
    let activation: { activationCode: string; activationExpiresAt: string } | null = null;
    await this.db.transaction(async (q) => {
      if (input.email !== null) {
        const taken = await q.query(`SELECT 1 FROM users WHERE lower(email) = lower($1)`, [input.email]);
        if (taken.length > 0) throw emailInUse(input.email);
      }
      const cursor = await lockLedger(q, 'identity');
      const events = [
        this.identityLink(cursor, 'user-created', actor, id, null, { name: input.name, email: input.email, roles }),
        ...roles.map((role) => this.identityLink(cursor, 'role-granted', actor, id, null, { role })),
      ];
      try {
        await this.write(`SELECT leadline_create_account($1, $2, $3, $4, $5, $6)`, [credential, id, input.name, input.email, roles, JSON.stringify(events)], q);
      } catch (err) {
        if (pgErrorCode(err) === PG_UNIQUE_VIOLATION) throw emailInUse(input.email);
        throw err;
      }
      if (input.email !== null && input.activation !== false) activation = await this.issueCode(q, cursor, credential, id, 'activation', actor);
    });
    const user = await this.getUser(id);
    const code = activation as { activationCode: string; activationExpiresAt: string } | null;
    return { ...user, activationCode: code?.activationCode ?? null, activationExpiresAt: code?.activationExpiresAt ?? null };
  }

  /** A one-time code for the user to set their password (activation or reset); only its SHA-256 is stored. */
  private async issueCode(q: Queryer, cursor: LedgerCursor, credential: string, userId: string, purpose: 'activation' | 'reset', actor: IdentityActor) {
    const code = `act_${randomBytes(24).toString('base64url')}`;
    const id = randomUUID();
    // stored to the millisecond, printed to the microsecond (as the database prints it)
    const expires = new Date(this.clock.now() + this.config.LEADLINE_ACTIVATION_HOURS * 3_600_000);
    const expiresAt = expires.toISOString();
    const event = this.identityLink(cursor, purpose === 'activation' ? 'activation-issued' : 'password-reset-issued', actor, userId, null, { codeId: id, expiresAt });
    await this.write(`SELECT leadline_issue_code($1, $2, $3, $4, $5, $6, $7)`, [credential, id, userId, codeHash(code), purpose, expiresAt, JSON.stringify([event])], q);
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
    const credential = await this.credentialOf(actor);
    return this.db.transaction(async (q) => this.issueCode(q, await lockLedger(q, 'identity'), credential, user.id, 'reset', actor));
  }

  /** Sets the roles a user holds: each role added is granted, each removed revoked (audited, in one transaction). */
  async setRoles(userId: string, body: unknown, actor: IdentityActor) {
    const input = validate(setRolesSchema, body);
    const user = await this.getUser(userId);
    const wanted = new Set(input.roles);
    if (actor && actor.id === user.id && user.roles.includes('admin') && !wanted.has('admin')) {
      throw new ProblemError(409, 'Own admin role', 'an admin cannot revoke their own admin role; ask another admin', { errors: [{ path: 'roles', message: 'must keep admin for yourself' }] });
    }
    const credential = await this.credentialOf(actor);
    await this.db.transaction(async (q) => {
      const cursor = await lockLedger(q, 'identity');
      const events = [];
      for (const role of ROLES) {
        if (wanted.has(role) && !user.roles.includes(role)) events.push(this.identityLink(cursor, 'role-granted', actor, user.id, null, { role }));
        if (!wanted.has(role) && user.roles.includes(role)) events.push(this.identityLink(cursor, 'role-revoked', actor, user.id, null, { role }));
      }
      if (events.length) await this.write(`SELECT leadline_change_identity($1, $2, $3)`, [credential, user.id, JSON.stringify(events)], q);
    });
    this.cache.clear();
    return this.getUser(user.id);
  }

  /** Deactivates (active=false) or reactivates a user; never deletes or renames. Tokens and sessions stop at once here. */
  async setActive(userId: string, active: boolean, actor: IdentityActor) {
    const user = await this.getUser(userId);
    if (!active && actor && actor.id === user.id) throw new ProblemError(409, 'Own account', 'an admin cannot deactivate themselves; ask another admin');
    if (user.active !== active) {
      const credential = await this.credentialOf(actor);
      await this.db.transaction(async (q) => {
        const event = this.identityLink(await lockLedger(q, 'identity'), active ? 'user-reactivated' : 'user-deactivated', actor, user.id, null, {});
        await this.write(`SELECT leadline_change_identity($1, $2, $3)`, [credential, user.id, JSON.stringify([event])], q);
      });
    }
    this.cache.clear();
    return this.getUser(user.id);
  }

  /**
   * Sets a password with a one-time code (leadline_set_password checks the code; the Argon2id hash is computed here,
   * the database cannot). The password-set event names the user as its actor. Returns the user's id.
   */
  async setPassword(code: string, codeRow: { id: string; user_id: string; purpose: string }, hash: string): Promise<string> {
    return this.db.transaction(async (q) => {
      const event = this.identityLink(await lockLedger(q, 'identity'), 'password-set', { id: codeRow.user_id, tokenId: null }, codeRow.user_id, null, { codeId: codeRow.id, purpose: codeRow.purpose });
      const [row] = await this.write<{ user_id: string }>(`SELECT leadline_set_password($1, $2, $3, $4) AS user_id`, [code, randomUUID(), hash, JSON.stringify([event])], q);
      return row.user_id;
    });
  }

  /** The next link of the identity chain (records/ledger.ts): one user, role or token change, hashed and sealed. */
  private identityLink(cursor: LedgerCursor, type: string, actor: IdentityActor, subjectUserId: string, tokenId: string | null, data: Record<string, unknown>) {
    return nextLink(this.keys.key, cursor, {
      kind: 'identity-event', id: randomUUID(), type, actorId: actor?.id ?? null, actorTokenId: actor?.tokenId ?? null, subjectUserId, tokenId, data,
    });
  }

  /**
   * The credential an identity change is made with: the acting admin's stored token hash, or the service's own for
   * the service's acts (bootstrap, demo seed). The record function checks it and audits the change.
   */
  private async credentialOf(actor: IdentityActor): Promise<string> {
    if (actor === null) return this.keys.serviceCredential();
    if (!actor.credential) throw new ProblemError(401, 'Authentication required', 'this change needs the acting user\'s own token or session');
    return actor.credential;
  }

  private async write<T = Record<string, unknown>>(sql: string, params: unknown[], q: Queryer = this.db): Promise<T[]> {
    try {
      return await q.query<T>(sql, params);
    } catch (err) {
      throw functionRefusal(err) ?? err;
    }
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
    const credential = await this.credentialOf(actor);
    await this.db.transaction(async (q) => {
      const cursor = await lockLedger(q, 'identity');
      // no expiry asked for (the bootstrap token): the default lifetime from now; stored to the millisecond, printed to the microsecond
      const expires = expiresAt ?? new Date(Date.parse(cursor.now) + this.ttlDays * DAY_MS);
      const expiresText = expires.toISOString().replace(/Z$/, '000Z');
      const event = this.identityLink(cursor, 'token-issued', actor, userId, id, { label, expiresAt: expiresText, forAnotherUser: actor !== null && actor.id !== userId });
      await this.write(`SELECT leadline_issue_token($1, $2, $3, $4, $5, $6, $7)`, [
        credential, id, userId, this.keys.key.tokenHash(token), label, expires.toISOString(), JSON.stringify([event]),
      ], q);
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

  /** Forgets every cached token lookup (a token was revoked, possibly on another instance). */
  forgetCachedTokens(): void {
    this.cache.clear();
  }

  async revokeToken(userId: string, tokenId: string, actor: IdentityActor): Promise<{ id: string; revoked: true }> {
    const rows = await this.db.query(`SELECT id FROM tokens WHERE id = $1 AND user_id = $2`, [checkUuid(tokenId, 'token'), checkUuid(userId, 'user')]);
    if (rows.length === 0) throw notFound(`token ${tokenId} of user ${userId}`);
    const credential = await this.credentialOf(actor);
    await this.db.transaction(async (q) => {
      const cursor = await lockLedger(q, 'identity');
      const event = this.identityLink(cursor, 'token-revoked', actor, userId, tokenId, {});
      await this.write(`SELECT leadline_revoke_token($1, $2, $3, $4)`, [credential, userId, tokenId, JSON.stringify([event])], q);
    });
    this.cache.clear();
    return { id: tokenId, revoked: true };
  }

  /**
   * Checks the identity chain like a product chain: every link's hash, previous hash and MAC in order, the head, and
   * the rows it accounts for since it began (each user with its user-created event and roles, each keyed token with
   * its token-issued event, each revocation with its token-revoked event, each password credential with its
   * password-set event, each passkey with its passkey-registered event and key). Names the first mismatch.
   */
  async verifyIdentities(): Promise<{ valid: boolean; links: number; headHash: string | null; firstBrokenLink: { seq: number; kind: string; id: string; reason: string } | null }> {
    const [head] = await this.db.query<{ seq: string; hash: string; started_at: string }>(`SELECT seq, hash, started_at FROM ledger_heads WHERE ledger = 'identity'`);
    const rows = await this.db.query<{ id: string; type: string; actor_id: string | null; actor_token_id: string | null; subject_user_id: string; token_id: string | null;
      data: unknown; created_at: string; seq: string; hash: string; previous_hash: string | null; mac: string | null }>(
      `SELECT id, type, actor_id, actor_token_id, subject_user_id, token_id, data, ${TS_TEXT('created_at')} AS created_at, seq, hash, previous_hash, mac
         FROM identity_events WHERE seq IS NOT NULL AND seq <= $1 ORDER BY seq`,
      [head.seq],
    );
    const broken = (seq: number, kind: string, id: string, reason: string) => ({ valid: false, links: seq - 1, headHash: null, firstBrokenLink: { seq, kind, id, reason } });
    let previous: string | null = null;
    let expected = 1;
    for (const r of rows) {
      const seq = Number(r.seq);
      if (seq !== expected) return broken(expected, 'identity-event', r.id, `sequence gap: expected link ${expected}, found ${seq}`);
      if (r.previous_hash !== previous) return broken(seq, 'identity-event', r.id, 'previous hash does not match the prior link');
      const record = { kind: 'identity-event', id: r.id, type: r.type, actorId: r.actor_id, actorTokenId: r.actor_token_id, subjectUserId: r.subject_user_id,
        tokenId: r.token_id, data: r.data, seq, createdAt: r.created_at, linkVersion: LINK_VERSION };
      if (linkHash(record, previous) !== r.hash) return broken(seq, 'identity-event', r.id, 'content does not match its hash');
      if (!this.keys.key.verifyLinkMac(r.hash, r.mac)) return broken(seq, 'identity-event', r.id, "the link's MAC does not verify with this service's record key: the service did not write it");
      previous = r.hash;
      expected++;
    }
    if (expected - 1 !== Number(head.seq) || (previous ?? '') !== head.hash) return broken(expected, 'identity-event', '', 'the identity chain head does not point at the last link (records missing)');
    const [user] = await this.db.query<{ id: string }>(
      `SELECT u.id FROM users u WHERE u.created_at >= $1 AND NOT EXISTS (
         SELECT 1 FROM identity_events e WHERE e.seq IS NOT NULL AND e.type = 'user-created' AND e.subject_user_id = u.id
            AND e.data->>'name' = u.name AND e.data->'roles' = to_jsonb(u.roles)) ORDER BY u.created_at LIMIT 1`,
      [head.started_at],
    );
    if (user) return broken(0, 'user', user.id, 'the user row is not borne out by a user-created event of the identity chain');
    const [token] = await this.db.query<{ id: string }>(
      `SELECT t.id FROM tokens t WHERE (t.created_at >= $1 OR t.hash_kind = 'hmac') AND NOT EXISTS (
         SELECT 1 FROM identity_events e WHERE e.seq IS NOT NULL AND e.type = 'token-issued' AND e.token_id = t.id AND e.subject_user_id = t.user_id)
        ORDER BY t.created_at LIMIT 1`,
      [head.started_at],
    );
    if (token) return broken(0, 'token', token.id, 'the token row is not borne out by a token-issued event of the identity chain');
    const [revocation] = await this.db.query<{ token_id: string }>(
      `SELECT r.token_id FROM token_revocations r WHERE r.revoked_at >= $1 AND NOT EXISTS (
         SELECT 1 FROM identity_events e WHERE e.seq IS NOT NULL AND e.type = 'token-revoked' AND e.token_id = r.token_id) LIMIT 1`,
      [head.started_at],
    );
    if (revocation) return broken(0, 'revocation', revocation.token_id, 'the revocation is not borne out by a token-revoked event of the identity chain');
    // a password credential needs the password-set event of its code; a passkey, its passkey-registered event with
    // the very key (a key swapped in the table signs nothing verify accepts, and is named here too)
    const [password] = await this.db.query<{ id: string }>(
      `SELECT p.id FROM password_credentials p WHERE NOT EXISTS (
         SELECT 1 FROM identity_events e WHERE e.seq IS NOT NULL AND e.type = 'password-set' AND e.subject_user_id = p.user_id
            AND e.data->>'codeId' = p.activation_id::text) ORDER BY p.created_at LIMIT 1`,
    );
    if (password) return broken(0, 'password', password.id, 'the password credential is not borne out by a password-set event of the identity chain');
    const [passkey] = await this.db.query<{ id: string }>(
      `SELECT k.id FROM passkey_credentials k WHERE NOT EXISTS (
         SELECT 1 FROM identity_events e WHERE e.seq IS NOT NULL AND e.type = 'passkey-registered' AND e.subject_user_id = k.user_id
            AND e.data = jsonb_build_object('passkeyId', k.id, 'credentialId', k.credential_id, 'publicKey', k.public_key, 'rpId', k.rp_id, 'label', k.label))
        ORDER BY k.created_at LIMIT 1`,
    );
    if (passkey) return broken(0, 'passkey', passkey.id, 'the passkey row is not borne out by a passkey-registered event of the identity chain');
    return { valid: true, links: expected - 1, headHash: previous, firstBrokenLink: null };
  }

  /**
   * Resolves a presented bearer token to its user, or null when unknown, revoked or expired (by the service clock).
   * The keyed hash is looked up, and the plain SHA-256 of a token stored before keyed hashing unless legacy tokens
   * are refused.
   */
  async authenticate(token: string): Promise<Principal | null> {
    const hash = this.keys.key.tokenHash(token);
    const now = this.clock.now();
    const hit = this.cache.get(hash);
    if (hit && hit.until > now) return hit.principal;
    const legacy = this.config.LEADLINE_LEGACY_TOKENS === 'accept' ? legacyTokenHash(token) : null;
    // current roles and deactivation from the identity events, as the record functions read them
    const rows = await this.db.query<{ user_id: string; name: string; roles: Role[]; token_id: string; token_hash: string; revoked: boolean; active: boolean; created_by: string | null; ms_left: string }>(
      `SELECT f.user_id, f.name, leadline_user_roles(f.user_id) AS roles, f.token_id, f.token_hash, f.revoked, leadline_user_active(f.user_id) AS active, t.created_by,
              floor(extract(epoch FROM COALESCE(f.expires_at, f.created_at + make_interval(days => $3::int)) - $4::timestamptz) * 1000) AS ms_left
         FROM leadline_find_token($1, $2) f JOIN tokens t ON t.id = f.token_id`,
      [hash, legacy, this.ttlDays, new Date(now).toISOString()],
    );
    const live = rows.find((r) => !r.revoked && r.active && Number(r.ms_left) > 0);
    const principal: Principal | null = live
      ? { id: live.user_id, name: live.name, roles: live.roles, tokenId: live.token_id, tokenIssuedBy: live.created_by, authMethod: 'token', credential: live.token_hash }
      : null;
    if (principal) {
      // Oldest entry out first when full; a cached token is never trusted past its expiry
      if (this.cache.size >= 10000) this.cache.delete(this.cache.keys().next().value as string);
      this.cache.set(hash, { principal, until: now + Math.min(TOKEN_CACHE_MS, Number(live!.ms_left)) });
    }
    return principal;
  }
}

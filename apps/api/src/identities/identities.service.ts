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
import { Database, type Queryer } from '../infra/database/database.service';
import { lockLedger, nextLink, type LedgerCursor } from '../records/ledger';
import { notFound, ProblemError, validate, ValidationProblem } from '../infra/http/problem';
import { functionRefusal } from '../records/record-store';
import { ServiceKeys } from '../records/service-keys';
import { checkUuid } from '../products/products.service';
import { LINK_VERSION, linkHash, TS_TEXT } from '../records/chain';

export const ROLES = ['author', 'reviewer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export interface Principal {
  id: string;
  name: string;
  roles: Role[];
  tokenId: string;
  /** the stored hash of the presented token: the credential the record functions accept for this user's acts */
  credential: string;
}

export const createUserSchema = z.strictObject({
  name: z.string().min(1).max(120).superRefine(displayableName),
  roles: z.array(z.enum(ROLES)).min(1).max(3),
});

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
    const admins = await this.db.query<{ id: string }>(`SELECT id FROM users WHERE 'admin' = ANY (roles) ORDER BY created_at, id LIMIT 1`);
    if (admins.length === 0) {
      const user = await this.createUser({ name: 'Administrator (bootstrap)', roles: ['admin'] }, null);
      await this.storeToken(user.id, token, 'bootstrap (LEADLINE_ADMIN_TOKEN)', null, null);
      this.logger.log(`bootstrap admin created (${user.id})`);
      return;
    }
    const live = await this.db.query(
      `SELECT 1 FROM tokens t JOIN users u ON u.id = t.user_id
        WHERE 'admin' = ANY (u.roles) AND ${this.liveSql('t')} LIMIT 1`,
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

  /** Creates a user; the creation and each role it grants are audited in the same transaction. */
  async createUser(body: unknown, actor: IdentityActor) {
    const input = validate(createUserSchema, body);
    const id = randomUUID();
    const roles = [...new Set(input.roles)];
    const credential = await this.credentialOf(actor);
    await this.db.transaction(async (q) => {
      const cursor = await lockLedger(q, 'identity');
      const events = [
        this.identityLink(cursor, 'user-created', actor, id, null, { name: input.name, roles }),
        ...roles.map((role) => this.identityLink(cursor, 'role-granted', actor, id, null, { role })),
      ];
      await this.write(`SELECT leadline_create_user($1, $2, $3, $4, $5)`, [credential, id, input.name, roles, JSON.stringify(events)], q);
    });
    return this.getUser(id);
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
    if (!actor.credential) throw new ProblemError(401, 'Authentication required', 'this change needs the acting admin\'s own bearer token');
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

  async getUser(id: string) {
    const rows = await this.db.query<{ id: string; name: string; roles: Role[]; createdAt: string }>(
      `SELECT id, name, roles, ${TS_TEXT('created_at')} AS "createdAt" FROM users WHERE id = $1`,
      [checkUuid(id, 'user')],
    );
    if (rows.length === 0) throw notFound(`user ${id}`);
    return rows[0];
  }

  async listUsers() {
    return this.db.query(`SELECT id, name, roles, ${TS_TEXT('created_at')} AS "createdAt" FROM users ORDER BY created_at, id`);
  }

  /**
   * Issues a new random token for a user; the token is returned once and never stored. It expires after
   * expiresInDays, at expiresAt, or by default after LEADLINE_TOKEN_TTL_DAYS (at most MAX_TOKEN_DAYS).
   */
  async issueToken(userId: string, body: unknown, actor: IdentityActor, options: { ttlMs?: number } = {}): Promise<{ id: string; token: string; expiresAt: string }> {
    await this.getUser(userId);
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
      `SELECT t.id, t.label, ${TS_TEXT('t.created_at')} AS "createdAt", r.token_id IS NOT NULL AS revoked,
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
   * its token-issued event, each revocation with its token-revoked event). Names the first mismatch.
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
    const rows = await this.db.query<{ user_id: string; name: string; roles: Role[]; token_id: string; token_hash: string; revoked: boolean; ms_left: string }>(
      `SELECT user_id, name, roles, token_id, token_hash, revoked,
              floor(extract(epoch FROM COALESCE(expires_at, created_at + make_interval(days => $3::int)) - $4::timestamptz) * 1000) AS ms_left
         FROM leadline_find_token($1, $2)`,
      [hash, legacy, this.ttlDays, new Date(now).toISOString()],
    );
    const live = rows.find((r) => !r.revoked && Number(r.ms_left) > 0);
    const principal = live ? { id: live.user_id, name: live.name, roles: live.roles, tokenId: live.token_id, credential: live.token_hash } : null;
    if (principal) {
      // Oldest entry out first when full; a cached token is never trusted past its expiry
      if (this.cache.size >= 10000) this.cache.delete(this.cache.keys().next().value as string);
      this.cache.set(hash, { principal, until: now + Math.min(TOKEN_CACHE_MS, Number(live!.ms_left)) });
    }
    return principal;
  }
}

/**
 * Users, roles and bearer tokens. A token is 32 random bytes shown once; only its SHA-256 is stored.
 * Revocation appends a row and clears this process's cache, so it takes effect at once here (other instances
 * of a multi-instance deployment stop accepting it within TOKEN_CACHE_MS).
 */
import { Injectable, OnModuleInit, Inject, Logger } from '@nestjs/common';
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database } from '../infra/database/database.service';
import { notFound, validate } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { TS_TEXT } from '../records/chain';

export const ROLES = ['author', 'reviewer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export interface Principal {
  id: string;
  name: string;
  roles: Role[];
  tokenId: string;
}

export const createUserSchema = z.strictObject({
  name: z.string().min(1).max(120),
  roles: z.array(z.enum(ROLES)).min(1).max(3),
});

export const createTokenSchema = z.strictObject({ label: z.string().max(120).optional() }).optional();

export const TOKEN_CACHE_MS = 2000;

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

@Injectable()
export class IdentitiesService implements OnModuleInit {
  private readonly logger = new Logger('identities');
  private readonly cache = new Map<string, { principal: Principal | null; until: number }>();

  constructor(
    private readonly db: Database,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  /** Bootstraps the first admin of a fresh deployment from LEADLINE_ADMIN_TOKEN. */
  async onModuleInit(): Promise<void> {
    const token = this.config.LEADLINE_ADMIN_TOKEN;
    if (!token) return;
    const admins = await this.db.query(`SELECT 1 FROM users WHERE 'admin' = ANY (roles) LIMIT 1`);
    if (admins.length > 0) return;
    const user = await this.createUser({ name: 'Administrator (bootstrap)', roles: ['admin'] }, null);
    await this.storeToken(user.id, token, 'bootstrap (LEADLINE_ADMIN_TOKEN)', null);
    this.logger.log(`bootstrap admin created (${user.id})`);
  }

  async createUser(body: unknown, createdBy: string | null) {
    const input = validate(createUserSchema, body);
    const id = randomUUID();
    const roles = [...new Set(input.roles)];
    await this.db.query(`INSERT INTO users (id, name, roles, created_by) VALUES ($1, $2, $3, $4)`, [id, input.name, roles, createdBy]);
    return this.getUser(id);
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

  /** Issues a new random token for a user; the token is returned once and never stored. */
  async issueToken(userId: string, body: unknown, createdBy: string | null): Promise<{ id: string; token: string }> {
    await this.getUser(userId);
    const input = validate(createTokenSchema, body) ?? {};
    const token = `ll_${randomBytes(32).toString('base64url')}`;
    const id = await this.storeToken(userId, token, input.label ?? null, createdBy);
    return { id, token };
  }

  private async storeToken(userId: string, token: string, label: string | null, createdBy: string | null): Promise<string> {
    const id = randomUUID();
    await this.db.query(`INSERT INTO tokens (id, user_id, token_hash, label, created_by) VALUES ($1, $2, $3, $4, $5)`, [
      id, userId, hashToken(token), label, createdBy,
    ]);
    return id;
  }

  async listTokens(userId: string) {
    await this.getUser(userId);
    return this.db.query(
      `SELECT t.id, t.label, ${TS_TEXT('t.created_at')} AS "createdAt", r.token_id IS NOT NULL AS revoked
         FROM tokens t LEFT JOIN token_revocations r ON r.token_id = t.id WHERE t.user_id = $1 ORDER BY t.created_at`,
      [userId],
    );
  }

  async revokeToken(userId: string, tokenId: string, revokedBy: string | null): Promise<{ id: string; revoked: true }> {
    const rows = await this.db.query(`SELECT id FROM tokens WHERE id = $1 AND user_id = $2`, [checkUuid(tokenId, 'token'), checkUuid(userId, 'user')]);
    if (rows.length === 0) throw notFound(`token ${tokenId} of user ${userId}`);
    await this.db.query(`INSERT INTO token_revocations (token_id, revoked_by) VALUES ($1, $2) ON CONFLICT (token_id) DO NOTHING`, [tokenId, revokedBy]);
    this.cache.clear();
    return { id: tokenId, revoked: true };
  }

  /** Resolves a presented bearer token to its user, or null when unknown or revoked. */
  async authenticate(token: string): Promise<Principal | null> {
    const hash = hashToken(token);
    const now = Date.now();
    const hit = this.cache.get(hash);
    if (hit && hit.until > now) return hit.principal;
    const rows = await this.db.query<{ id: string; name: string; roles: Role[]; token_id: string }>(
      `SELECT u.id, u.name, u.roles, t.id AS token_id
         FROM tokens t JOIN users u ON u.id = t.user_id
        WHERE t.token_hash = $1 AND NOT EXISTS (SELECT 1 FROM token_revocations r WHERE r.token_id = t.id)`,
      [hash],
    );
    const principal = rows.length ? { id: rows[0].id, name: rows[0].name, roles: rows[0].roles, tokenId: rows[0].token_id } : null;
    if (principal) {
      if (this.cache.size > 10000) this.cache.clear();
      this.cache.set(hash, { principal, until: now + TOKEN_CACHE_MS });
    }
    return principal;
  }
}

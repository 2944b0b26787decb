/**
 * Local accounts and page sessions. A password is set only by its user, with a one-time code an admin issued
 * (activation or reset); a sign-in appends a session row, a sign-out a session_ends row (nothing is updated). A
 * session ends after LEADLINE_SESSION_IDLE_MINUTES without a request (the idle stamp travels sealed in the cookie)
 * or LEADLINE_SESSION_ABSOLUTE_HOURS after sign-in, whatever happens; deactivating the user ends it at once.
 */
import { Inject, Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { CLOCK, type Clock } from '../infra/clock';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode } from '../infra/database/database.service';
import { ProblemError, validate } from '../infra/http/problem';
import { FailureLimiter } from './failure-limiter';
import { codeHash, CURRENT_ROLES, emailSchema, IdentitiesService, USER_ACTIVE, type Principal, type Role } from './identities.service';
import { functionRefusal } from '../records/record-store';
import { ServiceKeys } from '../records/service-keys';
import { hashPassword, PASSWORD_MAX, PASSWORD_MIN, verifyPassword } from './passwords';
import { cookieSealedBy, csrfToken, hashSecret, newSealKey, newSessionSecret, readCookie, sealCookie } from './session-cookie';

export const passwordSchema = z
  .string()
  .min(PASSWORD_MIN, `at least ${PASSWORD_MIN} characters`)
  .max(PASSWORD_MAX, `at most ${PASSWORD_MAX} characters`);

export const activateSchema = z.strictObject({
  activationCode: z.string().min(1).max(200).describe('the one-time code the admin handed over'),
  password: passwordSchema.describe(`the new password (${PASSWORD_MIN} to ${PASSWORD_MAX} characters)`),
});

export const signInSchema = z.strictObject({
  email: emailSchema,
  password: z.string().min(1).max(PASSWORD_MAX),
});

export type SessionMethod = 'password' | 'oidc' | 'passkey';

/** What a sign-in hands to the controller: the cookie to set and who signed in. */
export interface SignedIn {
  cookie: string;
  user: { id: string; name: string; email: string | null; roles: Role[] };
  expiresAt: string;
}

/** Why a session cookie was not accepted (the page says so at sign-in). */
export class SessionRefused extends Error {}

@Injectable()
export class AccountsService {
  /** Failed sign-ins and activations per client address (never per account: an account is never locked). */
  readonly limiter: FailureLimiter;
  private readonly idleMs: number;
  private readonly absoluteMs: number;

  constructor(
    private readonly db: Database,
    private readonly identities: IdentitiesService,
    private readonly keys: ServiceKeys,
    @Inject(APP_CONFIG) config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    this.limiter = new FailureLimiter(db, 'sign-in', 10, 60_000);
    this.idleMs = config.LEADLINE_SESSION_IDLE_MINUTES * 60_000;
    this.absoluteMs = config.LEADLINE_SESSION_ABSOLUTE_HOURS * 3_600_000;
  }

  private nowIso(): string {
    return new Date(this.clock.now()).toISOString();
  }

  /** Refuses a client address that failed too often (429), before any work. */
  private async checkLimit(client: string): Promise<void> {
    const wait = await this.limiter.blocked(client, this.clock.now());
    if (wait > 0) throw new ProblemError(429, 'Too many failed attempts', `too many failed attempts from this address; try again in ${wait} s`, { retryAfter: wait });
  }

  /** Sets the password of the user a valid, unused, unexpired activation or reset code belongs to. */
  async activate(body: unknown, client: string) {
    await this.checkLimit(client);
    const input = validate(activateSchema, body);
    const [code] = await this.db.query<{ id: string; user_id: string; purpose: string }>(
      `SELECT c.id, c.user_id, c.purpose FROM activation_codes c JOIN users u ON u.id = c.user_id
        WHERE c.code_hash = $1 AND c.expires_at > $2::timestamptz AND ${USER_ACTIVE('u')}
          AND NOT EXISTS (SELECT 1 FROM password_credentials p WHERE p.activation_id = c.id)
          AND NOT EXISTS (SELECT 1 FROM activation_codes n WHERE n.user_id = c.user_id AND n.created_at > c.created_at)`,
      [codeHash(input.activationCode), this.nowIso()],
    );
    if (!code) {
      await this.limiter.fail(client, this.clock.now());
      throw new ProblemError(403, 'Code not accepted', 'the activation code is unknown, used, replaced by a newer one, or has expired; ask an admin for a new one', {
        errors: [{ path: 'activationCode', message: 'unknown, used, replaced or expired' }],
      });
    }
    const hash = await hashPassword(input.password);
    try {
      await this.identities.setPassword(input.activationCode, code, hash);
    } catch (err) {
      // used a moment ago (unique activation_id), or refused by leadline_set_password (used, replaced or expired by the database clock)
      if (pgErrorCode(err) === PG_UNIQUE_VIOLATION || (err instanceof ProblemError && err.status === 403)) {
        throw new ProblemError(403, 'Code not accepted', 'the activation code was used a moment ago, or has expired', { errors: [{ path: 'activationCode', message: 'used or expired' }] });
      }
      throw err;
    }
    const user = await this.identities.getUser(code.user_id);
    return { userId: user.id, email: user.email, passwordSet: true };
  }

  /**
   * The user's current password hash (newest credential), or null: only through leadline_password_hash with the
   * service credential (the runtime role cannot read the column).
   */
  private async passwordHash(userId: string): Promise<string | null> {
    const [row] = await this.db.query<{ hash: string | null }>(`SELECT leadline_password_hash($1, $2) AS hash`, [await this.keys.serviceCredential(), userId]);
    return row?.hash ?? null;
  }

  /**
   * Signs in with email and password: a session row and its cookie. Failures count per client address; a blocked
   * address answers 429 before any check, and an account is never locked, so the valid password always works from
   * any other address.
   */
  async signIn(body: unknown, client: string): Promise<SignedIn> {
    await this.checkLimit(client);
    const input = validate(signInSchema, body);
    const [user] = await this.db.query<{ id: string; name: string; email: string; roles: Role[] }>(
      `SELECT u.id, u.name, u.email, ${CURRENT_ROLES('u')} AS roles FROM users u WHERE lower(u.email) = lower($1) AND ${USER_ACTIVE('u')}`,
      [input.email],
    );
    const ok = await verifyPassword(user ? await this.passwordHash(user.id) : null, input.password);
    if (!user || !ok) {
      await this.limiter.fail(client, this.clock.now());
      throw new ProblemError(401, 'Sign-in refused', 'the email or the password is not right (or the account is not active)', {
        errors: [{ path: 'password', message: 'email or password not right' }],
      });
    }
    return this.startSession(user, 'password', this.clock.now());
  }

  /** Appends a session for a user who has just authenticated (by password or at the identity provider). */
  async startSession(user: { id: string; name: string; email: string | null; roles: Role[] }, method: SessionMethod, authTime: number): Promise<SignedIn> {
    const secret = newSessionSecret();
    const key = newSealKey();
    const now = this.clock.now();
    const expiresAt = new Date(now + this.absoluteMs).toISOString();
    // the service credential: only the service, which checked the password or the provider's answer, starts a session
    await this.db.query(`SELECT leadline_start_session($1, $2, $3, $4, $5, $6, $7, $8)`, [
      await this.keys.serviceCredential(), randomUUID(), user.id, hashSecret(secret), key, method, new Date(authTime).toISOString(), expiresAt,
    ]).catch((err) => {
      throw functionRefusal(err) ?? err;
    });
    return { cookie: sealCookie(secret, now, key), user: { id: user.id, name: user.name, email: user.email, roles: user.roles }, expiresAt };
  }

  /**
   * The principal of a session cookie, and the cookie to send back (its idle stamp moved to now). Refuses a cookie
   * that is malformed, not sealed by its session's key, idle too long, past its absolute expiry, signed out, or of
   * a deactivated user.
   */
  async resolveSession(value: string): Promise<{ principal: Principal; cookie: string; authTime: number }> {
    const cookie = readCookie(value);
    if (!cookie) throw new SessionRefused('the session cookie is not one this service set');
    const secretHash = hashSecret(cookie.secret);
    const [row] = await this.db.query<{ id: string; user_id: string; name: string; roles: Role[]; seal_key: string; method: SessionMethod; auth_time: Date; expires_at: Date; ended: boolean; active: boolean }>(
      `SELECT s.id, s.user_id, u.name, ${CURRENT_ROLES('u')} AS roles, s.seal_key, s.method, s.auth_time, s.expires_at, s.ended, ${USER_ACTIVE('u')} AS active
         FROM leadline_find_session($1) s JOIN users u ON u.id = s.user_id`,
      [secretHash],
    );
    if (!row || !cookieSealedBy(cookie, row.seal_key)) throw new SessionRefused('the session is unknown');
    const now = this.clock.now();
    if (row.ended) throw new SessionRefused('the session was signed out');
    if (!row.active) throw new SessionRefused('the account is deactivated');
    if (now >= new Date(row.expires_at).getTime()) throw new SessionRefused('the session reached its time limit; sign in again');
    if (now - cookie.seen > this.idleMs) throw new SessionRefused('the session timed out after a period without activity; sign in again');
    return {
      principal: { id: row.user_id, name: row.name, roles: row.roles, tokenId: null, sessionId: row.id, authMethod: row.method, csrfToken: csrfToken(row.seal_key), credential: secretHash },
      cookie: sealCookie(cookie.secret, Math.max(now, cookie.seen), row.seal_key),
      authTime: new Date(row.auth_time).getTime(),
    };
  }

  /** Ends the session whose credential (secret hash) is given (idempotent). */
  async signOut(credential: string): Promise<void> {
    await this.db.query(`SELECT leadline_end_session($1)`, [credential]);
  }

  /**
   * Checks a signer's own password at the moment of signing. Failures count per client address like sign-in
   * failures (the same limiter), so a stolen session cannot guess the password for long.
   */
  async verifySignerPassword(userId: string, password: string, client: string): Promise<boolean> {
    await this.checkLimit(client);
    const ok = await verifyPassword(await this.passwordHash(userId), password);
    if (!ok) await this.limiter.fail(client, this.clock.now());
    return ok;
  }
}

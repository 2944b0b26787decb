/**
 * Fresh logins at the identity provider for signing a decision (OpenID Connect Core 1.0 §3.1.2.1 max_age=0, checked
 * by the ID token's auth_time): each is bound to one user and one revision, must be newer than the moment the signing
 * started, is accepted for REAUTH_VALID_MS after the login, and is used at most once.
 */
import { Inject, Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { CLOCK, type Clock } from '../infra/clock';
import { Database } from '../infra/database/database.service';
import { ServiceKeys } from '../records/service-keys';
import type { Principal } from './identities.service';

/** How long after the fresh login the signature must be made [ms] (common practice: a few minutes). */
export const REAUTH_VALID_MS = 5 * 60_000;

@Injectable()
export class ReauthenticationsService {
  constructor(
    private readonly db: Database,
    @Inject(CLOCK) private readonly clock: Clock,
    private readonly keys: ServiceKeys,
  ) {}

  /** Records a fresh login; null when the provider's auth_time is older than the start of the signing. */
  async record(userId: string, revisionId: string, startedAtMs: number, authTime: number): Promise<string | null> {
    // auth_time is whole seconds (OpenID Connect Core 1.0 §2, NumericDate): compare at that precision
    const startedAt = Math.floor(startedAtMs / 1000) * 1000;
    if (authTime < startedAt) return null;
    const id = randomUUID();
    // the service credential: the service checked the identity provider's answer
    await this.db.query(`SELECT leadline_record_reauthentication($1, $2, $3, $4, $5, $6)`, [
      await this.keys.serviceCredential(), id, userId, revisionId, new Date(startedAt).toISOString(), new Date(authTime).toISOString(),
    ]);
    return id;
  }

  /**
   * Uses a fresh login for a signature by `principal` on `revisionId` (the one named, or the newest unused one of
   * this user for this revision), or refuses through `refuse`.
   */
  async consume(id: string | undefined, principal: Principal, revisionId: string, refuse: (path: string, detail: string) => never): Promise<void> {
    const [row] = await this.db.query<{ id: string; user_id: string; revision_id: string; started_at: Date; auth_time: Date }>(
      id
        ? `SELECT id, user_id, revision_id, started_at, auth_time FROM reauthentications WHERE id = $1`
        : `SELECT r.id, r.user_id, r.revision_id, r.started_at, r.auth_time FROM reauthentications r
            WHERE r.user_id = $1 AND r.revision_id = $2 AND NOT EXISTS (SELECT 1 FROM reauthentication_uses u WHERE u.reauthentication_id = r.id)
            ORDER BY r.created_at DESC LIMIT 1`,
      id ? [id] : [principal.id, revisionId],
    );
    if (!row) refuse('signature', 'no fresh login at the identity provider for signing this revision: sign in there again first');
    id = row.id;
    if (row.user_id !== principal.id) refuse('signature.reauthentication', 'not a fresh login of yours');
    if (row.revision_id !== revisionId) refuse('signature.reauthentication', 'this fresh login was made for signing another revision');
    if (new Date(row.auth_time).getTime() < new Date(row.started_at).getTime()) refuse('signature.reauthentication', 'the login is older than the start of the signing');
    if (this.clock.now() - new Date(row.auth_time).getTime() > REAUTH_VALID_MS) refuse('signature.reauthentication', 'the fresh login is too old; sign in at the identity provider again');
    // used with the signer's own credential (leadline_use_reauthentication): false when it signed already
    const [used] = await this.db.query<{ fresh: boolean }>(`SELECT leadline_use_reauthentication($1, $2) AS fresh`, [principal.credential, id]);
    if (!used?.fresh) refuse('signature.reauthentication', 'this fresh login has signed already');
  }
}

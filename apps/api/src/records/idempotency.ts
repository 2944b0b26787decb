/**
 * Idempotency-Key support: a retried submission with the same key returns the first result.
 * The key row is written in the submission's own transaction, so a key exists exactly when its result does.
 */
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import type { Queryer } from '../infra/database/database.service';
import { ProblemError } from '../infra/http/problem';

export interface StoredResponse {
  status: number;
  body: unknown;
}

export function requestHash(body: unknown): string {
  return createHash('sha256').update(canonicalize(body ?? null) as string).digest('hex');
}

/** The stored response for a key, or null; a key reused with a different body is refused (422). */
export async function findIdempotent(q: Queryer, scope: string, key: string, hash: string): Promise<StoredResponse | null> {
  const rows = await q.query<{ request_hash: string; status: number; response: unknown }>(
    `SELECT request_hash, status, response FROM idempotency_keys WHERE scope = $1 AND key = $2`,
    [scope, key],
  );
  if (rows.length === 0) return null;
  if (rows[0].request_hash !== hash) {
    throw new ProblemError(422, 'Idempotency key reused', 'this Idempotency-Key was used with a different request body');
  }
  return { status: rows[0].status, body: rows[0].response };
}

export async function storeIdempotent(q: Queryer, scope: string, key: string, hash: string, response: StoredResponse): Promise<void> {
  await q.query(
    `INSERT INTO idempotency_keys (scope, key, request_hash, status, response) VALUES ($1, $2, $3, $4, $5)`,
    [scope, key, hash, response.status, JSON.stringify(response.body)],
  );
}

export function checkKey(key: string | undefined): string | null {
  if (key === undefined || key === '') return null;
  if (key.length > 200) throw new ProblemError(400, 'Invalid Idempotency-Key', 'Idempotency-Key must be at most 200 characters');
  return key;
}

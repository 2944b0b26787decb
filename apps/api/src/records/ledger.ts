/**
 * The chains that are not a product's: identity changes ('identity') and rule-set adoptions ('rule-adoption'),
 * migrations/20261204230200. A link is { record, previousHash } hashed as chain.ts hashes a product's links, and sealed
 * with the record key's link MAC; the service computes both under the ledger's lock (leadline_lock_ledger) and the
 * record functions check that the link is the next one and timed by the transaction's clock.
 */
import type { Queryer } from '../infra/database/database.service';
import { LINK_VERSION, linkHash } from './chain';
import type { RecordKey } from './record-key';

export type LedgerName = 'identity' | 'rule-adoption';

export interface LedgerCursor {
  seq: number;
  hash: string | null;
  /** the transaction's time, exact text (TS_TEXT) */
  now: string;
}

export async function lockLedger(q: Queryer, ledger: LedgerName): Promise<LedgerCursor> {
  const [row] = await q.query<{ seq: string; hash: string; now: string }>(`SELECT seq, hash, now FROM leadline_lock_ledger($1)`, [ledger]);
  return { seq: Number(row.seq), hash: row.hash === '' ? null : row.hash, now: row.now };
}

/** Hashes and seals the next link of a ledger and advances the cursor. */
export function nextLink<T extends Record<string, unknown>>(key: RecordKey, cursor: LedgerCursor, record: T): T & { seq: number; createdAt: string; linkVersion: number; hash: string; previousHash: string | null; mac: string } {
  const body = { ...record, seq: cursor.seq + 1, createdAt: cursor.now, linkVersion: LINK_VERSION };
  const hash = linkHash(body, cursor.hash);
  const link = { ...body, hash, previousHash: cursor.hash, mac: key.linkMac(hash) };
  cursor.seq = body.seq;
  cursor.hash = hash;
  return link;
}

/** The hashed record of a stored ledger link: everything but hash, previousHash and mac. */
export function ledgerRecord<T extends { hash: string; previousHash: string | null; mac: string | null }>(link: T): Omit<T, 'hash' | 'previousHash' | 'mac'> {
  const { hash: _h, previousHash: _p, mac: _m, ...record } = link;
  return record;
}

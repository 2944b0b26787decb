/**
 * The record key: a secret the service holds outside the database (LEADLINE_RECORD_KEY_FILE, or
 * <LEADLINE_DATA_DIR>/record-key, generated when missing; in memory only for an in-memory data folder). From it,
 * by HMAC-SHA256 with a fixed label each (RFC 2104; the labels separate the uses as in RFC 5869's "info"):
 * - the link key: every chain link of format 3 carries HMAC(link key, link hash), so a link the database alone
 *   wrote (without the key) does not verify;
 * - the token key: a bearer token is stored as HMAC(token key, token), so a token row cannot be made from the
 *   database;
 * - the service credential: what the service presents to the database functions when it acts by itself (bootstrap,
 *   built-in rule sets, the demo seed); the database keeps only its SHA-256 (table service_keys).
 * A key file readable by group or others is refused.
 */
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';

export interface RecordKeySource {
  origin: 'file' | 'generated' | 'memory';
  path: string | null;
}

/** Refuses a secret file that group or others may read or write (POSIX mode bits). */
export function checkPrivateFile(path: string, what: string): void {
  if (process.platform === 'win32') return;
  const mode = statSync(path).mode & 0o777;
  if ((mode & 0o077) !== 0) {
    throw new Error(`${what} ${path} has mode ${mode.toString(8).padStart(4, '0')}: group or others can reach it; run chmod 600 ${path}`);
  }
}

const hmac = (key: Buffer, label: string) => createHmac('sha256', key).update(label, 'utf8').digest();

export class RecordKey {
  private readonly linkKey: Buffer;
  private readonly tokenKey: Buffer;
  /** what the service presents to the database functions when it acts by itself (never stored) */
  readonly serviceCredential: string;
  /** SHA-256 of the service credential: what the database stores to recognise it */
  readonly serviceCredentialDigest: string;
  /** names the key (stored in service_keys) without revealing it */
  readonly keyId: string;

  constructor(
    master: Buffer,
    readonly source: RecordKeySource,
  ) {
    if (master.length < 32) throw new Error(`the record key${source.path ? ` ${source.path}` : ''} is shorter than 32 bytes`);
    this.linkKey = hmac(master, 'leadline link mac');
    this.tokenKey = hmac(master, 'leadline token hash');
    this.serviceCredential = `svc_${hmac(master, 'leadline service credential').toString('hex')}`;
    this.serviceCredentialDigest = createHash('sha256').update(this.serviceCredential, 'utf8').digest('hex');
    this.keyId = createHash('sha256').update(hmac(master, 'leadline record key id')).digest('hex');
  }

  /** MAC of a chain link: HMAC-SHA256(link key, "leadline-link:" + link hash), hex. */
  linkMac(hash: string): string {
    return createHmac('sha256', this.linkKey).update(`leadline-link:${hash}`, 'utf8').digest('hex');
  }

  /** Whether a stored MAC is this key's MAC of the link hash (constant time). */
  verifyLinkMac(hash: string, mac: string | null | undefined): boolean {
    if (typeof mac !== 'string' || !/^[0-9a-f]{64}$/.test(mac)) return false;
    return timingSafeEqual(Buffer.from(this.linkMac(hash), 'hex'), Buffer.from(mac, 'hex'));
  }

  /** A bearer token as stored: HMAC-SHA256(token key, token), hex. */
  tokenHash(token: string): string {
    return createHmac('sha256', this.tokenKey).update(token, 'utf8').digest('hex');
  }

  /**
   * The configured key file (which must exist and be private), or the data folder's key, generated (mode 0600)
   * when missing. "memory://..." data folders keep a generated key in memory only.
   */
  static load(keyFile: string | undefined, dataDir: string): RecordKey {
    if (keyFile) {
      const path = resolve(keyFile);
      if (!existsSync(path)) throw new Error(`LEADLINE_RECORD_KEY_FILE ${path} does not exist (create it with: umask 077; openssl rand -hex 32 > ${path})`);
      checkPrivateFile(path, 'LEADLINE_RECORD_KEY_FILE');
      return new RecordKey(parseKey(readFileSync(path, 'utf8'), path), { origin: 'file', path });
    }
    if (dataDir.startsWith('memory://')) return new RecordKey(randomBytes(32), { origin: 'memory', path: null });
    const path = resolve(dataDir, 'record-key');
    if (!existsSync(path)) {
      mkdirSync(dirname(path), { recursive: true, mode: 0o700 });
      try {
        writeFileSync(path, `${randomBytes(32).toString('hex')}\n`, { mode: 0o600, flag: 'wx' });
        return new RecordKey(parseKey(readFileSync(path, 'utf8'), path), { origin: 'generated', path });
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err; // another process made it first: use theirs
      }
    }
    checkPrivateFile(path, 'the record key');
    return new RecordKey(parseKey(readFileSync(path, 'utf8'), path), { origin: 'file', path });
  }
}

/** The key file holds 64 or more hex digits (openssl rand -hex 32). */
function parseKey(text: string, path: string): Buffer {
  const hex = text.trim();
  if (!/^[0-9a-fA-F]{64,}$/.test(hex) || hex.length % 2 !== 0) throw new Error(`the record key ${path} must hold at least 64 hex digits (openssl rand -hex 32)`);
  return Buffer.from(hex, 'hex');
}

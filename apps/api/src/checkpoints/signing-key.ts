/**
 * The Ed25519 key that signs checkpoints, kept outside the database: a PKCS#8 PEM file named by
 * LEADLINE_SIGNING_KEY_FILE, or <LEADLINE_DATA_DIR>/signing-key.pem, generated (mode 0600) when missing. With an
 * in-memory data folder (tests) the key lives only in memory. node:crypto only (RFC 8032 Ed25519: deterministic).
 * A key file that group or others may read is refused.
 */
import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, sign, verify, type KeyObject } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { checkPrivateFile } from '../records/record-key';

export interface SigningKeySource {
  /** where the key came from, for the start-up log */
  origin: 'file' | 'generated' | 'memory';
  path: string | null;
}

export class SigningKey {
  readonly publicKeyPem: string;
  /** SHA-256 of the public key's SPKI DER bytes, hex: names the key in every checkpoint */
  readonly keyId: string;

  constructor(
    private readonly privateKey: KeyObject,
    readonly source: SigningKeySource,
  ) {
    if (privateKey.asymmetricKeyType !== 'ed25519') throw new Error(`the checkpoint signing key${source.path ? ` ${source.path}` : ''} is not an Ed25519 key`);
    const pub = createPublicKey(privateKey);
    this.publicKeyPem = pub.export({ type: 'spki', format: 'pem' }).toString();
    this.keyId = createHash('sha256').update(pub.export({ type: 'spki', format: 'der' })).digest('hex');
  }

  sign(data: string): string {
    return sign(null, Buffer.from(data, 'utf8'), this.privateKey).toString('base64');
  }

  /** Whether the signature over data was made by this key; malformed input is simply false. */
  verify(data: string, signature: string): boolean {
    try {
      return verify(null, Buffer.from(data, 'utf8'), createPublicKey(this.privateKey), Buffer.from(signature, 'base64'));
    } catch {
      return false;
    }
  }

  /**
   * Loads the configured key file (which must exist), or the data folder's key, generating it when missing.
   * @param dataDir - LEADLINE_DATA_DIR; "memory://..." keeps a generated key in memory only
   */
  static load(keyFile: string | undefined, dataDir: string): SigningKey {
    if (keyFile) {
      const path = resolve(keyFile);
      if (!existsSync(path)) throw new Error(`LEADLINE_SIGNING_KEY_FILE ${path} does not exist (create it with: umask 077; openssl genpkey -algorithm ed25519 -out ${path})`);
      checkPrivateFile(path, 'LEADLINE_SIGNING_KEY_FILE');
      return new SigningKey(createPrivateKey(readFileSync(path)), { origin: 'file', path });
    }
    if (dataDir.startsWith('memory://')) return new SigningKey(generateKeyPairSync('ed25519').privateKey, { origin: 'memory', path: null });
    const path = resolve(dataDir, 'signing-key.pem');
    if (existsSync(path)) {
      checkPrivateFile(path, 'the checkpoint signing key');
      return new SigningKey(createPrivateKey(readFileSync(path)), { origin: 'file', path });
    }
    mkdirSync(dirname(path), { recursive: true });
    const pem = generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
    try {
      writeFileSync(path, pem, { mode: 0o600, flag: 'wx' });
    } catch (err) {
      // another process created it first: use theirs
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      return new SigningKey(createPrivateKey(readFileSync(path)), { origin: 'file', path });
    }
    return new SigningKey(createPrivateKey(pem), { origin: 'generated', path });
  }
}

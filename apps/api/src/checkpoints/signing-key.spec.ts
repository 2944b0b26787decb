import { createPublicKey, generateKeyPairSync, verify } from 'node:crypto';
import { chmodSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SigningKey } from './signing-key';

describe('checkpoint signing key', () => {
  let dir: string;
  beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'leadline-key-'))));
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('is generated once into the data folder (owner-only file) and read back on the next start', () => {
    const first = SigningKey.load(undefined, dir);
    expect(first.source.origin).toBe('generated');
    const path = join(dir, 'signing-key.pem');
    expect(statSync(path).mode & 0o777).toBe(0o600);
    const again = SigningKey.load(undefined, dir);
    expect(again.source.origin).toBe('file');
    expect(again.keyId).toBe(first.keyId);
  });

  it('signs so that the published public key verifies it (RFC 8032 Ed25519 via node:crypto)', () => {
    const key = SigningKey.load(undefined, dir);
    const signature = key.sign('some text');
    expect(verify(null, Buffer.from('some text'), createPublicKey(key.publicKeyPem), Buffer.from(signature, 'base64'))).toBe(true);
    expect(key.verify('some other text', signature)).toBe(false);
    expect(key.verify('some text', 'not base64 at all!')).toBe(false);
  });

  it('uses a configured key file and refuses a missing one, one that group or others can read, or a key of another kind', () => {
    const path = join(dir, 'given.pem');
    writeFileSync(path, generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }), { mode: 0o600 });
    expect(SigningKey.load(path, 'memory://').source).toEqual({ origin: 'file', path });
    chmodSync(path, 0o644);
    expect(() => SigningKey.load(path, 'memory://')).toThrow(/mode 0644: group or others can reach it/);
    chmodSync(path, 0o600);
    expect(() => SigningKey.load(join(dir, 'missing.pem'), dir)).toThrow(/does not exist/);
    const rsa = join(dir, 'rsa.pem');
    writeFileSync(rsa, generateKeyPairSync('rsa', { modulusLength: 1024 }).privateKey.export({ type: 'pkcs8', format: 'pem' }), { mode: 0o600 });
    expect(() => SigningKey.load(rsa, dir)).toThrow(/not an Ed25519 key/);
    expect(readFileSync(path, 'utf8')).toMatch(/BEGIN PRIVATE KEY/);
  });
});

import { chmodSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { createHmac } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { RecordKey } from './record-key';

describe('record key', () => {
  let dir: string;
  beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'leadline-record-key-'))));
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('is generated once into the data folder (owner-only file) and read back on the next start', () => {
    const first = RecordKey.load(undefined, dir);
    expect(first.source.origin).toBe('generated');
    expect(statSync(join(dir, 'record-key')).mode & 0o777).toBe(0o600);
    const again = RecordKey.load(undefined, dir);
    expect(again.source.origin).toBe('file');
    expect(again.keyId).toBe(first.keyId);
    expect(again.linkMac('a'.repeat(64))).toBe(first.linkMac('a'.repeat(64)));
  });

  it('refuses a key file that group or others can read, a missing one and a short one', () => {
    const path = join(dir, 'given');
    writeFileSync(path, `${'ab'.repeat(32)}\n`, { mode: 0o600 });
    expect(RecordKey.load(path, 'memory://').source).toEqual({ origin: 'file', path });
    chmodSync(path, 0o640);
    expect(() => RecordKey.load(path, 'memory://')).toThrow(/mode 0640: group or others can reach it/);
    chmodSync(path, 0o604);
    expect(() => RecordKey.load(path, 'memory://')).toThrow(/group or others/);
    expect(() => RecordKey.load(join(dir, 'missing'), 'memory://')).toThrow(/does not exist/);
    const short = join(dir, 'short');
    writeFileSync(short, 'abcd', { mode: 0o600 });
    expect(() => RecordKey.load(short, 'memory://')).toThrow(/at least 64 hex digits/);
  });

  it('derives the link MAC, the token hash and the service credential by HMAC-SHA256 with separate labels (RFC 2104)', () => {
    const path = join(dir, 'given');
    const master = Buffer.from('01'.repeat(32), 'hex');
    writeFileSync(path, master.toString('hex'), { mode: 0o600 });
    const key = RecordKey.load(path, 'memory://');
    // expected values computed here with node:crypto's HMAC, independently of the class under test
    const sub = (label: string) => createHmac('sha256', master).update(label).digest();
    const hash = 'f'.repeat(64);
    expect(key.linkMac(hash)).toBe(createHmac('sha256', sub('leadline link mac')).update(`leadline-link:${hash}`).digest('hex'));
    expect(key.tokenHash('ll_x')).toBe(createHmac('sha256', sub('leadline token hash')).update('ll_x').digest('hex'));
    expect(key.verifyLinkMac(hash, key.linkMac(hash))).toBe(true);
    expect(key.verifyLinkMac(hash, key.linkMac('e'.repeat(64)))).toBe(false);
    expect(key.verifyLinkMac(hash, null)).toBe(false);
    expect(key.verifyLinkMac(hash, 'not hex')).toBe(false);
    expect(key.tokenHash('ll_x')).not.toBe(key.linkMac('ll_x'));
  });
});

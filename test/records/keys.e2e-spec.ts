/**
 * The keys outside the database (docs/reliability.md, "Threat model"): a service started with another record key is
 * refused (every sealed link and keyed token hash would stop verifying); a start with another checkpoint signing key is
 * refused unless the rotation is explicit (LEADLINE_SIGNING_KEY_ROTATE), and after a rotation checkpoints signed by the
 * earlier key still verify against the signing-key history.
 */
import { generateKeyPairSync } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createApp } from '../../apps/api/src/app.factory';
import { ServiceKeys } from '../../apps/api/src/records/service-keys';
import { clearDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let dir: string;

beforeAll(async () => {
  t = await startTestApp('postgres', {}, undefined, { roles: true });
  dir = mkdtempSync(join(tmpdir(), 'leadline-keys-'));
});
afterAll(async () => {
  await t?.close();
  rmSync(dir, { recursive: true, force: true });
});

/** A second service on the same database, as the runtime role (the first one ran the migrations). */
function second(env: Record<string, string>) {
  return createApp({
    env: { DATABASE_URL: t.roles!.runtimeUrl, LEADLINE_MIGRATION_DATABASE_URL: t.roles!.ownerUrl, LOG_LEVEL: 'silent', LEADLINE_DEMO_SEED: 'false', LEADLINE_DATA_DIR: dir, ...env },
  });
}

function newSigningKey(name: string): string {
  const path = join(dir, name);
  writeFileSync(path, generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }), { mode: 0o600 });
  return path;
}

it('refuses to start with a record key other than the one the database was sealed with', async () => {
  await expect(second({})).rejects.toThrow(/sealed with another record key/);
});

it('refuses to start with another signing key unless LEADLINE_SIGNING_KEY_ROTATE is set; after a rotation earlier checkpoints still verify', async () => {
  const recordKey = t.app.get(ServiceKeys).key.source.path ?? resolve('data/record-key');
  const product = (await t.call('POST', '/api/v1/products', { code: 'KEY-1', name: 'Key rig (test product)' })).body.id;
  await t.call('POST', `/api/v1/products/${product}/calculations`, { title: 'screw', design: clearDesign });
  const before = (await t.call('POST', `/api/v1/products/${product}/checkpoints`, {})).body;
  const rotated = newSigningKey('rotated.pem');
  await expect(second({ LEADLINE_RECORD_KEY_FILE: recordKey, LEADLINE_SIGNING_KEY_FILE: rotated })).rejects.toThrow(
    /signed this database's earlier checkpoints.*LEADLINE_SIGNING_KEY_ROTATE/,
  );
  const { app } = await second({ LEADLINE_RECORD_KEY_FILE: recordKey, LEADLINE_SIGNING_KEY_FILE: rotated, LEADLINE_SIGNING_KEY_ROTATE: 'true' });
  try {
    const fastify = app.getHttpAdapter().getInstance();
    const published = JSON.parse((await fastify.inject({ method: 'GET', url: '/api/v1/checkpoints/public-key' })).body);
    expect(published.history.map((k: { keyId: string }) => k.keyId)).toEqual([before.keyId, published.keyId]);
    expect(published.history[0].validUntil).toBe(published.history[1].validFrom);
    const checked = JSON.parse(
      (await fastify.inject({ method: 'POST', url: '/api/v1/checkpoints/verify', payload: before, headers: { authorization: `Bearer ${t.tokens.author}` } })).body,
    );
    expect(checked).toMatchObject({ valid: true, signatureValid: true, keyMatches: true });
  } finally {
    await app.close();
  }
});

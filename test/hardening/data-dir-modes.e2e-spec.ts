/**
 * The embedded database folder is readable by the service's user alone: the folder and every folder in it 0700,
 * every file 0600 (PGlite writes its files 0666: 969 of 1,053 were readable and writable by any local user). Checked
 * on a real PGlite folder after start-up, and again after writes and a clean stop; a folder left behind with loose
 * modes is tightened on the next start.
 */
import { chmodSync, mkdtempSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createApp } from '../../apps/api/src/app.factory';
import { UNLIMITED } from '../support/harness';

const ADMIN = `ll_modes_test_admin_${'m'.repeat(24)}`;
let root: string;
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'leadline-modes-'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** Every entry under a folder (itself included) whose mode is not 0700 for a folder or 0600 for a file. */
function looseEntries(dir: string): string[] {
  const out: string[] = [];
  const walk = (folder: string) => {
    if ((statSync(folder).mode & 0o777) !== 0o700) out.push(`${folder} ${(statSync(folder).mode & 0o777).toString(8)}`);
    for (const e of readdirSync(folder, { withFileTypes: true })) {
      const path = join(folder, e.name);
      if (e.isDirectory()) walk(path);
      else if ((statSync(path).mode & 0o777) !== 0o600) out.push(`${path} ${(statSync(path).mode & 0o777).toString(8)}`);
    }
  };
  walk(dir);
  return out;
}

async function call(app: Awaited<ReturnType<typeof createApp>>['app'], method: 'GET' | 'POST', url: string, body?: unknown) {
  const res = await app.getHttpAdapter().getInstance().inject({
    method, url, headers: { authorization: `Bearer ${ADMIN}`, ...(body ? { 'content-type': 'application/json' } : {}) }, payload: body ? JSON.stringify(body) : undefined,
  });
  return { status: res.statusCode, body: JSON.parse(res.body) };
}

it('keeps the embedded data folder 0700 and its files 0600 from start to stop, and tightens a loose folder', async () => {
  const dir = join(root, 'data');
  const env = { LEADLINE_DATA_DIR: dir, LEADLINE_ADMIN_TOKEN: ADMIN, LEADLINE_DEMO_SEED: 'false', LOG_LEVEL: 'silent', ...UNLIMITED };
  const { app } = await createApp({ env });
  try {
    const files = readdirSync(dir, { recursive: true }).length;
    expect(files).toBeGreaterThan(100); // a real PGlite folder
    expect(looseEntries(dir)).toEqual([]);
    const user = await call(app, 'POST', '/api/v1/users', { name: 'Design author (modes)', roles: ['author', 'admin'] });
    expect(user.status).toBe(201);
    expect((await call(app, 'POST', '/api/v1/products', { code: 'MODES-1', name: 'modes' })).status).toBe(201);
  } finally {
    await app.close();
  }
  expect(looseEntries(dir)).toEqual([]);

  // loosened by someone else while stopped: the next start tightens it again before PGlite opens it
  chmodSync(dir, 0o755);
  writeFileSync(join(dir, 'left-behind.txt'), 'x', { mode: 0o666 });
  chmodSync(join(dir, 'left-behind.txt'), 0o666);
  expect(looseEntries(dir).length).toBe(2);
  const again = await createApp({ env });
  try {
    expect(looseEntries(dir)).toEqual([]);
    const products = await call(again.app, 'GET', '/api/v1/products');
    expect(products.body.items.map((p: { code: string }) => p.code)).toEqual(['MODES-1']);
  } finally {
    await again.app.close();
  }
});

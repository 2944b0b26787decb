/**
 * Attack: start a second service process on the embedded database folder of a running one. Before: both accepted
 * writes and, after a restart, acknowledged revisions were gone. Now the second refuses to start, naming the
 * folder and the holder's pid, and the first keeps every acknowledged write (real processes, real PGlite files).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { DataDirLockedError, LOCK_FILE, lockDataDir } from '../../apps/api/src/infra/database/data-dir-lock';
import { changedDesign, clearDesign } from '../support/designs';

const ROOT = resolve(__dirname, '../..');
const ADMIN = `ll_lock_test_admin_${'x'.repeat(24)}`;
// The built service (`npm test` builds dist/ first), or its sources through SWC when this file runs on its own
const BUILT = join(ROOT, 'dist/apps/api/src/main.js');
const MAIN_ARGS = existsSync(BUILT) ? [BUILT] : ['-r', './test/support/register-ts.js', 'apps/api/src/main.ts'];

interface Service {
  proc: ChildProcess;
  url: string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null; stderr: string; stdout: string }>;
}

/** Starts the service on the folder and a free port; resolves once it listens or has exited. */
async function start(dataDir: string): Promise<Service & { listening: boolean }> {
  const proc = spawn(process.execPath, MAIN_ARGS, {
    cwd: ROOT,
    env: { PATH: process.env.PATH, LEADLINE_DATA_DIR: dataDir, PORT: '0', HOST: '127.0.0.1', LEADLINE_DEMO_SEED: 'false', LEADLINE_ADMIN_TOKEN: ADMIN, LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let stdout = '';
  let stderr = '';
  let onOutput = () => undefined as void;
  proc.stdout!.on('data', (d) => {
    stdout += d;
    onOutput();
  });
  proc.stderr!.on('data', (d) => (stderr += d));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null; stderr: string; stdout: string }>((done) =>
    proc.once('exit', (code, signal) => done({ code, signal, stderr, stdout })),
  );
  // the banner (with the bound address) is one write; or the process ends without listening
  const listening = await new Promise<boolean>((done) => {
    onOutput = () => stdout.includes('Leadline is listening') && done(true);
    onOutput();
    void exited.then(() => done(stdout.includes('Leadline is listening')));
  });
  const url = /Leadline is listening on (http:\/\/127\.0\.0\.1:\d+)/.exec(stdout)?.[1] ?? 'http://127.0.0.1:0';
  return { proc, url, exited, listening };
}

async function call(url: string, token: string, method: string, path: string, body?: unknown) {
  const res = await fetch(url + path, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body ? { 'content-type': 'application/json' } : {}) },
    body: body ? JSON.stringify(body) : undefined,
  });
  return { status: res.status, body: (await res.json()) as any };
}

describe('two service processes on one embedded data folder', () => {
  const dir = mkdtempSync(join(tmpdir(), 'leadline-lock-'));
  const running: ChildProcess[] = [];
  afterAll(() => {
    for (const p of running) if (p.exitCode === null && p.signalCode === null) p.kill('SIGKILL');
    rmSync(dir, { recursive: true, force: true });
  });

  it('refuses the second process, naming the folder and the holder pid; the first keeps every acknowledged write, across restarts and a crash', async () => {
    const first = await start(dir);
    running.push(first.proc);
    expect(first.listening).toBe(true);
    const lock = JSON.parse(readFileSync(join(dir, LOCK_FILE), 'utf8'));
    expect(lock).toMatchObject({ pid: first.proc.pid, host: hostname() });

    // an author, a product, a calculation and acknowledged revisions through the first process
    const user = await call(first.url, ADMIN, 'POST', '/api/v1/users', { name: 'Design author (test)', roles: ['author'] });
    const author = (await call(first.url, ADMIN, 'POST', `/api/v1/users/${user.body.id}/tokens`, {})).body.token as string;
    const product = (await call(first.url, author, 'POST', '/api/v1/products', { code: 'LK-1', name: 'Lock test product' })).body.id as string;
    const opened = await call(first.url, author, 'POST', `/api/v1/products/${product}/calculations`, { title: 'lock', design: clearDesign });
    expect(opened.status).toBe(201);
    const acknowledged: string[] = [opened.body.revisionId];
    const revise = async (url: string, n: number) => {
      for (let i = 0; i < n; i++) {
        const res = await call(url, author, 'POST', `/api/v1/calculations/${opened.body.calculationId}/revisions`, { design: changedDesign(clearDesign, acknowledged.length + 1), note: `rev ${acknowledged.length + 1}` });
        expect(res.status).toBe(201);
        acknowledged.push(res.body.revisionId);
      }
    };
    await revise(first.url, 5);

    // the second process refuses to start
    const second = await start(dir);
    running.push(second.proc);
    expect(second.listening).toBe(false);
    const refused = await second.exited;
    expect(refused.code).toBe(1);
    expect(refused.stderr).toContain(`the embedded database folder ${dir} is locked by process ${first.proc.pid}`);
    expect(refused.stderr).toContain('that process is running');

    // the first goes on accepting writes, and still holds the lock
    await revise(first.url, 5);
    expect(JSON.parse(readFileSync(join(dir, LOCK_FILE), 'utf8')).pid).toBe(first.proc.pid);

    // a clean stop releases the lock
    first.proc.kill('SIGTERM');
    await first.exited;
    expect(existsSync(join(dir, LOCK_FILE))).toBe(false);

    // a restart finds every acknowledged revision, and a valid chain
    const again = await start(dir);
    running.push(again.proc);
    expect(again.listening).toBe(true);
    const listed = await call(again.url, author, 'GET', `/api/v1/calculations/${opened.body.calculationId}/revisions?limit=100`);
    expect(listed.status).toBe(200);
    const ids = new Set<string>((listed.body.items ?? listed.body).map((r: { id: string }) => r.id));
    for (const id of acknowledged) expect(ids.has(id)).toBe(true);
    expect(acknowledged).toHaveLength(11);
    const verified = await call(again.url, author, 'GET', `/api/v1/products/${product}/verify`);
    expect(verified.body.valid).toBe(true);
    await revise(again.url, 1);

    // a crash leaves a stale lock (its pid is gone): the next start takes it over and loses nothing
    again.proc.kill('SIGKILL');
    await again.exited;
    expect(JSON.parse(readFileSync(join(dir, LOCK_FILE), 'utf8')).pid).toBe(again.proc.pid);
    const afterCrash = await start(dir);
    running.push(afterCrash.proc);
    expect(afterCrash.listening).toBe(true);
    expect(JSON.parse(readFileSync(join(dir, LOCK_FILE), 'utf8')).pid).toBe(afterCrash.proc.pid);
    const relisted = await call(afterCrash.url, author, 'GET', `/api/v1/calculations/${opened.body.calculationId}/revisions?limit=100`);
    const reids = new Set<string>((relisted.body.items ?? relisted.body).map((r: { id: string }) => r.id));
    for (const id of acknowledged) expect(reids.has(id)).toBe(true);
    afterCrash.proc.kill('SIGTERM');
    await afterCrash.exited;
  }, 240_000);
});

describe('lockDataDir', () => {
  let dir: string;
  beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'leadline-lockunit-'))));
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('refuses a second open of the same folder in this process, and allows it once released', () => {
    const lock = lockDataDir(dir);
    expect(() => lockDataDir(dir)).toThrow(DataDirLockedError);
    expect(() => lockDataDir(dir)).toThrow(/already open in this process/);
    lock.release();
    lockDataDir(dir).release();
    expect(existsSync(join(dir, LOCK_FILE))).toBe(false);
  });

  it('takes over a stale lock of a dead pid, refuses a live one and one from another host', () => {
    const write = (content: object) => writeFileSync(join(dir, LOCK_FILE), JSON.stringify(content));
    write({ pid: 999_999, host: hostname(), startedAt: '2026-01-01T00:00:00Z' });
    expect(() => lockDataDir(dir, () => true)).toThrow(/locked by process 999999 .*that process is running/);
    const lock = lockDataDir(dir, () => false);
    expect(JSON.parse(readFileSync(join(dir, LOCK_FILE), 'utf8')).pid).toBe(process.pid);
    lock.release();
    write({ pid: 1234, host: 'other-host', startedAt: '2026-01-01T00:00:00Z' });
    expect(() => lockDataDir(dir, () => false)).toThrow(/process 1234 on other-host .*another host/);
    writeFileSync(join(dir, LOCK_FILE), 'garbage');
    expect(() => lockDataDir(dir, () => false)).toThrow(/not readable as a lock/);
  });
});

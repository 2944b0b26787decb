/**
 * `npm run faults`: fault runs against the built service (node dist/apps/api/src/main.js), loopback only,
 * each scenario bounded to a few tens of seconds. Not part of `npm test`. Prints one JSON line per scenario and
 * writes the figures to docs/reliability.md (section "Fault runs", with the commit measured).
 *
 * PostgreSQL scenarios use a fresh database on DATABASE_URL's server (dropped afterwards); the restart scenario
 * starts its own throw-away cluster (initdb into a temp folder, a spare port) and never touches that server.
 * Ports: FAULTS_PORT_BASE (default 3400) and the next few; the private cluster listens on FAULTS_PG_PORT (3499).
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { randomBytes, randomUUID } from 'node:crypto';
import { chmodSync, existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createServer } from 'node:http';
import { Client } from 'pg';

const ROOT = resolve(__dirname, '../../..');
const MAIN = join(ROOT, 'dist/apps/api/src/main.js');
const DESIGN = JSON.parse(readFileSync(join(ROOT, 'test/fixtures/ok/trapezoidal-jack.json'), 'utf8'));
/** The design with its friction reference told apart: a new revision must change the design (409 otherwise). */
const changed = (label: string | number) => ({
  ...DESIGN,
  friction: { ...DESIGN.friction, thread: { ...DESIGN.friction.thread, source: { ...DESIGN.friction.thread.source, reference: `${DESIGN.friction.thread.source.reference} (${label})` } } },
});
const SERVER_URL = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';
const PORT_BASE = Number(process.env.FAULTS_PORT_BASE ?? 3400);
const PG_PORT = Number(process.env.FAULTS_PG_PORT ?? 3499);
const PG_BIN = process.env.FAULTS_PG_BIN ?? '/usr/lib/postgresql/15/bin';
/** The fault runs submit a thousand revisions as one author in seconds: the per-user limits are raised for them. */
const UNLIMITED: Record<string, string> = {
  LEADLINE_SEARCHES_PER_USER_PER_MINUTE: '100000000',
  LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE: '100000000',
  LEADLINE_SUBMISSIONS_PER_USER_PER_MINUTE: '100000000',
  LEADLINE_PDFS_PER_USER_PER_MINUTE: '100000000',
};
const ADMIN_TOKEN = `ll_faults_admin_${randomBytes(16).toString('hex')}`;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const log = (...a: unknown[]) => process.stderr.write(`[faults] ${a.map(String).join(' ')}\n`);

// ---------------------------------------------------------------------------------------------------------------
// The service as a child process

interface Service {
  port: number;
  url: string;
  child: ChildProcess;
  output: string[];
  exited: Promise<number | null>;
}

/** Services started by the current scenario (their output is printed when it fails) */
let started: Service[] = [];

async function startService(port: number, env: Record<string, string>): Promise<Service> {
  const child = spawn(process.execPath, [MAIN], {
    cwd: ROOT,
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '/tmp', PORT: String(port), HOST: '127.0.0.1', LOG_LEVEL: 'warn', LEADLINE_DEMO_SEED: 'false', LEADLINE_ADMIN_TOKEN: ADMIN_TOKEN, ...UNLIMITED, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const output: string[] = [];
  const keep = (b: Buffer) => {
    output.push(...b.toString().split('\n').filter(Boolean));
    if (output.length > 200) output.splice(0, output.length - 200);
  };
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
  const svc: Service = { port, url: `http://127.0.0.1:${port}`, child, output, exited };
  started.push(svc);
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`service on ${port} exited at start:\n${output.join('\n')}`);
    try {
      const r = await fetch(`${svc.url}/health`, { signal: AbortSignal.timeout(2000) });
      if (r.status === 200) return svc;
    } catch {
      /* not listening yet */
    }
    if (Date.now() > deadline) throw new Error(`service on ${port} did not become healthy:\n${output.join('\n')}`);
    await sleep(200);
  }
}

async function stopService(svc: Service, signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
  if (svc.child.exitCode === null && svc.child.signalCode === null) svc.child.kill(signal);
  await Promise.race([svc.exited, sleep(15_000)]);
  if (svc.child.exitCode === null && svc.child.signalCode === null) {
    svc.child.kill('SIGKILL');
    await svc.exited;
  }
}

interface Answer {
  status: number;
  body: any;
  headers: Headers;
}

/** One HTTP call; a network failure (service gone) answers status 0. */
async function call(base: string, method: string, path: string, token: string | null, body?: unknown, timeoutMs = 20_000): Promise<Answer> {
  try {
    const r = await fetch(base + path, {
      method,
      headers: { ...(token ? { authorization: `Bearer ${token}` } : {}), ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: AbortSignal.timeout(timeoutMs),
    });
    const text = Buffer.from(await r.arrayBuffer());
    let parsed: unknown = text;
    if (/json/.test(r.headers.get('content-type') ?? '')) parsed = JSON.parse(text.toString('utf8'));
    return { status: r.status, body: parsed, headers: r.headers };
  } catch {
    return { status: 0, body: null, headers: new Headers() };
  }
}

interface Actors {
  author: string;
  reviewer: string;
  reviewer2: string;
  /** Each user's own password (a decision is signed with it) */
  passwords: Record<'author' | 'reviewer' | 'reviewer2', string>;
}

/**
 * The users of a run, as real users become them: the admin creates each with an email, the user sets their own
 * password with the activation code, signs in and issues their own token (a token the admin issued never decides).
 */
async function setupActors(base: string): Promise<Actors> {
  const passwords = {} as Actors['passwords'];
  const mk = async (who: keyof Actors['passwords'], name: string, roles: string[]) => {
    const email = `${who}.${randomUUID()}@faults.example.com`;
    passwords[who] = `${who} password for the fault runs`;
    const u = await call(base, 'POST', '/api/v1/users', ADMIN_TOKEN, { name, email, roles });
    if (u.status !== 201) throw new Error(`create user: ${u.status} ${JSON.stringify(u.body)}`);
    await call(base, 'POST', '/api/v1/account/activate', null, { activationCode: u.body.activationCode, password: passwords[who] });
    const signed = await fetch(`${base}/api/v1/sessions`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: passwords[who] }) });
    const cookie = (signed.headers.get('set-cookie') ?? '').split(';')[0];
    const me = (await (await fetch(`${base}/api/v1/me`, { headers: { cookie } })).json()) as { csrfToken: string };
    const t = await fetch(`${base}/api/v1/account/tokens`, { method: 'POST', headers: { cookie, 'x-csrf-token': me.csrfToken, 'content-type': 'application/json' }, body: '{}' });
    if (t.status !== 201) throw new Error(`own token: ${t.status}`);
    return ((await t.json()) as { token: string }).token;
  };
  return {
    author: await mk('author', 'Design author (faults)', ['author']),
    reviewer: await mk('reviewer', 'Checking engineer (faults)', ['reviewer']),
    reviewer2: await mk('reviewer2', 'Second checker (faults)', ['reviewer']),
    passwords,
  };
}

async function openCalculation(base: string, token: string, code: string, count: number): Promise<{ productId: string; calculations: string[] }> {
  const p = await call(base, 'POST', '/api/v1/products', token, { code, name: `${code} test rig (invented)` });
  if (p.status !== 201) throw new Error(`product: ${p.status} ${JSON.stringify(p.body)}`);
  const calculations: string[] = [];
  for (let i = 0; i < count; i++) {
    const c = await call(base, 'POST', `/api/v1/products/${p.body.id}/calculations`, token, { title: `screw ${i + 1}`, design: DESIGN });
    if (c.status !== 201) throw new Error(`calculation: ${c.status} ${JSON.stringify(c.body)}`);
    calculations.push(c.body.calculationId);
  }
  return { productId: p.body.id, calculations };
}

// ---------------------------------------------------------------------------------------------------------------
// Databases

async function withClient<T>(url: string, work: (c: Client) => Promise<T>): Promise<T> {
  const c = new Client({ connectionString: url });
  c.on('error', () => undefined); // a terminated session must not crash the runner
  await c.connect();
  try {
    return await work(c);
  } finally {
    await c.end().catch(() => undefined);
  }
}

function databaseUrl(server: string, name: string): string {
  const u = new URL(server);
  u.pathname = `/${name}`;
  return u.toString();
}

async function createDatabase(server: string): Promise<{ url: string; name: string; drop(): Promise<void> }> {
  const name = `leadline_faults_${randomBytes(5).toString('hex')}`;
  await withClient(server, (c) => c.query(`CREATE DATABASE ${name}`));
  return { url: databaseUrl(server, name), name, drop: () => withClient(server, (c) => c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)).then(() => undefined) };
}

/** Revision numbers of each calculation, read straight from the database. */
type Numbers = Map<string, number[]>;
const NUMBERS_SQL = `SELECT calculation_id, revision, id, hash FROM revisions ORDER BY calculation_id, revision`;
interface StoredRevision { calculation_id: string; revision: number; id: string; hash: string }

async function storedRevisionsPg(url: string): Promise<StoredRevision[]> {
  return withClient(url, async (c) => (await c.query<StoredRevision>(NUMBERS_SQL)).rows);
}

async function storedRevisionsEmbedded(dir: string): Promise<StoredRevision[]> {
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const { PGlite } = require('@electric-sql/pglite') as typeof import('@electric-sql/pglite');
  const db = new PGlite(dir);
  try {
    return (await db.query<StoredRevision>(NUMBERS_SQL)).rows;
  } finally {
    await db.close();
  }
}

function contiguity(rows: StoredRevision[]): { calculations: number; revisions: number; gapsOrDuplicates: number } {
  const by: Numbers = new Map();
  for (const r of rows) by.set(r.calculation_id, [...(by.get(r.calculation_id) ?? []), Number(r.revision)]);
  let bad = 0;
  for (const nums of by.values()) nums.forEach((n, i) => (n !== i + 1 ? bad++ : undefined));
  return { calculations: by.size, revisions: rows.length, gapsOrDuplicates: bad };
}

interface Ack { calculationId: string; revisionId: string; revision: number; hash: string }

/** Every acknowledged revision is stored with its number and hash. */
function missingAcks(acks: Ack[], rows: StoredRevision[]): number {
  const byId = new Map(rows.map((r) => [r.id, r]));
  return acks.filter((a) => {
    const r = byId.get(a.revisionId);
    return !r || Number(r.revision) !== a.revision || r.hash !== a.hash || r.calculation_id !== a.calculationId;
  }).length;
}

async function verifyChain(base: string, token: string, productId: string): Promise<{ valid: boolean; links: number }> {
  const v = await call(base, 'GET', `/api/v1/products/${productId}/verify`, token, undefined, 120_000);
  if (v.status !== 200) throw new Error(`verify: ${v.status} ${JSON.stringify(v.body)}`);
  return { valid: v.body.valid, links: v.body.links };
}

// ---------------------------------------------------------------------------------------------------------------
// Load

interface LoadStats {
  attempted: number;
  acknowledged: number;
  statuses: Record<string, number>;
  /** 503 answers that were problem+json with Retry-After */
  clean503: number;
  /** 5xx answers other than a clean 503 */
  unclean5xx: number;
  samples: string[];
}

function newStats(): LoadStats {
  return { attempted: 0, acknowledged: 0, statuses: {}, clean503: 0, unclean5xx: 0, samples: [] };
}

/** Submits revisions with `concurrency` workers until `until()` says stop; records every acknowledged one. */
async function submitLoad(opts: {
  base: () => string;
  token: string;
  calculations: string[];
  concurrency: number;
  until: (s: LoadStats) => boolean;
  pause?: () => Promise<void>;
  acks: Ack[];
  stats: LoadStats;
}): Promise<void> {
  const { stats } = opts;
  const worker = async () => {
    while (!opts.until(stats)) {
      if (opts.pause) await opts.pause();
      if (opts.until(stats)) return;
      const n = stats.attempted++;
      const calculationId = opts.calculations[n % opts.calculations.length];
      const r = await call(opts.base(), 'POST', `/api/v1/calculations/${calculationId}/revisions`, opts.token, { design: changed(`fault run ${n}`), note: `fault run ${n}` });
      stats.statuses[r.status] = (stats.statuses[r.status] ?? 0) + 1;
      if (r.status === 201) {
        stats.acknowledged++;
        opts.acks.push({ calculationId, revisionId: r.body.revisionId, revision: r.body.revision, hash: r.body.hash });
      } else if (r.status === 503 && /problem\+json/.test(r.headers.get('content-type') ?? '') && r.headers.get('retry-after')) {
        stats.clean503++;
      } else if (r.status >= 500) {
        stats.unclean5xx++;
        if (stats.samples.length < 5) stats.samples.push(`${r.status} ${JSON.stringify(r.body).slice(0, 200)}`);
      }
      if (r.status === 0 || r.status === 503) await sleep(50); // service or database gone: do not spin
    }
  };
  await Promise.all(Array.from({ length: opts.concurrency }, worker));
}

// ---------------------------------------------------------------------------------------------------------------
// Scenarios

type Figures = Record<string, unknown> & { scenario: string; pass: boolean; seconds: number };

/** kill -9 the service while 1,000 submissions run, restart it, finish; then check every acknowledged write. */
async function killDuringSubmissions(backend: 'postgres' | 'embedded'): Promise<Figures> {
  const started = Date.now();
  const TOTAL = 1000;
  const KILL_AFTER = 350;
  const db = backend === 'postgres' ? await createDatabase(SERVER_URL) : null;
  const dir = backend === 'embedded' ? mkdtempSync(join(tmpdir(), 'leadline-faults-')) : null;
  const env: Record<string, string> = db ? { DATABASE_URL: db.url, LEADLINE_DB_POOL: '10' } : { LEADLINE_DATA_DIR: dir! };
  const port = PORT_BASE + (backend === 'postgres' ? 1 : 2);
  let svc = await startService(port, env);
  try {
    const actors = await setupActors(svc.url);
    const { productId, calculations } = await openCalculation(svc.url, actors.author, `KILL-${backend}`, 2);
    const acks: Ack[] = [];
    const stats = newStats();
    let restarting: Promise<void> | null = null;
    let killedAt = -1;
    let restartSeconds = 0;
    await submitLoad({
      base: () => svc.url,
      token: actors.author,
      calculations,
      concurrency: 8,
      acks,
      stats,
      until: (s) => s.attempted >= TOTAL,
      pause: async () => {
        if (killedAt < 0 && stats.acknowledged >= KILL_AFTER) {
          killedAt = stats.acknowledged;
          const old = svc;
          restarting = (async () => {
            old.child.kill('SIGKILL');
            await old.exited;
            const t0 = Date.now();
            svc = await startService(port, env);
            restartSeconds = (Date.now() - t0) / 1000;
          })();
        }
        if (restarting) await restarting;
      },
    });
    if (restarting) await restarting;
    const chain = await verifyChain(svc.url, actors.author, productId);
    await stopService(svc);
    const rows = db ? await storedRevisionsPg(db.url) : await storedRevisionsEmbedded(dir!);
    const contiguous = contiguity(rows);
    const missing = missingAcks(acks, rows);
    // stored beyond the acknowledged: the revisions 1 of the opened calculations, and submissions that committed
    // while their answer was lost with the process (at most one per lost answer)
    const unacknowledgedStored = rows.length - calculations.length - stats.acknowledged;
    return {
      scenario: `kill -9 during ${TOTAL} submissions (${backend})`,
      pass: killedAt > 0 && missing === 0 && contiguous.gapsOrDuplicates === 0 && chain.valid && unacknowledgedStored >= 0 && unacknowledgedStored <= (stats.statuses['0'] ?? 0),
      seconds: (Date.now() - started) / 1000,
      attempted: stats.attempted, acknowledged: stats.acknowledged, killedAfterAcks: killedAt, restartSeconds,
      statuses: stats.statuses, missingAcknowledged: missing, storedRevisions: contiguous.revisions, unacknowledgedStored, gapsOrDuplicates: contiguous.gapsOrDuplicates,
      chainValid: chain.valid, chainLinks: chain.links,
    };
  } finally {
    await stopService(svc, 'SIGKILL');
    await db?.drop();
    if (dir) rmSync(dir, { recursive: true, force: true });
  }
}

/** pg_terminate_backend on the service's sessions, every 500 ms, under submission load. */
async function terminateConnections(): Promise<Figures> {
  const started = Date.now();
  const db = await createDatabase(SERVER_URL);
  const svc = await startService(PORT_BASE + 3, { DATABASE_URL: db.url, LEADLINE_DB_POOL: '10' });
  try {
    const actors = await setupActors(svc.url);
    const { productId, calculations } = await openCalculation(svc.url, actors.author, 'TERM-1', 2);
    const acks: Ack[] = [];
    const stats = newStats();
    let terminated = 0;
    const stopAt = Date.now() + 10_000;
    const killer = (async () => {
      await withClient(SERVER_URL, async (c) => {
        while (Date.now() < stopAt - 2000) {
          await sleep(500);
          const r = await c.query(`SELECT count(*) FILTER (WHERE pg_terminate_backend(pid)) AS n FROM pg_stat_activity WHERE datname = $1 AND pid <> pg_backend_pid()`, [db.name]);
          terminated += Number(r.rows[0].n);
        }
      });
    })();
    await submitLoad({ base: () => svc.url, token: actors.author, calculations, concurrency: 8, acks, stats, until: () => Date.now() > stopAt });
    await killer;
    const after = await call(svc.url, 'GET', '/health', null);
    const recovered = await call(svc.url, 'POST', `/api/v1/calculations/${calculations[0]}/revisions`, actors.author, { design: changed('after the terminations'), note: 'after the terminations' });
    if (recovered.status === 201) acks.push({ calculationId: calculations[0], revisionId: recovered.body.revisionId, revision: recovered.body.revision, hash: recovered.body.hash });
    const chain = await verifyChain(svc.url, actors.author, productId);
    const rows = await storedRevisionsPg(db.url);
    const contiguous = contiguity(rows);
    const missing = missingAcks(acks, rows);
    return {
      scenario: 'connections terminated under load (PostgreSQL)',
      pass: stats.unclean5xx === 0 && after.status === 200 && recovered.status === 201 && missing === 0 && contiguous.gapsOrDuplicates === 0 && chain.valid && svc.child.exitCode === null,
      seconds: (Date.now() - started) / 1000,
      sessionsTerminated: terminated, attempted: stats.attempted, acknowledged: stats.acknowledged, statuses: stats.statuses, clean503: stats.clean503,
      unclean5xx: stats.unclean5xx, unclean5xxSamples: stats.samples, healthAfter: after.status, submissionAfter: recovered.status,
      missingAcknowledged: missing, gapsOrDuplicates: contiguous.gapsOrDuplicates, chainValid: chain.valid,
    };
  } finally {
    await stopService(svc, 'SIGKILL');
    await db.drop();
  }
}

/** A private PostgreSQL cluster (initdb into a temp folder), so that it can be stopped and started. */
class PrivateCluster {
  readonly dir = mkdtempSync(join(tmpdir(), 'leadline-faults-pg-'));
  readonly url = `postgres://postgres@127.0.0.1:${PG_PORT}/postgres`;
  private readonly asPostgres = process.getuid?.() === 0;

  private run(bin: string, args: string[]): void {
    const cmd = join(PG_BIN, bin);
    if (this.asPostgres) execFileSync('runuser', ['-u', 'postgres', '--', cmd, ...args], { stdio: 'pipe' });
    else execFileSync(cmd, args, { stdio: 'pipe' });
  }

  init(): void {
    if (this.asPostgres) {
      chmodSync(this.dir, 0o777);
      execFileSync('chown', ['postgres', this.dir]);
    }
    this.run('initdb', ['-D', join(this.dir, 'data'), '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--no-instructions']);
  }

  start(): void {
    this.run('pg_ctl', ['-D', join(this.dir, 'data'), '-l', join(this.dir, 'log'), '-w', '-t', '30', '-o', `-p ${PG_PORT} -k ${this.dir} -c listen_addresses=127.0.0.1`, 'start']);
  }

  /** Stops as a crash would: no shutdown checkpoint (acknowledged commits must survive by the WAL). */
  stop(mode: 'immediate' | 'fast' = 'immediate'): void {
    this.run('pg_ctl', ['-D', join(this.dir, 'data'), '-w', '-t', '30', '-m', mode, 'stop']);
  }

  remove(): void {
    try {
      if (existsSync(join(this.dir, 'data', 'postmaster.pid'))) this.stop('fast');
    } catch {
      /* already stopped */
    }
    rmSync(this.dir, { recursive: true, force: true });
  }
}

/** PostgreSQL (a private cluster) stopped for a few seconds under load, then started again. */
async function restartDatabase(): Promise<Figures> {
  const started = Date.now();
  const cluster = new PrivateCluster();
  let svc: Service | null = null;
  try {
    cluster.init();
    cluster.start();
    const db = await createDatabase(cluster.url);
    svc = await startService(PORT_BASE + 4, { DATABASE_URL: db.url, LEADLINE_DB_POOL: '10' });
    const base = svc.url;
    const actors = await setupActors(base);
    const { productId, calculations } = await openCalculation(base, actors.author, 'RESTART-1', 2);
    const acks: Ack[] = [];
    const before = newStats();
    const during = newStats();
    const afterStats = newStats();
    const health: Record<string, number> = {};
    const load = (stats: LoadStats, ms: number) => {
      const end = Date.now() + ms;
      return submitLoad({ base: () => base, token: actors.author, calculations, concurrency: 8, acks, stats, until: () => Date.now() > end });
    };
    await load(before, 3000);
    cluster.stop('immediate');
    const downSince = Date.now();
    const probe = (async () => {
      while (Date.now() - downSince < 3500) {
        const h = await call(base, 'GET', '/health', null, undefined, 5000);
        const key = h.status === 503 && /problem\+json/.test(h.headers.get('content-type') ?? '') && h.headers.get('retry-after') ? '503 problem+json, Retry-After' : String(h.status);
        health[key] = (health[key] ?? 0) + 1;
        await sleep(250);
      }
    })();
    await load(during, 4000);
    await probe;
    cluster.start();
    const upAt = Date.now();
    // recovery: the first acknowledged submission after the database is back, without restarting the service
    let recoverySeconds = -1;
    for (let i = 0; i < 100; i++) {
      const r = await call(base, 'POST', `/api/v1/calculations/${calculations[0]}/revisions`, actors.author, { design: changed(`recovery ${i}`), note: `recovery ${i}` });
      if (r.status === 201) {
        acks.push({ calculationId: calculations[0], revisionId: r.body.revisionId, revision: r.body.revision, hash: r.body.hash });
        recoverySeconds = (Date.now() - upAt) / 1000;
        break;
      }
      await sleep(200);
    }
    await load(afterStats, 3000);
    const healthAfter = await call(base, 'GET', '/health', null);
    const chain = await verifyChain(base, actors.author, productId);
    const rows = await storedRevisionsPg(db.url);
    const contiguous = contiguity(rows);
    const missing = missingAcks(acks, rows);
    const unclean = before.unclean5xx + during.unclean5xx + afterStats.unclean5xx;
    const healthOk = Object.keys(health).every((k) => k === '503 problem+json, Retry-After');
    return {
      scenario: 'PostgreSQL stopped (immediate) and restarted under load (private cluster)',
      pass: unclean === 0 && healthOk && Object.keys(health).length > 0 && recoverySeconds >= 0 && healthAfter.status === 200 && missing === 0 && contiguous.gapsOrDuplicates === 0 && chain.valid && svc.child.exitCode === null,
      seconds: (Date.now() - started) / 1000,
      before: before.statuses, whileDown: during.statuses, whileDownClean503: during.clean503, after: afterStats.statuses, unclean5xx: unclean,
      unclean5xxSamples: [...before.samples, ...during.samples, ...afterStats.samples].slice(0, 5), healthWhileDown: health, recoverySeconds,
      healthAfter: healthAfter.status, missingAcknowledged: missing, storedRevisions: contiguous.revisions, gapsOrDuplicates: contiguous.gapsOrDuplicates, chainValid: chain.valid,
    };
  } finally {
    if (svc) await stopService(svc, 'SIGKILL');
    cluster.remove();
  }
}

/** Two service processes on one PostgreSQL database: one calculation, the same revisions decided from both. */
async function twoProcesses(): Promise<Figures> {
  const started = Date.now();
  const db = await createDatabase(SERVER_URL);
  const env = { DATABASE_URL: db.url, LEADLINE_DB_POOL: '10' };
  const a = await startService(PORT_BASE + 5, env);
  const b = await startService(PORT_BASE + 6, env);
  try {
    const actors = await setupActors(a.url);
    const { productId, calculations } = await openCalculation(a.url, actors.author, 'TWO-1', 1);
    const acks: Ack[] = [];
    const stats = newStats();
    let turn = 0;
    await submitLoad({ base: () => (turn++ % 2 ? b.url : a.url), token: actors.author, calculations, concurrency: 8, acks, stats, until: (s) => s.attempted >= 400 });
    // the same revisions decided from both processes at once, by two reviewers
    const DECISIONS = 20;
    const outcomes: Record<string, number> = {};
    let exactlyOne = 0;
    for (let i = 0; i < DECISIONS; i++) {
      const c = await call(a.url, 'POST', `/api/v1/products/${productId}/calculations`, actors.author, { title: `decided ${i}`, design: DESIGN });
      const id = c.body.revisionId;
      const [x, y] = await Promise.all([
        call(a.url, 'POST', `/api/v1/revisions/${id}/decisions`, actors.reviewer, { decision: 'approve', comment: 'process A', signature: { method: 'password', password: actors.passwords.reviewer } }),
        call(b.url, 'POST', `/api/v1/revisions/${id}/decisions`, actors.reviewer2, { decision: 'reject', comment: 'process B', signature: { method: 'password', password: actors.passwords.reviewer2 } }),
      ]);
      const key = [x.status, y.status].sort().join('+');
      outcomes[key] = (outcomes[key] ?? 0) + 1;
      if (key === '201+409') exactlyOne++;
    }
    const chain = await verifyChain(b.url, actors.author, productId);
    const rows = await storedRevisionsPg(db.url);
    const contiguous = contiguity(rows);
    const missing = missingAcks(acks, rows);
    const closures = await withClient(db.url, async (c) => (await c.query(`SELECT count(*)::int AS n, count(DISTINCT revision_id)::int AS d FROM revision_closures`)).rows[0]);
    return {
      scenario: 'two service processes on one PostgreSQL database',
      pass: stats.unclean5xx === 0 && missing === 0 && contiguous.gapsOrDuplicates === 0 && exactlyOne === DECISIONS && closures.n === DECISIONS && closures.d === DECISIONS && chain.valid,
      seconds: (Date.now() - started) / 1000,
      submissions: stats.attempted, acknowledged: stats.acknowledged, statuses: stats.statuses, missingAcknowledged: missing, gapsOrDuplicates: contiguous.gapsOrDuplicates,
      racedDecisions: DECISIONS, decisionOutcomes: outcomes, closures: closures.n, chainValid: chain.valid, chainLinks: chain.links,
    };
  } finally {
    await stopService(a, 'SIGKILL');
    await stopService(b, 'SIGKILL');
    await db.drop();
  }
}

/**
 * The queue: a service that commits record events but runs no jobs (LEADLINE_WORKERS=0) is killed with SIGKILL; a new
 * process on the same database delivers every event's webhook after the restart. Then two processes with workers
 * share the queue: every message arrives, none twice (the receiver answers 200 to all).
 */
async function queueDelivery(): Promise<Figures> {
  const began = Date.now();
  const db = await createDatabase(SERVER_URL);
  const seen = new Map<string, number>();
  const receiver = createServer((req, res) => {
    req.resume();
    req.on('end', () => {
      const id = String(req.headers['webhook-id']);
      seen.set(id, (seen.get(id) ?? 0) + 1);
      res.writeHead(200).end();
    });
  });
  await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', r));
  const hook = `http://127.0.0.1:${(receiver.address() as { port: number }).port}/hook`;
  const env = { DATABASE_URL: db.url, LEADLINE_DB_POOL: '5', LEADLINE_WEBHOOK_ALLOW_PRIVATE: 'true', LEADLINE_QUEUE_POLL_MS: '500' };
  const waitFor = async (n: number, ms: number) => {
    const deadline = Date.now() + ms;
    while (seen.size < n && Date.now() < deadline) await sleep(100);
    return seen.size;
  };
  try {
    const a = await startService(PORT_BASE + 7, { ...env, LEADLINE_WORKERS: '0' });
    const actors = await setupActors(a.url);
    const endpoint = await call(a.url, 'POST', '/api/v1/webhooks', ADMIN_TOKEN, { url: hook, events: ['calculation.opened', 'revision.submitted'] });
    if (endpoint.status !== 201) throw new Error(`endpoint: ${endpoint.status} ${JSON.stringify(endpoint.body)}`);
    const OPENED = 25;
    await openCalculation(a.url, actors.author, 'QK-1', OPENED);
    const expectedBeforeKill = OPENED * 2; // calculation.opened and revision.submitted for each
    const beforeKill = seen.size;
    await stopService(a, 'SIGKILL');
    const b = await startService(PORT_BASE + 8, { ...env, LEADLINE_WORKERS: '2' });
    const afterRestart = await waitFor(expectedBeforeKill, 60_000);
    const c = await startService(PORT_BASE + 9, { ...env, LEADLINE_WORKERS: '2' });
    const MORE = 20;
    await Promise.all([openCalculation(b.url, actors.author, 'QK-2', MORE / 2), openCalculation(c.url, actors.author, 'QK-3', MORE / 2)]);
    const total = expectedBeforeKill + MORE * 2;
    const delivered = await waitFor(total, 60_000);
    const duplicates = [...seen.values()].filter((n) => n > 1).length;
    const jobs = await withClient(db.url, async (q) => (await q.query(`SELECT state, count(*)::int AS n FROM queue.jobs GROUP BY state ORDER BY state`)).rows);
    await stopService(b, 'SIGKILL');
    await stopService(c, 'SIGKILL');
    return {
      scenario: 'queue: kill -9 between commit and delivery, then two processes sharing the jobs',
      pass: beforeKill === 0 && afterRestart === expectedBeforeKill && delivered === total && duplicates === 0,
      seconds: (Date.now() - began) / 1000,
      deliveredBeforeKill: beforeKill, eventsCommittedBeforeKill: expectedBeforeKill, deliveredAfterRestart: afterRestart,
      messagesExpected: total, messagesDelivered: delivered, duplicateDeliveries: duplicates, jobStates: Object.fromEntries(jobs.map((r) => [r.state, r.n])),
    };
  } finally {
    for (const svc of started) await stopService(svc, 'SIGKILL');
    await new Promise<void>((r) => receiver.close(() => r()));
    await db.drop();
  }
}

/**
 * A design-file job whose instance is killed (SIGKILL) while it renders: another instance takes it once the lease
 * (LEADLINE_QUEUE_LEASE_SECONDS, short here) has run out, and the file is rendered once and kept.
 */
async function queueDesignFile(): Promise<Figures> {
  const began = Date.now();
  const db = await createDatabase(SERVER_URL);
  const LEASE = 6;
  const env = { DATABASE_URL: db.url, LEADLINE_DB_POOL: '5', LEADLINE_QUEUE_POLL_MS: '500', LEADLINE_QUEUE_LEASE_SECONDS: String(LEASE) };
  const job = async (id: string) =>
    withClient(db.url, async (q) => (await q.query(`SELECT state, attempts, locked_by, result FROM queue.jobs WHERE id = $1`, [id])).rows[0] as
      { state: string; attempts: number; locked_by: string | null; result: { fileId: string; href: string; reused: boolean } | null } | undefined);
  try {
    const a = await startService(PORT_BASE + 7, { ...env, LEADLINE_WORKERS: '1' });
    const actors = await setupActors(a.url);
    const { productId } = await openCalculation(a.url, actors.author, 'QD-1', 12);
    const accepted = await call(a.url, 'POST', `/api/v1/products/${productId}/design-files`, actors.reviewer, { paper: 'A4' });
    if (accepted.status !== 202) throw new Error(`design-files: ${accepted.status} ${JSON.stringify(accepted.body)}`);
    const id = accepted.body.jobId as string;
    // kill the instance as soon as it holds the job
    const deadline = Date.now() + 30_000;
    let taken = await job(id);
    while (taken?.state !== 'running' && Date.now() < deadline) {
      await sleep(10);
      taken = await job(id);
    }
    await stopService(a, 'SIGKILL');
    const killed = Date.now();
    const afterKill = await job(id);
    const b = await startService(PORT_BASE + 8, { ...env, LEADLINE_WORKERS: '2' });
    let done = await job(id);
    while (done?.state !== 'done' && done?.state !== 'failed' && Date.now() < killed + 90_000) {
      await sleep(200);
      done = await job(id);
    }
    const retakenAfterSeconds = (Date.now() - killed) / 1000;
    const status = await call(b.url, 'GET', `/api/v1/jobs/${id}`, actors.author);
    const file = done?.result ? await call(b.url, 'GET', done.result.href, actors.author, undefined, 60_000) : null;
    const pdf = file?.status === 200 && Buffer.isBuffer(file.body) && file.body.subarray(0, 5).toString() === '%PDF-';
    const files = await withClient(db.url, async (q) => (await q.query(`SELECT count(*)::int AS n FROM queue.rendered_files WHERE subject_id = $1`, [productId])).rows[0].n as number);
    await stopService(b, 'SIGKILL');
    return {
      scenario: 'queue: design-file job survives kill -9 of the instance rendering it',
      pass: afterKill?.state === 'running' && afterKill.attempts === 1 && done?.state === 'done' && done.attempts === 2 && status.body?.state === 'done' && pdf && files === 1,
      seconds: (Date.now() - began) / 1000,
      leaseSeconds: LEASE, stateAtKill: afterKill?.state ?? 'missing', attemptsAtKill: afterKill?.attempts ?? 0,
      finalState: done?.state ?? 'missing', attempts: done?.attempts ?? 0, doneSecondsAfterKill: Number(retakenAfterSeconds.toFixed(1)),
      pdfDownloaded: pdf, filesStored: files,
    };
  } finally {
    for (const svc of started) await stopService(svc, 'SIGKILL');
    await db.drop();
  }
}

/** Process ids of the service's Chromium (its direct children running the browser binary). */
function chromiumChildren(pid: number): number[] {
  const out: number[] = [];
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      if (ppid === pid && /chrom/i.test(readFileSync(`/proc/${entry}/cmdline`, 'utf8'))) out.push(Number(entry));
    } catch {
      /* gone */
    }
  }
  return out;
}

/** Chromium killed (SIGKILL) while PDFs render: in-flight requests fail cleanly, the next ones succeed. */
async function killChromium(): Promise<Figures> {
  const started = Date.now();
  const db = await createDatabase(SERVER_URL);
  const svc = await startService(PORT_BASE + 7, { DATABASE_URL: db.url });
  try {
    const actors = await setupActors(svc.url);
    const c = await call(svc.url, 'POST', '/api/v1/products', actors.author, { code: 'PDF-1', name: 'PDF-1 rig (invented)' });
    const opened = await call(svc.url, 'POST', `/api/v1/products/${c.body.id}/calculations`, actors.author, { title: 'lift screw', design: DESIGN });
    const path = `/api/v1/revisions/${opened.body.revisionId}/report.pdf`;
    const warm = await call(svc.url, 'GET', path, actors.author, undefined, 60_000);
    const rounds = 3;
    const inflight: Record<string, number> = {};
    let killed = 0;
    let uncleanInflight = 0;
    const next: Record<string, number> = {};
    for (let round = 0; round < rounds; round++) {
      const pending = Array.from({ length: 6 }, () => call(svc.url, 'GET', path, actors.author, undefined, 60_000));
      await sleep(150);
      for (const pid of chromiumChildren(svc.child.pid!)) {
        process.kill(pid, 'SIGKILL');
        killed++;
      }
      for (const r of await Promise.all(pending)) {
        const clean = r.status === 200 ? /pdf/.test(r.headers.get('content-type') ?? '') : r.status >= 500 && /problem\+json/.test(r.headers.get('content-type') ?? '');
        const key = r.status === 200 ? '200 pdf' : `${r.status}${clean ? ' problem+json' : ''}`;
        inflight[key] = (inflight[key] ?? 0) + 1;
        if (!clean) uncleanInflight++;
      }
      for (let i = 0; i < 2; i++) {
        const r = await call(svc.url, 'GET', path, actors.author, undefined, 60_000);
        const key = r.status === 200 && /pdf/.test(r.headers.get('content-type') ?? '') ? '200 pdf' : String(r.status);
        next[key] = (next[key] ?? 0) + 1;
      }
    }
    const health = await call(svc.url, 'GET', '/health', null);
    return {
      scenario: 'Chromium killed while PDFs render',
      pass: warm.status === 200 && killed >= rounds && uncleanInflight === 0 && Object.keys(next).every((k) => k === '200 pdf') && health.status === 200 && svc.child.exitCode === null,
      seconds: (Date.now() - started) / 1000,
      rounds, browserProcessesKilled: killed, inflightAnswers: inflight, nextAnswers: next, healthAfter: health.status,
    };
  } finally {
    await stopService(svc, 'SIGKILL');
    await db.drop();
  }
}

// ---------------------------------------------------------------------------------------------------------------

const SCENARIOS: Record<string, () => Promise<Figures>> = {
  'kill-postgres': () => killDuringSubmissions('postgres'),
  'kill-embedded': () => killDuringSubmissions('embedded'),
  'terminate-connections': terminateConnections,
  'restart-postgres': restartDatabase,
  'two-processes': twoProcesses,
  'kill-chromium': killChromium,
  'queue-delivery': queueDelivery,
  'queue-design-file': queueDesignFile,
};

function commit(): string {
  try {
    const sha = execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: ROOT }).toString().trim();
    const dirty = execFileSync('git', ['status', '--porcelain', '--untracked-files=no'], { cwd: ROOT }).toString().trim() !== '';
    return dirty ? `${sha} (with uncommitted changes)` : sha;
  } catch {
    return 'unknown';
  }
}

function writeDocs(results: Figures[]): void {
  const file = join(ROOT, 'docs/reliability.md');
  const heading = '## Fault runs';
  const lines = [
    heading,
    '',
    `Measured by \`npm run faults\` (test/faults/run.ts) on commit ${commit()}, ${new Date().toISOString().slice(0, 16).replace('T', ' ')} UTC, against the built service`,
    '(node dist/apps/api/src/main.js), loopback only, on this 2-core machine shared with other work. Each scenario starts its own',
    'service processes and databases and removes them afterwards; the PostgreSQL restart uses a private cluster (initdb into a temp folder).',
    '',
    '| scenario | result | seconds | figures |',
    '|---|---|---|---|',
    ...results.map((r) => {
      const { scenario, pass, seconds, ...rest } = r;
      const figures = Object.entries(rest).map(([k, v]) => `${k}: ${typeof v === 'object' ? JSON.stringify(v) : String(v)}`).join('; ').replace(/\|/g, '\\|');
      return `| ${scenario} | ${pass ? 'pass' : '**FAIL**'} | ${seconds.toFixed(1)} | ${figures} |`;
    }),
    '',
    'What each checks: kill -9 — every acknowledged (201) revision is stored with its number and hash, numbers per calculation are',
    '1..n without gaps or duplicates (read from the database after the run), the chain verifies; status 0 counts requests whose answer',
    'was lost with the process, and unacknowledgedStored those of them that had committed (never more). Terminated connections and database',
    'restart — no 5xx other than 503 problem+json with Retry-After, /health answers 503 while the database is gone and 200 after,',
    'submissions succeed again without restarting the service, nothing acknowledged is lost. Two processes — contiguous numbers,',
    'exactly one decision per raced revision (201 + 409), one closure row each, chain valid. Chromium — requests caught by the kill',
    'answer a problem+json error or a PDF (a retry on a fresh browser), never hang; the next requests get PDFs. Queue — webhook',
    'messages of events committed by a process killed before running any job all arrive after a restart; with two processes running',
    'jobs every message arrives once (by webhook-id). Design file — the process rendering a design-file job is killed (SIGKILL) while',
    'it holds the job; another process takes it once the lease has run out (attempt 2), renders it, and the PDF downloads; one file is kept.',
    '',
  ];
  const section = lines.join('\n');
  const existing = existsSync(file) ? readFileSync(file, 'utf8') : '# Reliability\n\n';
  const start = existing.indexOf(heading);
  let next = existing;
  if (start < 0) next = existing.replace(/\s*$/, '\n\n') + section;
  else {
    const after = existing.indexOf('\n## ', start + heading.length);
    next = existing.slice(0, start) + section + (after < 0 ? '' : existing.slice(after + 1));
  }
  writeFileSync(file, next);
}

async function main(): Promise<void> {
  if (!existsSync(MAIN)) throw new Error(`${MAIN} is missing: run npm run build first`);
  const only = process.argv.slice(2);
  const names = only.length ? only : Object.keys(SCENARIOS);
  const results: Figures[] = [];
  for (const name of names) {
    const run = SCENARIOS[name];
    if (!run) throw new Error(`unknown scenario ${name} (known: ${Object.keys(SCENARIOS).join(', ')})`);
    log(`running ${name}`);
    started = [];
    try {
      const r = await run();
      results.push(r);
      process.stdout.write(JSON.stringify(r) + '\n');
    } catch (err) {
      const r = { scenario: name, pass: false, seconds: 0, error: err instanceof Error ? err.message.slice(0, 500) : String(err) };
      for (const svc of started) log(`service on ${svc.port} (exit ${svc.child.exitCode ?? svc.child.signalCode}), last output:\n${svc.output.slice(-60).join('\n')}`);
      results.push(r);
      process.stdout.write(JSON.stringify(r) + '\n');
    }
  }
  if (!only.length || process.env.FAULTS_WRITE_DOCS === 'true') writeDocs(results);
  const failed = results.filter((r) => !r.pass);
  if (failed.length) {
    log(`FAILED: ${failed.map((r) => r.scenario).join('; ')}`);
    process.exitCode = 1;
  } else log('all fault scenarios passed');
}

main().catch((err) => {
  process.stderr.write(`faults: ${err instanceof Error ? err.stack : String(err)}\n`);
  process.exit(1);
});

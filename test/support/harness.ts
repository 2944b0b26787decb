/**
 * Test harness: the real application on a real database. PostgreSQL tests get a fresh database per test file on
 * the server named by DATABASE_URL (default: the local server's postgres database), copied from the run's migrated
 * template; PGlite tests get an in-memory embedded database started from the run's migrated snapshot; PDFs render
 * in the run's one Chromium (test/support/global-setup.ts). No mocks.
 */
import type { NestFastifyApplication } from '@nestjs/platform-fastify';
import { randomBytes } from 'node:crypto';
import { Client } from 'pg';
import type { DestinationStream } from 'pino';
import { createApp } from '../../apps/api/src/app.factory';
import type { Clock } from '../../apps/api/src/infra/clock';
import { Database } from '../../apps/api/src/infra/database/database.service';
import { chromiumEndpoint, pgliteSnapshot, pgTemplate, serverUrl, withDatabase } from './run-resources';

export type Backend = 'postgres' | 'pglite';
export const BACKENDS: Backend[] = ['postgres', 'pglite'];

async function admin(sql: string): Promise<void> {
  const client = new Client({ connectionString: serverUrl });
  client.on('error', () => undefined);
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

export type Who = 'author' | 'author2' | 'reviewer' | 'reviewer2' | 'admin' | 'anonymous';

export interface CallOptions {
  /** Whose token to send (default: the author) */
  as?: Who;
  headers?: Record<string, string>;
  /** Client address the request comes from (the failed-auth limit counts per address) */
  ip?: string;
  /** Send this page session (its cookie and CSRF token) instead of a bearer token */
  session?: TestSession;
  /**
   * A POST to /decisions without a `signature` is signed with the caller's own password (the harness's test
   * password of `as`), as a reviewer's client would; `sign: false` sends the body as it is.
   */
  sign?: boolean;
}

/** A signed-in page session: the cookie as the browser would send it, and the CSRF token from GET /api/v1/me. */
export interface TestSession {
  cookie: string;
  csrf: string;
}

export interface TestApp {
  app: NestFastifyApplication;
  db: Database;
  backend: Backend;
  /** With { roles: true } on PostgreSQL: the owner and runtime roles and their connection strings, else null */
  roles: { owner: string; runtime: string; ownerUrl: string; runtimeUrl: string } | null;
  /** http://127.0.0.1:<port> when started with { listen: true } (for a browser), else null */
  baseUrl: string | null;
  /**
   * Bearer tokens of the test users, and their ids. The users' tokens are their own (issued from their own signed-in
   * session, so they may decide); the admin's is the bootstrap token.
   */
  tokens: Record<Exclude<Who, 'anonymous'>, string>;
  users: Record<Exclude<Who, 'anonymous'>, string>;
  /** The test users' emails and passwords (set by the users themselves with their activation codes) */
  emails: Record<Exclude<Who, 'anonymous' | 'admin'>, string>;
  passwords: Record<Exclude<Who, 'anonymous' | 'admin'>, string>;
  /** Signs in with email and password (POST /api/v1/sessions) and reads the CSRF token */
  signIn(email: string, password: string, options?: { ip?: string }): Promise<TestSession>;
  call(method: string, url: string, body?: unknown, options?: CallOptions): Promise<{ status: number; body: any; headers: Record<string, unknown>; text: string; raw: Buffer }>;
  close(): Promise<void>;
}

/** Users every test app gets; named by role, as the demo users are. */
const TEST_USERS: { who: Exclude<Who, 'anonymous' | 'admin'>; name: string; roles: string[] }[] = [
  { who: 'author', name: 'Design author (test)', roles: ['author'] },
  { who: 'author2', name: 'Second author (test)', roles: ['author'] },
  { who: 'reviewer', name: 'Checking engineer (test)', roles: ['reviewer'] },
  { who: 'reviewer2', name: 'Second checker (test)', roles: ['reviewer', 'author'] },
];

/** A fresh database copied from the run's template (two copies at once may collide on the template: retried). */
async function createDatabase(name: string): Promise<void> {
  const template = pgTemplate();
  for (let attempt = 0; ; attempt++) {
    try {
      await admin(template ? `CREATE DATABASE ${name} TEMPLATE ${template}` : `CREATE DATABASE ${name}`);
      return;
    } catch (err) {
      // 55006: the template is being copied by another file's CREATE DATABASE at this moment
      if ((err as { code?: string }).code !== '55006' || attempt >= 50) throw err;
      await new Promise((r) => setImmediate(r));
    }
  }
}

export interface StartOptions {
  /** Listen on an ephemeral port on 127.0.0.1 (for a browser) */
  listen?: boolean;
  /** PostgreSQL with an owner role that migrates and a runtime role the service connects as */
  roles?: boolean;
  /** The clock the service decides by (test/support/clock.ts), instead of the system clock */
  clock?: Clock;
  /** Render PDFs in a browser the service launches itself, not in the run's shared one */
  ownBrowser?: boolean;
}

/** Per-user limits high enough that no suite meets them unless it sets its own (test/hardening/user-limits). */
export const UNLIMITED: Record<string, string> = {
  LEADLINE_SEARCHES_PER_USER_PER_MINUTE: '100000',
  LEADLINE_EVALUATIONS_PER_USER_PER_MINUTE: '1000000',
  LEADLINE_SUBMISSIONS_PER_USER_PER_MINUTE: '1000000',
  LEADLINE_PDFS_PER_USER_PER_MINUTE: '100000',
};

export async function startTestApp(
  backend: Backend,
  env: Record<string, string> = {},
  logDestination?: DestinationStream,
  options: StartOptions = {},
): Promise<TestApp> {
  const adminToken = `ll_test_admin_${randomBytes(18).toString('hex')}`;
  const shared = options.ownBrowser ? null : chromiumEndpoint();
  const base: Record<string, string> = {
    LOG_LEVEL: 'silent',
    LEADLINE_DEMO_SEED: 'false',
    LEADLINE_ADMIN_TOKEN: adminToken,
    // Suites make many requests as one user: the per-user limits are tested on their own, with low settings
    ...UNLIMITED,
    // Jobs run when a test drains the queue (QueueService.drain), never in the background of a suite
    LEADLINE_WORKERS: '0',
    ...(shared ? { LEADLINE_CHROMIUM_WS_ENDPOINT: shared } : {}),
    ...env,
  };
  let cleanup = async () => undefined as void;
  let roles: TestApp['roles'] = null;
  if (backend === 'postgres' && options.roles) {
    // least privilege: an owner role that migrates and a runtime role the service connects as (unique, dropped after)
    const suffix = randomBytes(6).toString('hex');
    const name = `leadline_test_${suffix}`;
    const [owner, runtime] = [`leadline_owner_${suffix}`, `leadline_runtime_${suffix}`];
    await admin(`CREATE ROLE ${owner} LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE`);
    await admin(`CREATE ROLE ${runtime} LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE`);
    await admin(`CREATE DATABASE ${name} OWNER ${owner}`);
    const as = (user: string) => {
      const u = new URL(withDatabase(serverUrl, name));
      u.username = user;
      u.password = '';
      return u.toString();
    };
    roles = { owner, runtime, ownerUrl: as(owner), runtimeUrl: as(runtime) };
    base.DATABASE_URL = roles.runtimeUrl;
    base.LEADLINE_MIGRATION_DATABASE_URL = roles.ownerUrl;
    base.LEADLINE_DB_POOL ??= '10';
    cleanup = async () => {
      await admin(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await admin(`DROP ROLE IF EXISTS ${runtime}`);
      await admin(`DROP ROLE IF EXISTS ${owner}`);
    };
  } else if (backend === 'postgres') {
    const name = `leadline_test_${randomBytes(6).toString('hex')}`;
    await createDatabase(name);
    base.DATABASE_URL = withDatabase(serverUrl, name);
    base.LEADLINE_DB_POOL ??= '10';
    cleanup = () => admin(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  } else {
    base.LEADLINE_DATA_DIR = 'memory://';
  }
  let app: NestFastifyApplication;
  try {
    const snapshot = backend === 'pglite' ? pgliteSnapshot() : null;
    ({ app } = await createApp({ env: base, logDestination, runtime: { clock: options.clock, embeddedSnapshot: snapshot ?? undefined } }));
  } catch (err) {
    await cleanup();
    throw err;
  }
  let baseUrl: string | null = null;
  if (options.listen) {
    await app.listen({ port: 0, host: '127.0.0.1' });
    baseUrl = `http://127.0.0.1:${(app.getHttpServer().address() as { port: number }).port}`;
  }
  const fastify = app.getHttpAdapter().getInstance();
  const tokens = { admin: base.LEADLINE_ADMIN_TOKEN } as TestApp['tokens'];
  const users = {} as TestApp['users'];
  const emails = {} as TestApp['emails'];
  const passwords = {} as TestApp['passwords'];
  const t: TestApp = {
    app,
    db: app.get(Database),
    backend,
    roles,
    baseUrl,
    tokens,
    users,
    emails,
    passwords,
    async signIn(email, password, options = {}) {
      const res = await t.call('POST', '/api/v1/sessions', { email, password }, { as: 'anonymous', ip: options.ip });
      if (res.status !== 201) throw new Error(`sign-in of ${email} answered ${res.status}: ${res.text}`);
      const cookie = String(res.headers['set-cookie']).split(';')[0];
      const me = await t.call('GET', '/api/v1/me', undefined, { session: { cookie, csrf: '' } });
      return { cookie, csrf: me.body.csrfToken };
    },
    async call(method, url, body, options = {}) {
      const who = options.as ?? 'author';
      const auth: Record<string, string> = options.session
        ? { cookie: options.session.cookie, 'x-csrf-token': options.session.csrf }
        : who === 'anonymous' ? {} : { authorization: `Bearer ${tokens[who]}` };
      if (method === 'POST' && /\/decisions$/.test(url) && options.sign !== false && body !== null && typeof body === 'object' && !('signature' in body) && who !== 'anonymous' && who !== 'admin') {
        body = { ...(body as object), signature: { method: 'password', password: passwords[who] } };
      }
      const res = await fastify.inject({
        method: method as 'GET',
        url,
        remoteAddress: options.ip ?? '127.0.0.1',
        headers: { ...(body !== undefined && typeof body !== 'string' ? { 'content-type': 'application/json' } : {}), ...auth, ...(options.headers ?? {}) },
        payload: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
      });
      let parsed: unknown = res.body;
      try {
        parsed = JSON.parse(res.body);
      } catch {
        /* not JSON */
      }
      return { status: res.statusCode, body: parsed, headers: res.headers as Record<string, unknown>, text: res.body, raw: res.rawPayload };
    },
    async close() {
      await app.close();
      await cleanup();
    },
  };
  const me = await t.call('GET', '/api/v1/users', undefined, { as: 'admin' });
  users.admin = me.body.items[0].id;
  // Each test user is created by the admin, sets their own password with the activation code, signs in and issues
  // their own token: the path a real user takes (and a token the admin issued could not decide).
  await Promise.all(
    TEST_USERS.map(async (u) => {
      emails[u.who] = `${u.who}@test.example.com`;
      passwords[u.who] = `${u.who} password for tests`;
      const created = await t.call('POST', '/api/v1/users', { name: u.name, email: emails[u.who], roles: u.roles }, { as: 'admin' });
      if (created.status !== 201) throw new Error(`creating ${u.who} answered ${created.status}: ${created.text}`);
      users[u.who] = created.body.id;
      const activated = await t.call('POST', '/api/v1/account/activate', { activationCode: created.body.activationCode, password: passwords[u.who] }, { as: 'anonymous' });
      if (activated.status !== 200) throw new Error(`activating ${u.who} answered ${activated.status}: ${activated.text}`);
      const session = await t.signIn(emails[u.who], passwords[u.who]);
      const own = await t.call('POST', '/api/v1/account/tokens', { label: 'test client' }, { session });
      if (own.status !== 201) throw new Error(`${u.who} issuing their own token answered ${own.status}: ${own.text}`);
      tokens[u.who] = own.body.token;
    }),
  );
  return t;
}

/** Counts rows of the record tables, to prove that a refused request stored nothing. */
export async function countRecords(db: Database): Promise<Record<string, number>> {
  const [row] = await db.query<Record<string, string>>(
    `SELECT (SELECT count(*) FROM products) AS products, (SELECT count(*) FROM calculations) AS calculations,
            (SELECT count(*) FROM revisions) AS revisions, (SELECT count(*) FROM events) AS events`,
  );
  return Object.fromEntries(Object.entries(row).map(([k, v]) => [k, Number(v)]));
}

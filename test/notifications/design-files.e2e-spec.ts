/**
 * Design files rendered by queue workers (real PostgreSQL as the least-privilege runtime role, real Chromium):
 * POST answers 202 with the job's location; the job reports progress and ends with a stored PDF; the same record
 * (chain head hash) is reused, not rendered again; and a job whose instance is killed (SIGKILL, a separate service
 * process on the same database) is taken again by the other instance once the lease runs out.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';
import { clearDesign } from '../support/designs';
import { TestClock } from '../support/clock';
import { startTestApp, UNLIMITED, type TestApp } from '../support/harness';
import { pdfText } from '../support/pdf-text';
import { chromiumEndpoint } from '../support/run-resources';
import { QueueService } from '../../apps/api/src/queue/queue.service';
import { APP_CONFIG, type AppConfig } from '../../apps/api/src/infra/config';

const ROOT = resolve(__dirname, '../..');
let t: TestApp;
let clock: TestClock;
let productId: string;
let revisionId: string;
const children: ChildProcess[] = [];

beforeAll(async () => {
  clock = new TestClock();
  t = await startTestApp('postgres', {}, undefined, { roles: true, clock });
  productId = (await t.call('POST', '/api/v1/products', { code: 'DF-7', name: 'Dunmore DF-7 press (invented)' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Main screw', design: clearDesign });
  revisionId = opened.body.revisionId;
  expect((await t.call('POST', `/api/v1/revisions/${revisionId}/decisions`, { decision: 'approve', comment: 'Checked against the sheet.' }, { as: 'reviewer' })).status).toBe(201);
}, 60_000);
afterAll(async () => {
  for (const c of children) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
  await t?.close();
});

const headHash = async () => (await t.call('GET', `/api/v1/products/${productId}/verify`)).body.headHash as string;

it('answers 202 with the job location; a worker renders the file with progress; the file downloads [POST /api/v1/products/:id/design-files]', async () => {
  const accepted = await t.call('POST', `/api/v1/products/${productId}/design-files`, { paper: 'A4' }, { as: 'reviewer' });
  expect(accepted.status).toBe(202);
  expect(accepted.headers.location).toBe(`/api/v1/jobs/${accepted.body.jobId}`);
  expect(accepted.body).toEqual({ jobId: expect.any(String), state: 'ready', paper: 'A4', status: `/api/v1/jobs/${accepted.body.jobId}` });
  const waiting = await t.call('GET', accepted.body.status, undefined, { as: 'author' });
  expect(waiting.body).toMatchObject({ state: 'ready', kind: 'design-file', progress: null, result: null });

  await t.app.get(QueueService).drain();
  const done = (await t.call('GET', accepted.body.status, undefined, { as: 'author' })).body;
  expect(done).toMatchObject({ state: 'done', attempts: 1, error: null, progress: { stage: 'storing', done: 1, total: 1 } });
  expect(done.result).toMatchObject({ fileName: 'design-file-DF-7.pdf', reused: false, recordHash: await headHash() });
  expect(done.result.href).toBe(`/api/v1/products/${productId}/design-files/${done.result.fileId}`);

  // the product's design-file jobs, newest first: this one done and current (it prints the chain head as it stands)
  const listed = await t.call('GET', `/api/v1/products/${productId}/design-files`, undefined, { as: 'author' });
  expect(listed.status).toBe(200);
  expect(listed.body.items[0]).toMatchObject({ id: accepted.body.jobId, state: 'done', paper: 'A4', status: accepted.body.status, current: true, result: done.result });

  const file = await t.call('GET', done.result.href, undefined, { as: 'author' });
  expect(file.status).toBe(200);
  expect(file.headers['content-type']).toBe('application/pdf');
  expect(file.headers['content-disposition']).toBe('attachment; filename="design-file-DF-7.pdf"');
  expect(file.raw.length).toBe(done.result.bytes);
  const pdf = await pdfText(file.raw);
  expect(pdf.text).toContain('Hash-chain verification: intact');
  expect(pdf.text.replace(/\s/g, '')).toContain(done.result.recordHash);
}, 60_000);

it('reuses the rendering of the same record and renders again once the chain has moved', async () => {
  const queue = t.app.get(QueueService);
  const ask = async () => {
    const accepted = await t.call('POST', `/api/v1/products/${productId}/design-files`, {}, { as: 'author' });
    expect(accepted.status).toBe(202);
    await queue.drain();
    return (await t.call('GET', accepted.headers.location as string, undefined, { as: 'author' })).body;
  };
  const files = async () => Number((await t.db.query<{ n: string }>(`SELECT count(*) AS n FROM queue.rendered_files WHERE subject_id = $1`, [productId]))[0].n);
  const before = await files();
  const first = await ask();
  const again = await ask();
  expect(first.state).toBe('done');
  expect(again).toMatchObject({ state: 'done', result: { fileId: first.result.fileId, reused: true, recordHash: first.result.recordHash } });
  // never rendered: no progress was reported for the reused job, and no second file was stored
  expect(again.progress).toBeNull();
  expect(await files()).toBe(before);

  // a comment is a new link on the product's chain: a new head hash, a new file; the file before no longer current
  expect((await t.call('POST', `/api/v1/revisions/${revisionId}/comments`, { text: 'Filed with the technical file.' }, { as: 'author' })).status).toBe(201);
  const stale = (await t.call('GET', `/api/v1/products/${productId}/design-files`, undefined, { as: 'author' })).body.items[0];
  expect(stale).toMatchObject({ id: again.id, state: 'done', current: false });
  const moved = await ask();
  expect(moved.result.reused).toBe(false);
  expect(moved.result.recordHash).toBe(await headHash());
  expect(moved.result.recordHash).not.toBe(first.result.recordHash);
  expect(await files()).toBe(before + 1);
}, 60_000);

it('refuses a bad paper naming the field, an unknown product, and shows no job that is not a design file', async () => {
  const bad = await t.call('POST', `/api/v1/products/${productId}/design-files`, { paper: 'A0' });
  expect(bad.status).toBe(422);
  expect(JSON.stringify(bad.body)).toContain('paper');
  expect((await t.call('POST', `/api/v1/products/00000000-0000-4000-8000-000000000000/design-files`, {})).status).toBe(404);
  expect((await t.call('GET', `/api/v1/products/00000000-0000-4000-8000-000000000000/design-files`)).status).toBe(404);
  expect((await t.call('GET', `/api/v1/products/not-a-uuid/design-files`)).status).toBe(404); // as every product route answers a malformed id
  expect((await t.call('GET', `/api/v1/products/${productId}/design-files/00000000-0000-4000-8000-000000000000`)).status).toBe(404);
  const [event] = await t.db.query<{ id: string }>(`SELECT id FROM queue.jobs WHERE kind = 'event' LIMIT 1`);
  expect((await t.call('GET', `/api/v1/jobs/${event.id}`)).status).toBe(404);
});

it('a design-file job survives the death (SIGKILL) of the instance that took it: the other instance takes it again', async () => {
  // A second instance of the service as its own process on the same database and role, with one worker
  const child = spawn(process.execPath, ['-r', './test/support/register-ts.js', 'apps/api/src/main.ts'], {
    cwd: ROOT,
    env: {
      PATH: process.env.PATH, HOME: process.env.HOME, PORT: '0', HOST: '127.0.0.1', LOG_LEVEL: 'info', LEADLINE_DEMO_SEED: 'false', ...UNLIMITED,
      DATABASE_URL: t.roles!.runtimeUrl, LEADLINE_MIGRATION_DATABASE_URL: t.roles!.ownerUrl, LEADLINE_WORKERS: '1', LEADLINE_QUEUE_POLL_MS: '200',
      ...(chromiumEndpoint() ? { LEADLINE_CHROMIUM_WS_ENDPOINT: chromiumEndpoint()! } : {}),
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  let out = '';
  const waiters: { text: string; done: () => void }[] = [];
  child.stdout!.on('data', (d) => {
    out += d;
    for (const w of waiters.filter((w) => out.includes(w.text))) w.done();
  });
  child.stderr!.on('data', (d) => (out += d));
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  const printed = (text: string) => new Promise<void>((done, fail) => {
    if (out.includes(text)) return done();
    waiters.push({ text, done });
    void exited.then(() => fail(new Error(`the second instance exited before printing "${text}":\n${out}`)));
  });
  await printed('Leadline is listening');
  // Move the comment and decision jobs out of the way: the second instance only has the design file to take
  await t.app.get(QueueService).drain();
  expect((await t.call('POST', `/api/v1/revisions/${revisionId}/comments`, { text: 'Audit copy requested.' }, { as: 'reviewer' })).status).toBe(201);
  const accepted = await t.call('POST', `/api/v1/products/${productId}/design-files`, { paper: 'Letter' }, { as: 'reviewer' });
  expect(accepted.status).toBe(202);
  const jobId = accepted.body.jobId as string;
  // The second instance is woken by the NOTIFY at commit, takes the job and says so; it dies at once
  await printed(`design-file job ${jobId} taken (attempt 1)`);
  child.kill('SIGKILL');
  await exited;
  const [row] = await t.db.query<{ state: string; locked_by: string; attempts: number }>(`SELECT state, locked_by, attempts FROM queue.jobs WHERE id = $1`, [jobId]);
  expect(row).toMatchObject({ state: 'running', attempts: 1, locked_by: expect.stringMatching(new RegExp(`:${child.pid}:`)) });

  // Until the lease runs out, the job stays with the dead instance
  const queue = t.app.get(QueueService);
  await queue.drain();
  expect((await t.call('GET', `/api/v1/jobs/${jobId}`)).body).toMatchObject({ state: 'running', result: null });
  clock.advance((t.app.get<AppConfig>(APP_CONFIG).LEADLINE_QUEUE_LEASE_SECONDS + 5) * 1000);
  await queue.drain();
  const done = (await t.call('GET', `/api/v1/jobs/${jobId}`)).body;
  expect(done).toMatchObject({ state: 'done', attempts: 2, result: { reused: false, recordHash: await headHash(), fileName: 'design-file-DF-7.pdf' } });
  const file = await t.call('GET', done.result.href);
  expect(file.status).toBe(200);
  expect((await pdfText(file.raw)).text).toContain('Hash-chain verification: intact');
  const [kept] = await t.db.query<{ paper: string; job_id: string }>(`SELECT paper, job_id FROM queue.rendered_files WHERE id = $1`, [done.result.fileId]);
  expect(kept).toEqual({ paper: 'Letter', job_id: jobId });
}, 180_000);

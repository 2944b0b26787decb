/**
 * End to end: the built service (dist/, as `npm start` runs it) on a real port, driven over HTTP.
 * Runs on the embedded database, seeds the demo, and checks the shared contract examples through the network.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ENGINE_1_2_CHANGES } from '../support/contract-changes';
import { clearDesign } from '../support/designs';

const root = join(__dirname, '../..');
const main = join(root, 'dist/apps/api/src/main.js');
let base = '';
let child: ChildProcess;
let dataDir: string;
let output = '';
let token = '';
const authed = (init: RequestInit = {}) => ({ ...init, headers: { ...(init.headers ?? {}), authorization: `Bearer ${token}` } });

beforeAll(async () => {
  // `npm test` builds dist/ before the suite; a file run on its own builds it here when it is missing
  if (!existsSync(main)) {
    const built = spawnSync('npm', ['run', '-s', 'build'], { cwd: root, encoding: 'utf8' });
    if (built.status !== 0) throw new Error(built.stdout + built.stderr);
  }
  dataDir = mkdtempSync(join(tmpdir(), 'leadline-e2e-'));
  child = spawn(process.execPath, [main], {
    cwd: root,
    env: { PATH: process.env.PATH, PORT: '0', LEADLINE_DATA_DIR: dataDir, LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  // the start-up banner (address, demo tokens) is one write: wait for it, or for the process to end
  await new Promise<void>((resolve, reject) => {
    const seen = (d: Buffer) => {
      output += d;
      if (/export LEADLINE_TOKEN=\S+/.test(output)) resolve();
    };
    child.stdout!.on('data', seen);
    child.stderr!.on('data', (d) => (output += d));
    child.once('exit', (code) => reject(new Error(`the service exited (${code}) before it was listening:\n${output}`)));
  });
  base = /Leadline is listening on (http:\/\/127\.0\.0\.1:\d+)/.exec(output)![1];
  token = /export LEADLINE_TOKEN=(\S+)/.exec(output)![1];
}, 90000);

afterAll(async () => {
  if (child && child.exitCode === null) {
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    await exited;
  }
  if (dataDir) rmSync(dataDir, { recursive: true, force: true });
});

it('starts on the embedded database, seeds the demo and prints how to call it', async () => {
  expect(output).toContain(`Leadline is listening on ${base}`);
  expect(output).toContain('Demo data seeded');
  expect(output).toMatch(/Checking engineer \(demo\)\s+reviewer\s+ll_/);
  expect((await fetch(`${base}/api/v1/products`)).status).toBe(401);
  const products = await (await fetch(`${base}/api/v1/products`, authed())).json();
  expect(products.items.map((p: { code: string }) => p.code)).toEqual(['CV-400', 'CV-P60']);
  const product = await (await fetch(`${base}/api/v1/products/${products.items[0].id}`, authed())).json();
  expect(product.calculations).toHaveLength(3);
  const verify = await (await fetch(`${base}/api/v1/products/${products.items[0].id}/verify`, authed())).json();
  const queue = await (await fetch(`${base}/api/v1/reviews/queue`, authed())).json();
  expect(queue.items.map((i: { title: string }) => i.title).sort()).toEqual(['Platform tilt screw', 'Press screw']);
  expect(verify).toMatchObject({ valid: true });
});

it('serves the OpenAPI page', async () => {
  const page = await fetch(`${base}/api/docs`);
  expect(page.status).toBe(200);
  expect(await page.text()).toContain('swagger');
});

it('passes the shared contract examples over HTTP but for the fields engine 1.2 changes on purpose (shared/contract/check-examples.py)', () => {
  const script = join(root, '../shared/contract/check-examples.py');
  const r = spawnSync('python3', [script, base], { encoding: 'utf8', env: { ...process.env, LEADLINE_TOKEN: token } });
  // Each difference the checker prints must be a documented engine 1.2 change, at its engine 1.2 value (0.5 %, as the checker)
  const differences = [...r.stdout.matchAll(/^(\S+): (\S+) = (.+), expected .+$/gm)].map(([, name, path, got]) => ({ name, path, got }));
  const documented = Object.entries(ENGINE_1_2_CHANGES).flatMap(([name, fields]) => Object.entries(fields).map(([path, value]) => ({ name, path, value })));
  expect(differences.map((d) => `${d.name} ${d.path}`).sort()).toEqual(documented.map((d) => `${d.name} ${d.path}`).sort());
  for (const d of differences) {
    const want = documented.find((x) => x.name === d.name && x.path === d.path)?.value;
    if (typeof want === 'number') expect([d.path, Math.abs(Number(d.got) - want) <= 0.005 * Math.abs(want)]).toEqual([d.path, true]);
    else expect([d.path, d.got]).toEqual([d.path, `'${want}'`]);
  }
  expect(r.stdout).toMatch(new RegExp(`contract examples: \\d+ passed, ${documented.length} failed`));
});

it('evaluates the README example fixture', async () => {
  const body = readFileSync(join(root, 'test/fixtures/ok/trapezoidal-jack.json'), 'utf8');
  const res = await fetch(`${base}/api/v1/evaluations`, authed({ method: 'POST', headers: { 'content-type': 'application/json' }, body }));
  expect(res.status).toBe(200);
  const ev = await res.json();
  expect(ev.geometry.minorDiameter).toBeCloseTo(0.032, 9); // Tr 40x7: d3 = 32.000 mm (ISO 2904 §1.2)
  expect(ev.findings.every((f: { basis: string }) => f.basis.length > 0)).toBe(true);
});

it('serves the PDF report of a seeded revision over the network', async () => {
  const products = await (await fetch(`${base}/api/v1/products`, authed())).json();
  const product = await (await fetch(`${base}/api/v1/products/${products.items[0].id}`, authed())).json();
  const revisions = await (await fetch(`${base}/api/v1/calculations/${product.calculations[0].id}/revisions`, authed())).json();
  const pdf = await fetch(`${base}/api/v1/revisions/${revisions.items[0].id}/report.pdf`, authed());
  expect(pdf.status).toBe(200);
  expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString()).toBe('%PDF-');
});

// Last in the file: it registers a product and approves a revision on the seeded database.
it("runs the README's short API tour as written: the blocked jack evaluates as blocked, the clear one is submitted and approved", async () => {
  const clearFixture = JSON.parse(readFileSync(join(root, 'test/fixtures/ok/trapezoidal-jack-clear.json'), 'utf8'));
  expect(clearFixture).toEqual(clearDesign); // the fixture is the clear jack the other tests use (test/support/designs.ts)
  const readme = readFileSync(join(root, 'README.md'), 'utf8');
  const block = /```sh\n([\s\S]*?)\n```/.exec(readme.slice(readme.indexOf('## A short API tour')))![1];
  const reviewerPassword = /Checking engineer \(demo\)\s+reviewer\s+checker@demo\.example\.com\s+(\S+)/.exec(output)![1];
  const script = block
    .replace(/^export LEADLINE_TOKEN=.*$/m, `export LEADLINE_TOKEN=${token}`)
    .replace(/^export REVIEWER_PASSWORD=.*$/m, `export REVIEWER_PASSWORD=${reviewerPassword}`)
    .replaceAll('http://127.0.0.1:3000', base);
  expect(script).toContain(`API=${base}/api/v1`);
  // run from a scratch folder that sees the repository's test/ (the tour names fixtures by relative path and writes reports)
  const dir = mkdtempSync(join(tmpdir(), 'leadline-tour-'));
  try {
    symlinkSync(join(root, 'test'), join(dir, 'test'));
    const r = spawnSync('bash', ['--norc', '--noprofile', '-c', `set -euo pipefail\n${script}\necho\necho "TOUR_REV=$REV"`], { cwd: dir, encoding: 'utf8', env: { PATH: process.env.PATH }, stdio: ['ignore', 'pipe', 'pipe'] });
    expect({ status: r.status, stderr: r.stderr }).toEqual({ status: 0, stderr: '' });
    // the first two answers are the evaluations: the README jack is blocked, the clear jack is clear
    const verdicts = [...r.stdout.matchAll(/"verdict":"([a-z-]+)"/g)].map((m) => m[1]);
    expect(verdicts.slice(0, 2)).toEqual(['blocked', 'clear']);
    const rev = /TOUR_REV=(\S+)/.exec(r.stdout)![1];
    const revision = await (await fetch(`${base}/api/v1/revisions/${rev}`, authed())).json();
    expect(revision.verdict).toBe('clear');
    expect(revision.review.state).toBe('approved');
    expect(revision.review.signature).toMatchObject({ printedName: 'Checking engineer (demo)', meaning: 'approved as checking engineer', method: 'password' });
    expect(revision.input).toEqual(clearFixture);
    expect(readFileSync(join(dir, 'report.pdf')).subarray(0, 5).toString()).toBe('%PDF-');
    expect(readFileSync(join(dir, 'report.html'), 'utf8')).toContain('Safety caution');
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});

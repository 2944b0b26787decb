/**
 * Where a route's time goes: the service in-process with the baseline routes, a CPU profile of the server (inspector,
 * 100 µs sampling) during autocannon load on POST /api/v1/evaluations and then on its authenticated I/O floor, and
 * the self time per request of each group of code (subject minus floor). The inspector samples the main thread only,
 * so the route assesses in the request's thread here (LEADLINE_EVALUATION_THREADS=0 unless set): the profile shows the
 * assessment's own cost, which the service normally runs on its worker threads. Not part of `npm run bench`; run after
 * `npm run build`:  node dist/bench/profile-route.js   (BENCH_SECONDS, default 8; DATABASE_URL as bench/run.ts).
 */
import 'reflect-metadata';
import { execFile } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { Session } from 'node:inspector/promises';
import { join } from 'node:path';
import { setFixedResponse } from './baseline.module';
import { startBenchApp, withScratchDatabase } from './scratch';

const root = join(__dirname, '../..');
const design = readFileSync(join(root, 'test/fixtures/ok/trapezoidal-jack.json'), 'utf8');
const seconds = Number(process.env.BENCH_SECONDS ?? 8);

interface ProfileNode { id: number; callFrame: { functionName: string; url: string }; hitCount?: number; children?: number[] }
interface Profile { nodes: ProfileNode[]; samples: number[]; timeDeltas: number[] }

/** The group a sampled function belongs to: our libraries by folder, dependencies by package, the rest by kind. */
function groupOf(frame: ProfileNode['callFrame']): string {
  const url = frame.url;
  if (!url) return frame.functionName ? `(${frame.functionName})` : '(native)';
  const dep = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(url);
  if (dep) return dep[1];
  const own = /dist\/(libs\/[^/]+|apps\/api\/src\/[^/]+)/.exec(url);
  if (own) return own[1];
  if (url.startsWith('node:')) return 'node core';
  return url;
}

/** Self time in µs per group, from the samples (each sample's delta is charged to the node it landed in). */
function selfTimes(p: Profile): Map<string, number> {
  const byId = new Map(p.nodes.map((n) => [n.id, n]));
  const out = new Map<string, number>();
  for (let i = 0; i < p.samples.length; i++) {
    const node = byId.get(p.samples[i]);
    if (!node) continue;
    const g = groupOf(node.callFrame);
    out.set(g, (out.get(g) ?? 0) + (p.timeDeltas[i] ?? 0));
  }
  return out;
}

function load(url: string, token: string): Promise<{ rps: number; total: number }> {
  const options = JSON.stringify({ urls: [url], method: 'POST', body: design, headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` }, connections: 50, seconds });
  return new Promise((resolve, reject) => {
    execFile(process.execPath, [join(__dirname, 'load.js'), options], { maxBuffer: 1 << 20 }, (err, stdout) => (err ? reject(err) : resolve(JSON.parse(stdout.trim().split('\n').pop() as string))));
  });
}

async function main() {
  await withScratchDatabase('profile', async (url) => {
    const { app, base, token } = await startBenchApp({ DATABASE_URL: url, LEADLINE_EVALUATION_THREADS: process.env.LEADLINE_EVALUATION_THREADS ?? '0' });
    const answer = await (await fetch(`${base}/api/v1/evaluations`, { method: 'POST', headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` }, body: design })).text();
    setFixedResponse(answer);

    const session = new Session();
    session.connect();
    await session.post('Profiler.enable');
    await session.post('Profiler.setSamplingInterval', { interval: 100 });
    const profiled = async (path: string) => {
      await load(`${base}${path}`, token); // warm-up, not profiled
      await session.post('Profiler.start');
      const run = await load(`${base}${path}`, token);
      const { profile } = (await session.post('Profiler.stop')) as unknown as { profile: Profile };
      return { run, self: selfTimes(profile) };
    };
    const floor = await profiled('/bench/io-floor-auth');
    const subject = await profiled('/api/v1/evaluations');
    const groups = new Set([...floor.self.keys(), ...subject.self.keys()]);
    const rows = [...groups].map((g) => {
      const s = (subject.self.get(g) ?? 0) / subject.run.total;
      const f = (floor.self.get(g) ?? 0) / floor.run.total;
      return { group: g, subjectUs: +s.toFixed(1), floorUs: +f.toFixed(1), extraUs: +(s - f).toFixed(1) };
    }).sort((a, b) => b.extraUs - a.extraUs);
    console.log(JSON.stringify({ floorRps: Math.round(floor.run.rps), subjectRps: Math.round(subject.run.rps), ratio: +(subject.run.rps / floor.run.rps).toFixed(3) }));
    for (const r of rows.filter((x) => Math.abs(x.extraUs) >= 1 || x.subjectUs >= 5)) console.log(JSON.stringify(r));
    session.disconnect();
    await app.close();
  });
}

main().then(() => process.exit(0), (err) => {
  console.error(err);
  process.exit(1);
});

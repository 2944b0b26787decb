/**
 * The machine's hello-world rate: a bare node:http server answering {"hello":"world"}, loaded by the same separate
 * load process as `npm run bench` (bench/load.ts, 50 connections) for BENCH_SECONDS (5) seconds, BENCH_ROUNDS (3) times.
 * It is the yardstick printed beside wall-clock figures (the test suite's duration in docs/performance.md), so a run on
 * a slower or busier machine can be told from a slower suite. `node dist/bench/hello-world.js` after `npm run build`.
 */
import { execFile } from 'node:child_process';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';

const seconds = Number(process.env.BENCH_SECONDS ?? 5);
const rounds = Number(process.env.BENCH_ROUNDS ?? 3);

function loadOnce(url: string): Promise<{ rps: number; p50: number; p99: number; errors: number }> {
  const options = JSON.stringify({ urls: [url], method: 'GET', headers: {}, connections: 50, seconds });
  return new Promise((resolve, reject) => {
    execFile(process.execPath, [join(__dirname, 'load.js'), options], { maxBuffer: 1 << 20 }, (err, stdout) =>
      err ? reject(err) : resolve(JSON.parse(stdout.trim().split('\n').pop() as string)),
    );
  });
}

async function main() {
  const body = JSON.stringify({ hello: 'world' });
  const server = createServer((_req, res) => {
    res.writeHead(200, { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) });
    res.end(body);
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/`;
  const runs = [];
  for (let i = 0; i < rounds; i++) runs.push(await loadOnce(url));
  server.close();
  const rps = runs.map((r) => Math.round(r.rps));
  console.log(JSON.stringify({ name: 'hello-world (bare node:http, 50 connections)', rps: Math.round(rps.reduce((a, x) => a + x, 0) / rps.length), rounds: rps, load1: (await import('node:os')).loadavg()[0] }));
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});

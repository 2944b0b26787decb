/**
 * Probes GET /health one request after another for a number of seconds, in its own process (it never shares the
 * server's event loop), and prints one JSON line: requests, p50, p99 and max latency [ms].
 * Input (argv[2], JSON): { url, seconds }.
 */
async function main() {
  const o = JSON.parse(process.argv[2]) as { url: string; seconds: number };
  const times: number[] = [];
  const end = Date.now() + o.seconds * 1000;
  while (Date.now() < end) {
    const t0 = process.hrtime.bigint();
    const res = await fetch(o.url);
    await res.arrayBuffer();
    if (res.status !== 200) throw new Error(`/health answered ${res.status}`);
    times.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
  times.sort((a, b) => a - b);
  const at = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))];
  const r = (x: number) => Math.round(x * 10) / 10;
  process.stdout.write(JSON.stringify({ requests: times.length, p50Ms: r(at(0.5)), p99Ms: r(at(0.99)), maxMs: r(times[times.length - 1]) }) + '\n');
}

main().catch((err) => {
  process.stderr.write(String(err));
  process.exit(1);
});

/**
 * The load generator, run as its own process so it never shares the server's event loop.
 * Input (argv[2], JSON): { urls, method, body?, headers, connections, seconds }. Output: one JSON line.
 * "{{n}}" in the body becomes a running number, so that each submission is a changed design (an unchanged one is 409).
 */
import autocannon from 'autocannon';

async function main() {
  const o = JSON.parse(process.argv[2]) as { urls: string[]; method: 'GET' | 'POST'; body?: string; headers: Record<string, string>; connections: number; seconds: number };
  let i = 0;
  let n = 0;
  const numbered = o.body !== undefined && o.body.includes('{{n}}');
  const paths = o.urls.map((u) => {
    const url = new URL(u);
    return url.pathname + url.search;
  });
  const r = await autocannon({
    url: new URL(o.urls[0]).origin,
    connections: o.connections,
    duration: o.seconds,
    requests: [{ method: o.method, body: o.body, headers: o.headers, setupRequest: (req) => ({ ...req, path: paths[i++ % paths.length], ...(numbered ? { body: o.body!.split('{{n}}').join(String(++n)) } : {}) }) }],
  });
  process.stdout.write(JSON.stringify({ rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, errors: r.errors + r.non2xx, total: r.requests.total }) + '\n');
}

main().catch((err) => {
  process.stderr.write(String(err));
  process.exit(1);
});

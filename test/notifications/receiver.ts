/** A webhook receiver on loopback for tests: answers each POST with the next scripted status and keeps what came. */
import { createServer, type IncomingHttpHeaders, type Server } from 'node:http';

export interface Received {
  headers: IncomingHttpHeaders;
  body: string;
}

export interface Receiver {
  url: string;
  received: Received[];
  /** Statuses (and optional headers) to answer with, in order; 200 once the list is used up */
  script: { status: number; headers?: Record<string, string> }[];
  close(): Promise<void>;
}

export async function startReceiver(): Promise<Receiver> {
  const received: Received[] = [];
  const script: Receiver['script'] = [];
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      received.push({ headers: req.headers, body: Buffer.concat(chunks).toString('utf8') });
      const next = script.shift() ?? { status: 200 };
      res.writeHead(next.status, next.headers ?? {});
      res.end();
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as { port: number };
  return {
    url: `http://127.0.0.1:${port}/hooks`,
    received,
    script,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

/**
 * A request must arrive whole within LEADLINE_REQUEST_TIMEOUT_MS: a body dribbled a byte at a time (here: one byte,
 * then nothing, as a client sending a byte a minute would) is answered 408 and its connection closed, without any
 * token. The test sets a short time-out and waits for the socket's own close event, not for a fixed time.
 */
import { connect, type Socket } from 'node:net';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp('postgres', { LEADLINE_REQUEST_TIMEOUT_MS: '400', LEADLINE_HEADERS_TIMEOUT_MS: '400' }, undefined, { listen: true });
});
afterAll(() => t?.close());

/** Opens a raw connection, writes `text`, and resolves with everything the server sent once it closes the socket. */
function openAndWait(text: string): Promise<{ received: string; closed: boolean }> {
  const { port } = new URL(t.baseUrl!);
  return new Promise((resolve, reject) => {
    const socket: Socket = connect(Number(port), '127.0.0.1', () => socket.write(text));
    let received = '';
    socket.setEncoding('utf8');
    socket.on('data', (d) => (received += d));
    socket.on('error', reject);
    socket.on('close', () => resolve({ received, closed: true }));
  });
}

it('closes a connection whose body stops arriving, with 408, unauthenticated [POST /api/v1/products]', async () => {
  const head = 'POST /api/v1/products HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\nContent-Length: 100\r\n\r\n';
  const { received, closed } = await openAndWait(head + '{');
  expect(closed).toBe(true);
  expect(received).toMatch(/^HTTP\/1\.1 408 /);
});

it('closes a connection whose headers never end, with 408', async () => {
  const { received, closed } = await openAndWait('GET /health HTTP/1.1\r\nHost: 127.0.0.1\r\nX-Slow: a');
  expect(closed).toBe(true);
  expect(received).toMatch(/^HTTP\/1\.1 408 /);
});

it('still answers a request that arrives whole in time', async () => {
  const res = await fetch(`${t.baseUrl}/health`);
  expect(res.status).toBe(200);
});

/** Closes the run's Chromium and drops its template database (test/support/global-setup.ts). */
import { rmSync } from 'node:fs';
import { Client } from 'pg';
import type { Browser } from 'puppeteer-core';
import { serverUrl } from './run-resources';

export default async function globalTeardown(): Promise<void> {
  const run = (globalThis as { __leadlineRun?: { browser: Browser; template: string; dir: string } }).__leadlineRun;
  if (!run) return;
  await run.browser.close().catch(() => run.browser.process()?.kill('SIGKILL'));
  const client = new Client({ connectionString: serverUrl });
  client.on('error', () => undefined);
  await client.connect();
  try {
    await client.query(`ALTER DATABASE ${run.template} IS_TEMPLATE false`);
    await client.query(`DROP DATABASE IF EXISTS ${run.template} WITH (FORCE)`);
  } finally {
    await client.end();
  }
  rmSync(run.dir, { recursive: true, force: true });
}

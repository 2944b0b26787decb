/**
 * Design workbench benchmark: in headless Chromium, the time from an input change in the design form (the
 * axial load) to the results panel showing the evaluation of that input, p50 and p95 over 50 edits. The time
 * includes the form's 150 ms debounce (what the engineer waits), so the figure minus 150 ms is the cost of
 * POST /api/v1/evaluations and the panel's rendering. Embedded database (PGlite, in memory); nothing stored
 * while editing.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import puppeteer from 'puppeteer-core';
import { createApp } from '../apps/api/src/app.factory';
import { CHROMIUM_FLAGS } from '../apps/api/src/infra/pdf/browser-pool';
import { BENCH_UNLIMITED } from './limits';

const EDITS = 50;
const DEBOUNCE_MS = 150;

const percentile = (xs: readonly number[], p: number): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)];
};

export async function benchWorkbench(): Promise<Record<string, unknown>> {
  const admin = `ll_bench_admin_${process.pid}_${'w'.repeat(16)}`;
  const { app } = await createApp({ env: { LOG_LEVEL: 'warn', LEADLINE_DEMO_SEED: 'false', LEADLINE_DATA_DIR: 'memory://', LEADLINE_ADMIN_TOKEN: admin, ...BENCH_UNLIMITED } });
  await app.listen({ port: 0, host: '127.0.0.1' });
  const base = `http://127.0.0.1:${(app.getHttpServer().address() as { port: number }).port}`;
  const asAdmin = { authorization: `Bearer ${admin}`, 'content-type': 'application/json' };
  // An author with a password: the page signs in as people do (a session cookie; pages keep no credential in script storage)
  const email = 'author@bench.invalid';
  const password = `bench-${process.pid}-correct-horse-battery`;
  const user = await (await fetch(`${base}/api/v1/users`, { method: 'POST', headers: asAdmin, body: JSON.stringify({ name: 'Benchmark author', email, roles: ['author'] }) })).json();
  const activated = await fetch(`${base}/api/v1/account/activate`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ activationCode: user.activationCode, password }) });
  if (activated.status !== 200) throw new Error(`activating the benchmark author answered ${activated.status}`);
  const token = (await (await fetch(`${base}/api/v1/users/${user.id}/tokens`, { method: 'POST', headers: asAdmin, body: '{}' })).json()).token as string;
  const asAuthor = { authorization: `Bearer ${token}`, 'content-type': 'application/json' };
  const product = await (await fetch(`${base}/api/v1/products`, { method: 'POST', headers: asAuthor, body: JSON.stringify({ code: 'BENCH-W', name: 'workbench benchmark' }) })).json();
  const design = JSON.parse(readFileSync(join(__dirname, '../../test/fixtures/ok/trapezoidal-jack.json'), 'utf8'));
  const calc = await (await fetch(`${base}/api/v1/products/${product.id}/calculations`, { method: 'POST', headers: asAuthor, body: JSON.stringify({ title: 'bench', design }) })).json();
  const browser = await puppeteer.launch({ executablePath: '/usr/bin/chromium', args: [...CHROMIUM_FLAGS], headless: true });
  try {
    const page = await browser.newPage();
    await page.setViewport({ width: 1280, height: 900 });
    await page.goto(`${base}/sign-in`);
    await page.waitForSelector('#sign-in-form');
    const signedIn = await page.evaluate(async (who) => (await fetch('/api/v1/sessions', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(who) })).status, { email, password });
    if (signedIn !== 201) throw new Error(`signing in the benchmark author answered ${signedIn}`);
    // the next revision's form, prefilled from revision 1 (the fixture design)
    await page.goto(`${base}/design/calculations/${calc.calculationId}/revise`);
    await page.waitForFunction(() => document.getElementById('results-status')?.dataset.current === 'true');
    const times: number[] = [];
    for (let i = 0; i < EDITS; i++) {
      const load = `${(16 + (i % 9) * 0.5).toFixed(1)} kN`;
      const ms = await page.evaluate(
        (value) =>
          new Promise<number>((resolve) => {
            const status = document.getElementById('results-status')!;
            const before = Number(status.dataset.evaluation);
            const input = document.getElementById('f-load') as HTMLInputElement;
            const t0 = performance.now();
            const observer = new MutationObserver(() => {
              if (Number(status.dataset.evaluation) > before && status.dataset.current === 'true') {
                observer.disconnect();
                resolve(performance.now() - t0);
              }
            });
            observer.observe(status, { attributes: true });
            input.value = value;
            input.dispatchEvent(new Event('input', { bubbles: true }));
          }),
        load,
      );
      times.push(ms);
    }
    const p50 = percentile(times, 50);
    const p95 = percentile(times, 95);
    const result = {
      name: 'workbench: input change to results panel updated (Chromium, 50 edits, includes the 150 ms debounce)',
      edits: EDITS,
      p50ms: +p50.toFixed(1),
      p95ms: +p95.toFixed(1),
      p50AfterDebounceMs: +(p50 - DEBOUNCE_MS).toFixed(1),
      p95AfterDebounceMs: +(p95 - DEBOUNCE_MS).toFixed(1),
    };
    console.log(JSON.stringify(result));
    return result;
  } finally {
    await browser.close();
    await app.close();
  }
}

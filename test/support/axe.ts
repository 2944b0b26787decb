/**
 * axe-core accessibility check of the page open in a puppeteer tab. axe's source is evaluated through the
 * DevTools protocol (as @axe-core/puppeteer does), so the page's strict CSP needs no exception; that wrapper
 * itself is not used because it declares the full puppeteer (with its browser download) as a peer dependency.
 */
import { source } from 'axe-core';
import type { Page } from 'puppeteer-core';

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: string[];
}

/** Violations of impact serious or critical on the current page (WCAG 2.x A and AA rules and best practice). */
export async function seriousViolations(page: Page): Promise<AxeViolation[]> {
  const loaded = await page.evaluate(() => typeof (window as unknown as { axe?: unknown }).axe === 'object');
  if (!loaded) await page.evaluate(source);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run(ctx: unknown, opts: unknown): Promise<{ violations: { id: string; impact: string | null; help: string; nodes: { target: unknown[] }[] }[] }> } }).axe;
    const r = await axe.run(document, { resultTypes: ['violations'] });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => JSON.stringify(n.target)) }));
  });
  return violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

/** What axe could not decide on the current page ("needs review"): rule id, impact and the nodes, for a test to explain. */
export async function needsReview(page: Page): Promise<AxeViolation[]> {
  const loaded = await page.evaluate(() => typeof (window as unknown as { axe?: unknown }).axe === 'object');
  if (!loaded) await page.evaluate(source);
  return page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run(ctx: unknown, opts: unknown): Promise<{ incomplete: { id: string; impact: string | null; help: string; nodes: { target: unknown[] }[] }[] }> } }).axe;
    const r = await axe.run(document, { resultTypes: ['incomplete'] });
    return r.incomplete.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => JSON.stringify(n.target)) }));
  });
}

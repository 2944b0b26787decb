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

/**
 * The WCAG 2.x contrast ratio of each node axe left for review under color-contrast: its ink (fill for SVG text, color
 * otherwise) against the first opaque background behind it (the page's white when there is none), by the WCAG 2.x
 * relative-luminance formula. axe leaves a node when it cannot settle the background by itself (SVG text, text over
 * or beside other boxes, sub- and superscripts).
 */
export async function measuredContrast(page: Page, nodes: string[]): Promise<{ selector: string; ratio: number }[]> {
  return page.evaluate((targets: string[]) => {
    const rgb = (text: string) => (text.match(/[\d.]+/g) ?? []).map(Number);
    const luminance = (text: string) => {
      const [r, g, b] = rgb(text).slice(0, 3).map((c) => c / 255).map((c) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
      return 0.2126 * r + 0.7152 * g + 0.0722 * b;
    };
    return targets.map((t) => {
      const selector = (JSON.parse(t) as string[]).join(' ');
      const node = document.querySelector(selector);
      if (!node) return { selector, ratio: 0 };
      const ink = node.closest('svg') ? getComputedStyle(node).fill : getComputedStyle(node).color;
      let background = 'rgb(255, 255, 255)';
      for (let e: Element | null = node; e; e = e.parentElement) {
        const c = getComputedStyle(e).backgroundColor;
        const parts = rgb(c);
        if (parts.length >= 3 && (parts.length < 4 || parts[3] > 0)) {
          background = c;
          break;
        }
      }
      const [a, b] = [luminance(ink), luminance(background)].sort((x, y) => y - x);
      return { selector, ratio: (a + 0.05) / (b + 0.05) };
    });
  }, nodes);
}

/**
 * axe's "needs review" items on the page that are not explained: every color-contrast node measured below 4.5:1
 * (measuredContrast), and every item of another rule whose id `explained` does not give a reason for.
 */
export async function unexplainedReview(page: Page, explained: Readonly<Record<string, string>> = {}): Promise<unknown[]> {
  const review = await needsReview(page);
  const out: unknown[] = review.filter((item) => item.id !== 'color-contrast' && !explained[item.id]);
  const contrast = review.find((item) => item.id === 'color-contrast');
  if (contrast) out.push(...(await measuredContrast(page, contrast.nodes)).filter((m) => !(m.ratio >= 4.5)).map((m) => ({ id: 'color-contrast', ...m })));
  return out;
}

/**
 * What every page test asks of a page as it stands: no serious or critical axe-core violation, nothing wider than
 * the window, and (ARTIFACTS=1) a screenshot. The default run scans at the page's own width (1280 px) and checks
 * the fit at every width; the full run (`npm run test:full`) scans at every width too.
 */
import type { Page } from 'puppeteer-core';
import { screenshot } from './artifacts';
import { seriousViolations } from './axe';
import { FULL_RUN } from './property';

/** Window widths every page must fit [px]: desktop and tablet. */
export const PAGE_WIDTHS: readonly number[] = [1280, 768];
const HEIGHT: Record<number, number> = { 1280: 900, 768: 1000 };

/** scrollWidth <= clientWidth: the page has no sideways scrolling. */
export const fitsWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth <= document.documentElement.clientWidth);

/**
 * Checks the page at each width and returns to the first. `name` labels failures and screenshots
 * (artifacts/<name>-<width>.png).
 */
export async function checkPage(page: Page, name: string, widths: readonly number[] = PAGE_WIDTHS): Promise<void> {
  const start = page.viewport() ?? { width: widths[0], height: HEIGHT[widths[0]] ?? 900 };
  for (const [i, width] of widths.entries()) {
    if (i > 0 || start.width !== width) await page.setViewport({ width, height: HEIGHT[width] ?? 900 });
    if (i === 0 || FULL_RUN) expect({ name, width, violations: await seriousViolations(page) }).toEqual({ name, width, violations: [] });
    expect({ name, width, fits: await fitsWidth(page) }).toEqual({ name, width, fits: true });
    await screenshot(page, `${name}-${width}`);
  }
  if (page.viewport()?.width !== start.width) await page.setViewport(start);
}

/**
 * What every page test asks of a page as it stands: no serious or critical axe-core violation, every axe "needs
 * review" item explained (EXPLAINED_REVIEW) or, for contrast, measured to reach 4.5:1, nothing wider than
 * the window, and (ARTIFACTS=1) a screenshot. The default run scans at the page's own width (1280 px) and checks
 * the fit at every width; the full run (`npm run test:full`) scans at every width too.
 */
import type { Page } from 'puppeteer-core';
import { screenshot } from './artifacts';
import { seriousViolations, unexplainedReview } from './axe';
import { FULL_RUN } from './property';

/**
 * axe's "needs review" items the pages may show, each with the reason it is not a fault (any other rule's item fails
 * checkPage; color-contrast items are measured instead, test/support/axe.ts measuredContrast).
 */
export const EXPLAINED_REVIEW: Readonly<Record<string, string>> = {};

/** Window widths every page must fit [px]: desktop and tablet. */
export const PAGE_WIDTHS: readonly number[] = [1280, 768];
const HEIGHT: Record<number, number> = { 1280: 900, 768: 1000 };

/** scrollWidth <= clientWidth: the page has no sideways scrolling. */
export const fitsWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth <= document.documentElement.clientWidth);

/** What sticks out past the window's right edge (for a failure's message): the outermost such elements. */
export const overflowing = (page: Page) =>
  page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    const out: string[] = [];
    for (const e of Array.from(document.querySelectorAll('body *'))) {
      const r = e.getBoundingClientRect();
      if (r.right > width + 0.5 && !(e.parentElement && e.parentElement.getBoundingClientRect().right > width + 0.5)) {
        out.push(`${e.tagName.toLowerCase()}${e.id ? '#' + e.id : ''}${e.className && typeof e.className === 'string' ? '.' + e.className.split(' ').join('.') : ''} (right ${Math.round(r.right)})`);
      }
    }
    return out.slice(0, 8);
  });

/**
 * Checks the page at each width and returns to the first. `name` labels failures and screenshots
 * (artifacts/<name>-<width>.png).
 */
export async function checkPage(page: Page, name: string, widths: readonly number[] = PAGE_WIDTHS): Promise<void> {
  const start = page.viewport() ?? { width: widths[0], height: HEIGHT[widths[0]] ?? 900 };
  for (const [i, width] of widths.entries()) {
    if (i > 0 || start.width !== width) await page.setViewport({ width, height: HEIGHT[width] ?? 900 });
    if (i === 0 || FULL_RUN) expect({ name, width, violations: await seriousViolations(page) }).toEqual({ name, width, violations: [] });
    if (i === 0 || FULL_RUN) expect({ name, width, needsReview: await unexplainedReview(page, EXPLAINED_REVIEW) }).toEqual({ name, width, needsReview: [] });
    const fits = await fitsWidth(page);
    expect({ name, width, fits, overflowing: fits ? [] : await overflowing(page) }).toEqual({ name, width, fits: true, overflowing: [] });
    await screenshot(page, `${name}-${width}`);
  }
  if (page.viewport()?.width !== start.width) await page.setViewport(start);
}

/**
 * Embedding a report: the renderer itself prefixes ids and puts the embedding page's style nonce on the style blocks,
 * and the report has no style attributes, so no caller edits its HTML (the design file, the review page's frame).
 */
import { harrowgateReportInput } from './fixtures/harrowgate.fixture';
import { buildReportView } from './report-model';
import { ReportRenderer } from './report-renderer';

const CHARTS = { torqueFriction: '<svg><clipPath id="r2-torque-clip-1"></clipPath></svg>', column: null, safetyFactors: null };

describe('report rendering for embedding', () => {
  const renderer = new ReportRenderer();
  const view = buildReportView(harrowgateReportInput());

  it('a whole document: every style block carries the nonce, no style attribute anywhere', () => {
    const html = renderer.renderHtml(view, CHARTS, { styleNonce: 'bm9uY2Utb2YtdGhlLXBhZ2U' });
    const styles = html.match(/<style[^>]*>/g) ?? [];
    expect(styles.length).toBeGreaterThan(0);
    for (const s of styles) expect(s).toBe('<style nonce="bm9uY2Utb2YtdGhlLXBhZ2U">');
    expect(html).not.toMatch(/\sstyle="/);
    expect(html).toContain('<col class="w52">');
  });

  it('a body with an id prefix: no document shell, every id prefixed', () => {
    const html = renderer.renderHtml(view, CHARTS, { idPrefix: 'r2-', bodyOnly: true });
    expect(html).not.toMatch(/<html|<head[\s>]|<body|<style/i);
    const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    expect(ids.length).toBeGreaterThan(3);
    for (const id of ids) expect(id.startsWith('r2-')).toBe(true);
    expect(renderer.renderHtml(view, CHARTS, { bodyOnly: true })).toContain('id="calc-');
  });

  it('refuses an id prefix that could break out of an attribute', () => {
    expect(() => renderer.renderHtml(view, CHARTS, { idPrefix: '"><x' })).toThrow(/letters, digits and hyphens/);
  });
});

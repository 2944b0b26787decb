/**
 * Renders the calculation report with the service's one Handlebars environment (infra/templates.ts): a whole
 * document, or only its body for embedding in another document (the design file, the review page), with every id
 * prefixed and the style blocks carrying the embedding page's nonce, so no caller edits the HTML afterwards.
 */
import { Templates } from '../infra/templates';
import { renderReportCharts, yieldToEventLoop, type ReportCharts } from './charts';
import { buildReportView, CAUTION_SHORT, type ReportInput, type ReportView } from './report-model';
import type { CalcSection } from './report-view';

export { findTemplatesDir } from '../infra/templates';

/** How many templates were compiled in this process (each once per templates folder). */
export const templateCompilations = (): number => Templates.compilations();

export interface RenderedReport {
  readonly view: ReportView;
  readonly charts: ReportCharts;
  readonly html: string;
}

/** What the PDF renderer needs to print a report's running header and footer. */
export interface ReportPdfLabels {
  readonly headerLabel: string;
  readonly footerNote: string;
}

/** How a report is embedded: a prefix for its ids (and its charts' ids) and the nonce its style blocks carry. */
export interface EmbedOptions {
  /** Prefixed to every id and reference to one, e.g. "r2-" (letters, digits and hyphens) */
  readonly idPrefix?: string;
  /** The embedding page's style nonce (Content-Security-Policy style-src 'nonce-...') */
  readonly styleNonce?: string | null;
  /** Only the body (for a document that brings its own head and styles) */
  readonly bodyOnly?: boolean;
  /** The body with its own styles nested under its box (`.report-doc`), to embed in a page without styling the page */
  readonly embedded?: boolean;
}

type ReportContext = { view: ReportView; charts: ReportCharts; idPrefix: string; styleNonce: string | null };

export class ReportRenderer {
  private readonly templates: Templates;

  constructor(options: { templatesDir?: string } = {}) {
    this.templates = Templates.of(options.templatesDir);
    this.templates.template('reports/calculation-report');
    this.templates.template('report-body');
    this.templates.template('reports/calculation-report-embedded');
  }

  /** HTML of a prepared view with its charts: the whole document, or its body only. */
  renderHtml(view: ReportView, charts: ReportCharts, options: EmbedOptions = {}): string {
    const idPrefix = options.idPrefix ?? '';
    if (!/^[A-Za-z0-9-]*$/.test(idPrefix)) throw new Error(`id prefix "${idPrefix}" may hold letters, digits and hyphens only`);
    const context: ReportContext = { view, charts, idPrefix, styleNonce: options.styleNonce ?? null };
    const name = options.embedded ? 'reports/calculation-report-embedded' : options.bodyOnly ? 'report-body' : 'reports/calculation-report';
    return this.templates.template<ReportContext>(name)(context);
  }

  /** Builds the view and charts of one revision and renders the HTML. */
  async render(input: ReportInput, options: EmbedOptions = {}): Promise<RenderedReport> {
    // Each step is synchronous work; between steps the event loop serves other requests.
    await yieldToEventLoop();
    const view = buildReportView(input);
    await yieldToEventLoop();
    const charts = await renderReportCharts(input.revision, view, options.idPrefix ?? '');
    await yieldToEventLoop();
    return { view, charts, html: this.renderHtml(view, charts, options) };
  }
}

/**
 * A calculation section's notes as the report words them, in plain text (markup dropped, entities decoded): one
 * string per paragraph. For readers of the view that print no HTML, and for the tests of the wording.
 */
export function sectionNotesText(section: Pick<CalcSection, 'notes'>, templatesDir?: string): string[] {
  if (section.notes === null) return [];
  const html = Templates.of(templatesDir).template<unknown>(section.notes.partial)(section.notes.facts);
  const entities: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', '#39': "'", '#x27': "'", '#x3D': '=', '#x60': '`' };
  return [...html.matchAll(/<p[^>]*>([\s\S]*?)<\/p>/g)].map((m) =>
    m[1].replace(/<[^>]+>/g, '').replace(/&(amp|lt|gt|quot|#39|#x27|#x3D|#x60);/g, (_e, name: string) => entities[name]).replace(/\s+/g, ' ').trim());
}

/** Running header and footer text of a report's PDF pages. */
export function reportPdfLabels(view: ReportView): ReportPdfLabels {
  return { headerLabel: view.headerLabel, footerNote: CAUTION_SHORT };
}

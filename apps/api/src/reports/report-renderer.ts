/**
 * Renders the calculation report to HTML with Handlebars. Templates are read and compiled once per templates
 * directory and kept; the view and charts are built fresh for every report.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import Handlebars from 'handlebars';
import { renderReportCharts, yieldToEventLoop, type ReportCharts } from './charts';
import { buildReportView, CAUTION_SHORT, mathHtml, pathHtml, type ReportInput, type ReportView } from './report-model';

const MAIN_TEMPLATE = join('reports', 'calculation-report.hbs');

/** Finds the repository's templates/ folder from this file (source or dist) or the working directory. */
export function findTemplatesDir(start: string = __dirname): string {
  for (let dir = start; ; dir = dirname(dir)) {
    const candidate = join(dir, 'templates');
    if (existsSync(join(candidate, MAIN_TEMPLATE))) return candidate;
    if (dirname(dir) === dir) break;
  }
  const fromCwd = resolve('templates');
  if (existsSync(join(fromCwd, MAIN_TEMPLATE))) return fromCwd;
  throw new Error(`templates/${MAIN_TEMPLATE} not found above ${start} or in the working directory`);
}

interface Compiled {
  readonly report: Handlebars.TemplateDelegate<{ view: ReportView; charts: ReportCharts }>;
}

const compiledByDir = new Map<string, Compiled>();
let compilations = 0;

/** How many times templates were compiled in this process (the cache makes it one per directory). */
export function templateCompilations(): number {
  return compilations;
}

function compile(templatesDir: string): Compiled {
  const cached = compiledByDir.get(templatesDir);
  if (cached) return cached;
  // An isolated environment: helpers and partials of other templates cannot leak in.
  const hbs = Handlebars.create();
  hbs.registerHelper('eq', (a: unknown, b: unknown) => a === b);
  hbs.registerHelper('inc', (i: unknown) => Number(i) + 1);
  // Both escape their argument before adding markup.
  hbs.registerHelper('math', (text: unknown) => new hbs.SafeString(mathHtml(text === undefined || text === null ? '' : String(text))));
  hbs.registerHelper('path', (text: unknown) => new hbs.SafeString(pathHtml(String(text ?? ''))));
  const partialsDir = join(templatesDir, 'partials');
  for (const file of readdirSync(partialsDir)) {
    if (file.endsWith('.hbs')) hbs.registerPartial(basename(file, '.hbs'), readFileSync(join(partialsDir, file), 'utf8'));
  }
  const source = readFileSync(join(templatesDir, MAIN_TEMPLATE), 'utf8');
  const compiled: Compiled = { report: hbs.compile(source, { strict: false, preventIndent: true }) };
  compiledByDir.set(templatesDir, compiled);
  compilations++;
  return compiled;
}

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

export class ReportRenderer {
  private readonly templatesDir: string;

  constructor(options: { templatesDir?: string } = {}) {
    this.templatesDir = options.templatesDir ?? findTemplatesDir();
    compile(this.templatesDir);
  }

  /** HTML of a prepared view with its charts. */
  renderHtml(view: ReportView, charts: ReportCharts): string {
    return compile(this.templatesDir).report({ view, charts });
  }

  /** Builds the view and charts of one revision and renders the HTML. */
  async render(input: ReportInput): Promise<RenderedReport> {
    // Each step is synchronous work; between steps the event loop serves other requests.
    await yieldToEventLoop();
    const view = buildReportView(input);
    await yieldToEventLoop();
    const charts = await renderReportCharts(input.revision, view);
    await yieldToEventLoop();
    return { view, charts, html: this.renderHtml(view, charts) };
  }
}

/** Running header and footer text of a report's PDF pages. */
export function reportPdfLabels(view: ReportView): ReportPdfLabels {
  return { headerLabel: view.headerLabel, footerNote: CAUTION_SHORT };
}

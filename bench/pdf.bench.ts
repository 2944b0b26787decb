/**
 * PDF benchmark: PdfRenderer.render of the fixture calculation report against a bare page.setContent +
 * page.pdf() of the same HTML on one reused page of the same warm browser. Iterations are interleaved so
 * machine noise hits both sides alike; the ratio is what to compare between runs, not the milliseconds.
 */
import { PdfRenderer } from '../apps/api/src/infra/pdf/browser-pool';
import { harrowgateReportInput } from '../apps/api/src/reports/fixtures/harrowgate.fixture';
import { ReportRenderer, reportPdfLabels } from '../apps/api/src/reports/report-renderer';

export interface PdfBenchResult {
  readonly reportMs: number;
  readonly barePdfMs: number;
  readonly ratio: number;
}

const median = (xs: readonly number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
};

const round = (x: number): number => Math.round(x * 100) / 100;

export async function benchPdf(options: { executablePath?: string; iterations?: number; warmup?: number } = {}): Promise<PdfBenchResult> {
  const iterations = Math.max(20, options.iterations ?? 24);
  const warmup = options.warmup ?? 3;
  const { view, html } = await new ReportRenderer().render(harrowgateReportInput());
  const labels = reportPdfLabels(view);
  // Two pages: one held for the bare side for the whole run, the other serving render().
  const renderer = new PdfRenderer({ executablePath: options.executablePath ?? '/usr/bin/chromium', pageCount: 2 });
  try {
    const report: number[] = [];
    const bare: number[] = [];
    await renderer.withPage(async (page) => {
      const barePdf = async (): Promise<void> => {
        await page.setContent(html, { waitUntil: 'load' });
        await page.pdf({ format: 'A4', printBackground: true });
      };
      for (let i = 0; i < warmup; i++) {
        await renderer.render(html, { format: 'A4', ...labels });
        await barePdf();
      }
      for (let i = 0; i < iterations; i++) {
        // Alternate which side goes first, so neither always runs on a just-warmed cache.
        const order = i % 2 === 0 ? ['report', 'bare'] : ['bare', 'report'];
        for (const side of order) {
          const t0 = performance.now();
          if (side === 'report') await renderer.render(html, { format: 'A4', ...labels });
          else await barePdf();
          (side === 'report' ? report : bare).push(performance.now() - t0);
        }
      }
    });
    const reportMs = median(report);
    const barePdfMs = median(bare);
    return { reportMs: round(reportMs), barePdfMs: round(barePdfMs), ratio: round(reportMs / barePdfMs) };
  } finally {
    await renderer.close();
  }
}

import { Controller, Get, Param, Query, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { PdfBusyError, PdfCancelledError, PdfRenderer } from '../infra/pdf/browser-pool';
import { existsSync } from 'node:fs';
import { Inject } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { ProblemError, validate } from '../infra/http/problem';
import { REPORT_CSP } from '../infra/http/security-headers';
import { z } from 'zod';
import { ReportInputService } from './report-input.service';
import { ReportRenderer, reportPdfLabels } from './report-renderer';

const busy = (retryAfter: number) =>
  new ProblemError(503, 'PDF rendering busy', `every PDF page is in use and the queue is full; try again in ${retryAfter} s (the HTML report is not queued)`, { retryAfter });

const pdfQuerySchema = z.object({ paper: z.enum(['A4', 'Letter']).default('A4') });

/** A page that embeds the report (the review page's frame) names its style nonce; the report's style blocks carry it. */
export const htmlQuerySchema = z.object({
  styleNonce: z
    .string()
    .regex(/^[A-Za-z0-9+/_-]{16,64}={0,2}$/, 'a style nonce is 16 to 64 base64 characters')
    .optional()
    .describe("the embedding page's Content-Security-Policy style nonce, put on the report's <style> blocks"),
});

/** The calculation report of a revision, as HTML and as PDF (Chromium, one browser reused). */
@Controller('api/v1/revisions')
export class ReportsController {
  constructor(
    private readonly inputs: ReportInputService,
    private readonly renderer: ReportRenderer,
    private readonly pdf: PdfRenderer,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  @Get(':id/report.html')
  async html(@Param('id') id: string, @Query() query: unknown, @Res({ passthrough: true }) reply: FastifyReply) {
    const { styleNonce } = validate(htmlQuerySchema, query);
    const { html } = await this.renderer.render(await this.inputs.forRevision(id), { styleNonce: styleNonce ?? null });
    // A static document: sandboxed (no script, opaque origin), nothing loaded from anywhere, never sniffed
    reply.header('content-type', 'text/html; charset=utf-8').header('content-security-policy', REPORT_CSP).header('x-content-type-options', 'nosniff');
    return html;
  }

  /** ?paper=A4 (default) or Letter. */
  @Get(':id/report.pdf')
  async pdfReport(@Param('id') id: string, @Query() query: unknown, @Res({ passthrough: true }) reply: FastifyReply) {
    const { paper } = validate(pdfQuerySchema, query);
    if (!this.config.LEADLINE_CHROMIUM_WS_ENDPOINT && !existsSync(this.config.LEADLINE_CHROMIUM_PATH)) {
      throw new ProblemError(503, 'PDF rendering unavailable', `no Chromium at ${this.config.LEADLINE_CHROMIUM_PATH} (LEADLINE_CHROMIUM_PATH); the HTML report works without it`);
    }
    if (this.pdf.full) throw busy(this.pdf.retryAfterSeconds());
    // A client that disconnects cancels its work: taken out of the queue, or its page closed mid-render.
    const abandoned = new AbortController();
    const onClose = () => {
      if (!reply.raw.writableEnded) abandoned.abort();
    };
    reply.raw.once('close', onClose);
    let buffer: Buffer;
    let input: Awaited<ReturnType<ReportInputService['forRevision']>>;
    try {
      input = await this.inputs.forRevision(id);
      const { view, html } = await this.renderer.render(input);
      buffer = await this.pdf.render(html, { format: paper, ...reportPdfLabels(view), signal: abandoned.signal });
    } catch (err) {
      if (err instanceof PdfBusyError) throw busy(err.retryAfterSeconds);
      if (err instanceof PdfCancelledError) throw new ProblemError(499, 'Client closed request', 'the PDF was not rendered: the client disconnected');
      throw err;
    } finally {
      reply.raw.off('close', onClose);
    }
    reply
      .header('content-type', 'application/pdf')
      .header('content-disposition', `inline; filename="${input.product.code}-${input.calculation.title.replace(/[^A-Za-z0-9._-]+/g, '-')}-rev${input.revision.revision}.pdf"`);
    return buffer;
  }
}

import { Controller, Get, Param, Query, Res } from '@nestjs/common';
import { UserLimit } from '../infra/http/user-limits';
import type { FastifyReply } from 'fastify';
import { PdfRenderer } from '../infra/pdf/browser-pool';
import { pdfForReply, refuseWhenPdfQueueFull } from '../infra/pdf/pdf-reply';
import { existsSync } from 'node:fs';
import { Inject } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { ProblemError, validate } from '../infra/http/problem';
import { REPORT_CSP } from '../infra/http/security-headers';
import { z } from 'zod';
import { ReportInputService } from './report-input.service';
import { ReportRenderer, reportPdfLabels } from './report-renderer';

const pdfQuerySchema = z.object({ paper: z.enum(['A4', 'Letter']).default('A4') });

/**
 * A page that embeds the report (the review page) names its style nonce; the report's style blocks carry it. With
 * part=embedded the answer is a fragment for the page itself: the styles nested under the report's own box and the
 * body, every id prefixed with idPrefix.
 */
export const htmlQuerySchema = z.object({
  styleNonce: z
    .string()
    .regex(/^[A-Za-z0-9+/_-]{16,64}={0,2}$/, 'a style nonce is 16 to 64 base64 characters')
    .optional()
    .describe("the embedding page's Content-Security-Policy style nonce, put on the report's <style> blocks"),
  part: z.enum(['document', 'embedded']).default('document')
    .describe('document: a whole HTML document (default); embedded: a fragment to put inside a page (styles nested under .report-doc, then the body)'),
  idPrefix: z.string().regex(/^[A-Za-z][A-Za-z0-9-]{0,31}$/, 'an id prefix is a letter, then up to 31 letters, digits or hyphens').optional()
    .describe('prefixed to every id of the report (embedded: so its ids never clash with the page\'s)'),
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
    const { styleNonce, part, idPrefix } = validate(htmlQuerySchema, query);
    const { html } = await this.renderer.render(await this.inputs.forRevision(id), { styleNonce: styleNonce ?? null, idPrefix, embedded: part === 'embedded' });
    // A static document: sandboxed (no script, opaque origin), nothing loaded from anywhere, never sniffed
    reply.header('content-type', 'text/html; charset=utf-8').header('content-security-policy', REPORT_CSP).header('x-content-type-options', 'nosniff');
    return html;
  }

  /** ?paper=A4 (default) or Letter. */
  @Get(':id/report.pdf')
  @UserLimit('pdfs')
  async pdfReport(@Param('id') id: string, @Query() query: unknown, @Res({ passthrough: true }) reply: FastifyReply) {
    const { paper } = validate(pdfQuerySchema, query);
    if (!this.config.LEADLINE_CHROMIUM_WS_ENDPOINT && !existsSync(this.config.LEADLINE_CHROMIUM_PATH)) {
      throw new ProblemError(503, 'PDF rendering unavailable', `no Chromium at ${this.config.LEADLINE_CHROMIUM_PATH} (LEADLINE_CHROMIUM_PATH); the HTML report works without it`);
    }
    const note = ' (the HTML report is not queued)';
    refuseWhenPdfQueueFull(this.pdf, note);
    // A client that disconnects cancels its work: taken out of the queue, or its page closed mid-render.
    const { buffer, input } = await pdfForReply(reply, async (signal) => {
      const input = await this.inputs.forRevision(id);
      const { view, html } = await this.renderer.render(input);
      return { input, buffer: await this.pdf.render(html, { format: paper, ...reportPdfLabels(view), signal }) };
    }, note);
    reply
      .header('content-type', 'application/pdf')
      .header('content-disposition', `inline; filename="${input.product.code}-${input.calculation.title.replace(/[^A-Za-z0-9._-]+/g, '-')}-rev${input.revision.revision}.pdf"`);
    return buffer;
  }
}

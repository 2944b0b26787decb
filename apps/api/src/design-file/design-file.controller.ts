import { Body, Controller, Get, HttpCode, Inject, Param, Post, Query, Res } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';
import { CurrentActor } from '../infra/http/actor';
import { UserLimit } from '../infra/http/user-limits';
import type { FastifyReply } from 'fastify';
import { existsSync } from 'node:fs';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { ProblemError, validate } from '../infra/http/problem';
import { PdfRenderer } from '../infra/pdf/browser-pool';
import { pdfForReply, refuseWhenPdfQueueFull } from '../infra/pdf/pdf-reply';
import { checkUuid } from '../products/products.service';
import { DesignFileService } from './design-file.service';
import { DesignFileJobs } from './design-file-jobs.service';

const paperSchema = z.object({ paper: z.enum(['A4', 'Letter']).default('A4') });

/** A product's design file as one PDF (for a technical file or an auditor). */
@Controller('api/v1/products')
export class DesignFileController {
  constructor(
    private readonly files: DesignFileService,
    private readonly pdf: PdfRenderer,
    private readonly jobs: DesignFileJobs,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  /** ?paper=A4 (default) or Letter. */
  @Get(':id/design-file.pdf')
  @UserLimit('pdfs')
  async designFile(@Param('id') id: string, @Query() query: unknown, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'product');
    const { paper } = validate(paperSchema, query);
    if (!this.config.LEADLINE_CHROMIUM_WS_ENDPOINT && !existsSync(this.config.LEADLINE_CHROMIUM_PATH)) {
      throw new ProblemError(503, 'PDF rendering unavailable', `no Chromium at ${this.config.LEADLINE_CHROMIUM_PATH} (LEADLINE_CHROMIUM_PATH)`);
    }
    // A full queue answers 503 with Retry-After before the file is assembled; a client that goes away cancels it
    refuseWhenPdfQueueFull(this.pdf);
    const { file, buffer } = await pdfForReply(reply, async (signal) => {
      const file = await this.files.build(id);
      return { file, buffer: await this.pdf.render(file.html, { format: paper, headerLabel: file.headerLabel, footerNote: file.footerNote, signal }) };
    });
    reply.header('content-type', 'application/pdf').header('content-disposition', `inline; filename="${file.fileName.replace(/[^A-Za-z0-9._-]+/g, '-')}"`);
    return buffer;
  }

  /**
   * The design file rendered by a queue worker on any instance: 202 at once with the job's location
   * (GET /api/v1/jobs/:id shows progress and, when done, where to download the file).
   */
  @Post(':id/design-files')
  @HttpCode(202)
  @UserLimit('pdfs')
  async requestDesignFile(@Param('id') id: string, @Body() body: unknown, @CurrentActor() actor: Actor | null, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'product');
    const { jobId, paper } = await this.jobs.request(id, body, actor?.id ?? null);
    const status = `/api/v1/jobs/${jobId}`;
    reply.header('location', status);
    return { jobId, state: 'ready', paper, status };
  }

  /** The product's newest design-file jobs (five), newest first, each with its state, progress and result. */
  @Get(':id/design-files')
  listDesignFiles(@Param('id') id: string) {
    return this.jobs.recent(checkUuid(id, 'product'));
  }

  /** A design file a worker rendered (the href in its job's result). */
  @Get(':id/design-files/:fileId')
  async renderedDesignFile(@Param('id') id: string, @Param('fileId') fileId: string, @Res({ passthrough: true }) reply: FastifyReply) {
    const file = await this.jobs.file(id, fileId);
    reply.header('content-type', 'application/pdf').header('content-disposition', `attachment; filename="${file.fileName}"`);
    return file.content;
  }
}

/**
 * Design files rendered by the queue's workers on any instance. A request enqueues a `design-file` job and is
 * answered at once (202); a worker assembles the file (DesignFileService) and prints it through the pooled browser,
 * reporting progress, and stores the PDF in `queue.rendered_files` under the product's chain head hash, the record
 * hash the file prints. A request for a product whose chain has not moved since reuses that file without rendering.
 * A job whose instance dies is taken again by another once its lease runs out (QueueService).
 */
import { Injectable, Logger } from '@nestjs/common';
import { z } from 'zod';
import { Database } from '../infra/database/database.service';
import { notFound, validate } from '../infra/http/problem';
import { PdfRenderer } from '../infra/pdf/browser-pool';
import { ProductsService, checkUuid } from '../products/products.service';
import { QueueService, type Job, type JobContext } from '../queue/queue.service';
import { DesignFileService } from './design-file.service';

export const DESIGN_FILE_JOB = 'design-file';

export const designFileRequestSchema = z.object({ paper: z.enum(['A4', 'Letter']).default('A4') }).strict();

/** The 202 answer: the job's id and where to follow it (also in the Location header). */
export const designFileAcceptedSchema = z.object({
  jobId: z.string().uuid(), state: z.literal('ready'), paper: z.enum(['A4', 'Letter']), status: z.string(),
});

/** GET /api/v1/jobs/:id for a design-file job. */
export const designFileJobSchema = z.object({
  id: z.string().uuid(),
  kind: z.string(),
  state: z.enum(['ready', 'running', 'done', 'failed']),
  attempts: z.number().int(),
  progress: z.object({ stage: z.enum(['assembling', 'rendering', 'storing']), done: z.number(), total: z.number(), message: z.string() }).nullable(),
  result: z.object({
    fileId: z.string().uuid(), fileName: z.string(), bytes: z.number().int(), recordHash: z.string().nullable(), reused: z.boolean(), href: z.string(),
  }).nullable(),
  error: z.string().nullable(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
});

/** GET /api/v1/products/:id/design-files: the product's newest design-file jobs, each as GET /api/v1/jobs/:id shows it. */
export const designFileJobListSchema = z.object({
  items: z.array(designFileJobSchema.extend({
    paper: z.enum(['A4', 'Letter']),
    status: z.string().describe('where to follow the job (GET /api/v1/jobs/:id)'),
    current: z.boolean().describe('done, and its file prints the record as it stands now (the product\'s chain head)'),
  })),
});

interface DesignFilePayload {
  productId: string;
  paper: 'A4' | 'Letter';
}

type DesignFileJob = z.infer<typeof designFileJobSchema>;
/** What a done design-file job holds as its result (`reused`: an earlier rendering of the same record was reused). */
export type DesignFileResult = NonNullable<DesignFileJob['result']>;
/** Progress as the product page shows it: a stage, how far, and the words for it. */
export type DesignFileProgress = NonNullable<DesignFileJob['progress']>;

@Injectable()
export class DesignFileJobs {
  private readonly logger = new Logger('design-file');

  constructor(
    private readonly db: Database,
    private readonly queue: QueueService,
    private readonly files: DesignFileService,
    private readonly products: ProductsService,
    private readonly pdf: PdfRenderer,
  ) {
    queue.handle(DESIGN_FILE_JOB, (job, ctx) => this.render(job as Job<DesignFilePayload>, ctx), { visible: true });
  }

  /** Enqueues the rendering of a product's design file; returns the job's id. */
  async request(productId: string, body: unknown, userId: string | null): Promise<{ jobId: string; paper: string }> {
    await this.products.get(productId);
    const { paper } = validate(designFileRequestSchema, body ?? {});
    const jobId = await this.queue.enqueue(this.db, DESIGN_FILE_JOB, { productId, paper } satisfies DesignFilePayload, { createdBy: userId, maxAttempts: 5 });
    return { jobId: jobId!, paper };
  }

  /**
   * The product's newest design-file jobs (at most `limit`), newest first: a page that was reloaded finds the file it
   * asked for still being prepared, or ready; `current` says whether a done file prints the record as it stands now.
   */
  async recent(productId: string, limit = 5): Promise<z.infer<typeof designFileJobListSchema>> {
    await this.products.get(productId);
    const jobs = await this.queue.recent(DESIGN_FILE_JOB, 'productId', productId, limit);
    const head = await this.headHash(productId);
    return {
      items: jobs.map((job) => {
        const result = job.result as DesignFileResult | null;
        return {
          id: job.id, kind: job.kind, state: job.state, attempts: job.attempts, progress: job.progress as DesignFileProgress | null, result,
          error: job.error, createdAt: job.createdAt, finishedAt: job.finishedAt,
          paper: (job.payload as DesignFilePayload).paper, status: `/api/v1/jobs/${job.id}`,
          current: job.state === 'done' && result !== null && head !== null && result.recordHash === head,
        };
      }),
    };
  }

  /** A stored design file of this product. */
  async file(productId: string, fileId: string): Promise<{ fileName: string; content: Buffer }> {
    checkUuid(productId, 'product');
    const [row] = await this.db.query<{ file_name: string; content: Buffer }>(
      `SELECT file_name, content FROM queue.rendered_files WHERE id = $1 AND subject_id = $2 AND kind = $3`,
      [checkUuid(fileId, 'design file'), productId, DESIGN_FILE_JOB],
    );
    if (!row) throw notFound(`design file ${fileId} of product ${productId}`);
    return { fileName: row.file_name, content: Buffer.from(row.content) };
  }

  private async render(job: Job<DesignFilePayload>, ctx: JobContext) {
    const { productId, paper } = job.payload;
    this.logger.log(`design-file job ${job.id} taken (attempt ${job.attempts}) for product ${productId}`);
    const progress = (p: DesignFileProgress) => ctx.progress(p);
    // The same record rendered before: that file, not a new rendering
    const stored = await this.stored(productId, paper);
    if (stored) return { state: 'done' as const, result: { ...stored, reused: true } satisfies DesignFileResult };
    await progress({ stage: 'assembling', done: 0, total: 0, message: 'Assembling the design file' });
    const file = await this.files.build(productId, (done, total) =>
      progress({ stage: 'assembling', done, total, message: `Assembled ${done} of ${total} calculations` }),
    );
    await progress({ stage: 'rendering', done: 0, total: 1, message: 'Printing the PDF' });
    const content = await this.pdf.render(file.html, { format: paper, headerLabel: file.headerLabel, footerNote: file.footerNote });
    await progress({ stage: 'storing', done: 1, total: 1, message: 'Storing the PDF' });
    const fileName = file.fileName.replace(/[^A-Za-z0-9._-]+/g, '-');
    // Two workers rendering the same record keep the first file; a chain that does not verify has no record hash
    // to keep its file under (NULL: stored for this job, never reused)
    const [inserted] = await this.db.query<{ id: string }>(
      `INSERT INTO queue.rendered_files (kind, subject_id, record_hash, paper, file_name, media_type, content, job_id)
       VALUES ($1, $2, $3, $4, $5, 'application/pdf', $6, $7) ON CONFLICT (kind, subject_id, record_hash, paper) DO NOTHING RETURNING id`,
      [DESIGN_FILE_JOB, productId, file.headHash, paper, fileName, content, job.id],
    );
    const kept = inserted ? await this.byId(productId, inserted.id) : await this.byHash(productId, paper, file.headHash!);
    return { state: 'done' as const, result: { ...kept!, reused: false } satisfies DesignFileResult };
  }

  /** The file already rendered for the product's current chain head, if any. */
  private async stored(productId: string, paper: string): Promise<Omit<DesignFileResult, 'reused'> | null> {
    const head = await this.headHash(productId);
    return head ? this.byHash(productId, paper, head) : null;
  }

  /** The hash of the product's chain head (the record a design file prints), or null before its first link. */
  private async headHash(productId: string): Promise<string | null> {
    const [head] = await this.db.query<{ hash: string }>(`SELECT hash FROM chain_heads WHERE product_id = $1`, [productId]);
    return head?.hash || null;
  }

  private byHash(productId: string, paper: string, hash: string): Promise<Omit<DesignFileResult, 'reused'> | null> {
    return this.one(productId, `paper = $3 AND record_hash = $4`, [paper, hash]);
  }

  private byId(productId: string, id: string): Promise<Omit<DesignFileResult, 'reused'> | null> {
    return this.one(productId, `id = $3`, [id]);
  }

  private async one(productId: string, where: string, params: unknown[]): Promise<Omit<DesignFileResult, 'reused'> | null> {
    const [row] = await this.db.query<{ id: string; file_name: string; bytes: number; record_hash: string | null }>(
      `SELECT id, file_name, octet_length(content) AS bytes, record_hash FROM queue.rendered_files
        WHERE kind = $1 AND subject_id = $2 AND ${where}`,
      [DESIGN_FILE_JOB, productId, ...params],
    );
    if (!row) return null;
    return {
      fileId: row.id, fileName: row.file_name, bytes: Number(row.bytes), recordHash: row.record_hash,
      href: `/api/v1/products/${productId}/design-files/${row.id}`,
    };
  }
}

/**
 * A product's design file: one HTML document printed to one PDF through the pooled browser, so page numbers
 * run through the whole file. Cover sheet (product, date, each calculation's latest revision, state and
 * verdict), the calculation report of each calculation's latest approved revision, the product's audit trail
 * as a compact table, and the hash-chain verification with the head hash.
 */
import { Injectable } from '@nestjs/common';
import { CalculationsService } from '../calculations/calculations.service';
import { Database } from '../infra/database/database.service';
import { ProductsService } from '../products/products.service';
import { TS_TEXT } from '../records/chain';
import { RecordStore } from '../records/record-store';
import { formatDate, formatTime, STATES, VERDICTS, wordFor } from '@leadline/presentation';
import { CAUTION_SHORT, CAUTION_TEXT } from '../reports/report-model';
import { ReportInputService } from '../reports/report-input.service';
import { Templates, type Template } from '../infra/templates';
import { ReportRenderer } from '../reports/report-renderer';
import { AuditService } from '../reviews/audit.service';
import { ReviewsService } from '../reviews/reviews.service';



export interface DesignFile {
  readonly html: string;
  readonly headerLabel: string;
  readonly footerNote: string;
  readonly fileName: string;
  /** The product's chain head hash the file prints (null when the chain did not verify) */
  readonly headHash: string | null;
}

/** Called after each calculation is assembled: how many of how many. */
export type AssemblyProgress = (done: number, total: number) => Promise<void> | void;

@Injectable()
export class DesignFileService {
  private readonly template: Template<Record<string, unknown>>;

  constructor(
    private readonly db: Database,
    private readonly products: ProductsService,
    private readonly calculations: CalculationsService,
    private readonly reviews: ReviewsService,
    private readonly audit: AuditService,
    private readonly records: RecordStore,
    private readonly inputs: ReportInputService,
    private readonly renderer: ReportRenderer,
  ) {
    this.template = Templates.of().template('reports/design-file');
  }

  async build(productId: string, onProgress?: AssemblyProgress): Promise<DesignFile> {
    const product = await this.products.get(productId);
    const [calcs, chain, trail, now] = await Promise.all([
      this.calculations.listForProduct(productId),
      this.records.verify(productId),
      this.audit.fullTrail(productId),
      this.db.query<{ now: string }>(`SELECT ${TS_TEXT('now()')} AS now`),
    ]);
    const calculations = [];
    const reports: { body: string }[] = [];
    for (const calc of calcs) {
      const [revisions, states] = await Promise.all([this.calculations.revisions(calc.id), this.reviews.statesOfCalculation(calc.id)]);
      const latest = revisions[revisions.length - 1];
      const approved = [...revisions].reverse().find((r) => states.get(r.id)?.state === 'approved') ?? null;
      calculations.push({
        title: calc.title,
        latest: latest ? { revision: latest.revision, state: wordFor(STATES, states.get(latest.id)!.state), verdict: wordFor(VERDICTS, latest.verdict) } : { revision: '—', state: '—', verdict: '—' },
        approved: approved ? { revision: approved.revision, hash: approved.hash } : null,
      });
      if (approved) {
        // The report's body alone, its ids prefixed so several reports share one document (chart clip paths, anchors)
        const { html } = await this.renderer.render(await this.inputs.forRevision(approved.id), { idPrefix: `r${reports.length + 1}-`, bodyOnly: true });
        reports.push({ body: html });
      }
      await onProgress?.(calculations.length, calcs.length);
    }
    const summary = chain.valid
      ? `intact: ${chain.links} links recomputed from the stored records`
      : `BROKEN: ${chain.links} links, first broken link at seq. ${chain.firstBrokenLink?.seq}`;
    const html = this.template({
      product,
      generatedAt: formatDate(now[0].now),
      calculations,
      reports,
      caution: CAUTION_TEXT,
      trail: trail.map((e) => ({ seq: e.seq, time: formatTime(e.time), type: e.type, actor: e.actor?.name ?? '—', revision: e.revision ?? '', summary: e.summary, hash: e.hash })),
      chain: {
        result: chain.valid ? 'intact' : 'BROKEN',
        summary,
        headHash: chain.headHash ?? '—',
        broken: chain.firstBrokenLink ? `seq. ${chain.firstBrokenLink.seq} (${chain.firstBrokenLink.kind} ${chain.firstBrokenLink.id}): ${chain.firstBrokenLink.reason}` : null,
      },
    });
    return { html, headerLabel: `Design file · ${product.code} · ${product.name}`, footerNote: CAUTION_SHORT, fileName: `design-file-${product.code}.pdf`, headHash: chain.valid ? chain.headHash ?? null : null };
  }
}

/**
 * The outbox's reader: each record event (an `event` job, enqueued by trigger in the record's own transaction) fans
 * out into one webhook delivery per subscribed endpoint and one mail per recipient, in one transaction with
 * dedupe keys, so a fan-out that runs twice (its instance died before finishing the job) enqueues nothing twice.
 */
import { Injectable } from '@nestjs/common';
import { Database } from '../infra/database/database.service';
import { QueueService, type Job } from '../queue/queue.service';
import { WebhooksService, type OutboxEvent } from '../webhooks/webhooks.service';
import { MailService } from './mail.service';

@Injectable()
export class OutboxDispatcher {
  constructor(
    private readonly db: Database,
    queue: QueueService,
    private readonly webhooks: WebhooksService,
    private readonly mail: MailService,
  ) {
    queue.handle('event', (job) => this.dispatch(job as Job<OutboxEvent>));
  }

  private async dispatch(job: Job<OutboxEvent>): Promise<void> {
    await this.db.transaction(async (q) => {
      await this.webhooks.fanOut(q, job.id, job.payload);
      await this.mail.fanOut(q, job.id, job.payload);
    });
  }
}

import { Controller, Get, Param } from '@nestjs/common';
import { notFound } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { QueueService } from './queue.service';

/** A queued piece of work a user asked for (a design file): its state, progress and, when done, its result. */
@Controller('api/v1/jobs')
export class JobsController {
  constructor(private readonly queue: QueueService) {}

  @Get(':id')
  async get(@Param('id') id: string) {
    const job = await this.queue.get(checkUuid(id, 'job'));
    // Deliveries and fan-out jobs are not shown: to a caller they do not exist
    if (!job || !this.queue.isVisible(job.kind)) throw notFound(`job ${id}`);
    return {
      id: job.id, kind: job.kind, state: job.state, attempts: job.attempts, progress: job.progress, result: job.result,
      error: job.error, createdAt: job.createdAt, finishedAt: job.finishedAt,
    };
  }
}

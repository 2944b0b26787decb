import { Module } from '@nestjs/common';
import { JobsController } from './jobs.controller';
import { QueueService } from './queue.service';

/** The durable job queue (schema `queue`): enqueue in a transaction, handlers registered by the modules that own them. */
@Module({ controllers: [JobsController], providers: [QueueService], exports: [QueueService] })
export class QueueModule {}

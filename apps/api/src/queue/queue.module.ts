import { Module } from '@nestjs/common';
import { QueueService } from './queue.service';

/** The durable job queue (schema `queue`): enqueue in a transaction, handlers registered by the modules that own them. */
@Module({ providers: [QueueService], exports: [QueueService] })
export class QueueModule {}

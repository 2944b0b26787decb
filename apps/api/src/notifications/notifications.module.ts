import { Module } from '@nestjs/common';
import { QueueModule } from '../queue/queue.module';
import { WebhooksController } from '../webhooks/webhooks.controller';
import { WebhooksService } from '../webhooks/webhooks.service';
import { MailService } from './mail.service';
import { NotificationsController } from './notifications.controller';
import { OutboxDispatcher } from './outbox.dispatcher';
import { RevocationListener } from './revocation-listener';

/** Record events leave the service: signed webhooks and notification mail, both run by the job queue; revocations reach every instance. */
@Module({
  imports: [QueueModule],
  controllers: [WebhooksController, NotificationsController],
  providers: [WebhooksService, MailService, OutboxDispatcher, RevocationListener],
})
export class NotificationsModule {}

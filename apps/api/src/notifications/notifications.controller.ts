import { Body, Controller, Get, Put } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';
import { CurrentActor } from '../infra/http/actor';
import { ProblemError } from '../infra/http/problem';
import { MailService } from './mail.service';

/** The signed-in user's mail preference: the address notifications go to and whether they are sent. */
@Controller('api/v1/me/notifications')
export class NotificationsController {
  constructor(private readonly mail: MailService) {}

  @Get()
  get(@CurrentActor() actor: Actor | null) {
    return this.mail.preference(this.id(actor));
  }

  @Put()
  set(@Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.mail.setPreference(this.id(actor), body);
  }

  private id(actor: Actor | null): string {
    if (!actor) throw new ProblemError(403, 'Forbidden', 'mail preferences belong to a user');
    return actor.id;
  }
}

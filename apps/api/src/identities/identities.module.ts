import { Global, Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { AuthGuard } from './auth.guard';
import { IdentitiesController, IdentityEventsController } from './identities.controller';
import { IdentitiesService } from './identities.service';

@Global()
@Module({
  controllers: [IdentitiesController, IdentityEventsController],
  providers: [IdentitiesService, AuthGuard, { provide: APP_GUARD, useExisting: AuthGuard }],
  exports: [IdentitiesService, AuthGuard],
})
export class IdentitiesModule {}

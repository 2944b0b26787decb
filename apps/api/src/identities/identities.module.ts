import { Global, Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { AccountsController } from './accounts.controller';
import { AccountsService } from './accounts.service';
import { AuthGuard } from './auth.guard';
import { ReauthenticationsService } from './reauthentications.service';
import { OidcController } from './oidc.controller';
import { OidcService } from './oidc.service';
import { PasskeysController } from './passkeys.controller';
import { PasskeysService } from './passkeys.service';
import { IdentitiesController, IdentityEventsController } from './identities.controller';
import { IdentitiesService } from './identities.service';

@Global()
@Module({
  controllers: [IdentitiesController, IdentityEventsController, AccountsController, OidcController, PasskeysController],
  providers: [IdentitiesService, AccountsService, ReauthenticationsService, OidcService, PasskeysService, AuthGuard, { provide: APP_GUARD, useExisting: AuthGuard }],
  exports: [IdentitiesService, AccountsService, ReauthenticationsService, PasskeysService, AuthGuard],
})
export class IdentitiesModule {}

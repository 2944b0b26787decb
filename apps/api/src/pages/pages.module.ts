import { Module } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { AccountPagesController } from './account-pages.controller';
import { PageRenderer } from './page-renderer';
import { DesignPagesController } from './design-pages.controller';
import { PagesController } from './pages.controller';

/** Server-rendered pages: the checking engineer's under /review, the design author's under /design (shells only; data comes from /api/v1). */
@Module({
  controllers: [PagesController, DesignPagesController, AccountPagesController],
  providers: [{ provide: PageRenderer, useFactory: (config: AppConfig) => new PageRenderer({ oidc: Boolean(config.LEADLINE_OIDC_ISSUER) }), inject: [APP_CONFIG] }],
})
export class PagesModule {}

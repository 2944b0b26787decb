import { Module } from '@nestjs/common';
import { PageRenderer } from './page-renderer';
import { DesignPagesController } from './design-pages.controller';
import { PagesController } from './pages.controller';

/** Server-rendered pages: the checking engineer's under /review, the design author's under /design (shells only; data comes from /api/v1). */
@Module({
  controllers: [PagesController, DesignPagesController],
  providers: [{ provide: PageRenderer, useFactory: () => new PageRenderer() }],
})
export class PagesModule {}

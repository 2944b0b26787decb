import { Module } from '@nestjs/common';
import { PageRenderer } from './page-renderer';
import { PagesController } from './pages.controller';

/** Server-rendered pages for the checking engineer under /review (shells only; data comes from /api/v1). */
@Module({
  controllers: [PagesController],
  providers: [{ provide: PageRenderer, useFactory: () => new PageRenderer() }],
})
export class PagesModule {}

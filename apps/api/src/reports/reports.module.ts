import { Inject, Module, OnApplicationShutdown } from '@nestjs/common';
import { CalculationsModule } from '../calculations/calculations.module';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { PdfRenderer } from '../infra/pdf/browser-pool';
import { ProductsModule } from '../products/products.module';
import { ReportInputService } from './report-input.service';
import { ReportRenderer } from './report-renderer';
import { ReportsController } from './reports.controller';
import { DesignChartsController } from './design-charts.controller';

@Module({
  imports: [CalculationsModule, ProductsModule],
  controllers: [ReportsController, DesignChartsController],
  providers: [
    ReportInputService,
    { provide: ReportRenderer, useFactory: () => new ReportRenderer() },
    {
      provide: PdfRenderer,
      inject: [APP_CONFIG],
      useFactory: (c: AppConfig) =>
        new PdfRenderer({
          executablePath: c.LEADLINE_CHROMIUM_PATH,
          queueLimit: c.LEADLINE_PDF_QUEUE_LIMIT,
          queueWaitMs: c.LEADLINE_PDF_QUEUE_WAIT_MS,
          sandbox: c.LEADLINE_CHROMIUM_SANDBOX,
          browserWSEndpoint: c.LEADLINE_CHROMIUM_WS_ENDPOINT,
        }),
    },
  ],
  exports: [PdfRenderer, ReportRenderer, ReportInputService],
})
export class ReportsModule implements OnApplicationShutdown {
  constructor(@Inject(PdfRenderer) private readonly pdf: PdfRenderer) {}

  async onApplicationShutdown(): Promise<void> {
    await this.pdf.close();
  }
}

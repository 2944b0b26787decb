import { Module } from '@nestjs/common';
import { CalculationsModule } from '../calculations/calculations.module';
import { ProductsModule } from '../products/products.module';
import { RecordsModule } from '../records/records.module';
import { QueueModule } from '../queue/queue.module';
import { ReportsModule } from '../reports/reports.module';
import { DesignFileController } from './design-file.controller';
import { DesignFileService } from './design-file.service';
import { DesignFileJobs } from './design-file-jobs.service';

/** A product's design file through the reports' pooled browser: in the request (design-file.pdf) or by a queue worker (design-files). */
@Module({ imports: [ReportsModule, CalculationsModule, ProductsModule, RecordsModule, QueueModule], controllers: [DesignFileController], providers: [DesignFileService, DesignFileJobs] })
export class DesignFileModule {}

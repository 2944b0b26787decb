import { Module } from '@nestjs/common';
import { CalculationsModule } from '../calculations/calculations.module';
import { ProductsModule } from '../products/products.module';
import { RecordsModule } from '../records/records.module';
import { ReportsModule } from '../reports/reports.module';
import { DesignFileController } from './design-file.controller';
import { DesignFileService } from './design-file.service';

/** GET /api/v1/products/:id/design-file.pdf through the reports' pooled browser. */
@Module({ imports: [ReportsModule, CalculationsModule, ProductsModule, RecordsModule], controllers: [DesignFileController], providers: [DesignFileService] })
export class DesignFileModule {}

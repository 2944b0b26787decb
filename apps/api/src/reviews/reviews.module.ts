import { Global, Module } from '@nestjs/common';
import { CalculationsModule } from '../calculations/calculations.module';
import { ProductsModule } from '../products/products.module';
import { AuditService } from './audit.service';
import { ReviewsController } from './reviews.controller';
import { ReviewsService } from './reviews.service';

@Global()
@Module({ imports: [CalculationsModule, ProductsModule], controllers: [ReviewsController], providers: [ReviewsService, AuditService], exports: [ReviewsService, AuditService] })
export class ReviewsModule {}

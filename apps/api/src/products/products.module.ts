import { Module } from '@nestjs/common';
import { CalculationsModule } from '../calculations/calculations.module';
import { ProductsController } from './products.controller';
import { ProductsService } from './products.service';

@Module({ imports: [CalculationsModule], controllers: [ProductsController], providers: [ProductsService], exports: [ProductsService] })
export class ProductsModule {}

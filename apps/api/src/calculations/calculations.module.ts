import { Module } from '@nestjs/common';
import { CalculationsController } from './calculations.controller';
import { CalculationsService } from './calculations.service';
import { DraftsService } from './drafts.service';

@Module({ controllers: [CalculationsController], providers: [CalculationsService, DraftsService], exports: [CalculationsService] })
export class CalculationsModule {}

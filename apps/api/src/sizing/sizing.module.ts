import { Module } from '@nestjs/common';
import { SizingController } from './sizing.controller';
import { SizingPageController } from './sizing-page.controller';
import { SizingService } from './sizing.service';

@Module({ controllers: [SizingController, SizingPageController], providers: [SizingService] })
export class SizingModule {}

import { Global, Module } from '@nestjs/common';
import { RecordStore } from './record-store';

@Global()
@Module({ providers: [RecordStore], exports: [RecordStore] })
export class RecordsModule {}

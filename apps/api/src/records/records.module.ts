import { Global, Module } from '@nestjs/common';
import { RecordStore } from './record-store';
import { ServiceKeys } from './service-keys';

@Global()
@Module({ providers: [ServiceKeys, RecordStore], exports: [RecordStore, ServiceKeys] })
export class RecordsModule {}

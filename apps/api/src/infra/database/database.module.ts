import { Global, Module, type DynamicModule } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { AppConfig } from '../config';
import { createDataSource, guardPoolClients } from './data-source';
import { Database } from './database.service';

/** TypeORM data source (PostgreSQL or PGlite), migrations run on start-up, and the Database door. */
@Global()
@Module({})
export class DatabaseModule {
  static forRoot(config: AppConfig): DynamicModule {
    const choice = createDataSource(config);
    return {
      module: DatabaseModule,
      imports: [
        TypeOrmModule.forRootAsync({
          useFactory: () => choice.dataSource.options,
          dataSourceFactory: async () => {
            await choice.dataSource.initialize();
            guardPoolClients(choice.dataSource);
            await choice.dataSource.runMigrations({ transaction: 'each' });
            return choice.dataSource;
          },
        }),
      ],
      providers: [{ provide: Database, inject: [DataSource], useFactory: (ds: DataSource) => new Database(ds, choice.embedded) }],
      exports: [Database],
    };
  }
}

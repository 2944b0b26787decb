import { Global, Module, type DynamicModule } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { AppConfig } from '../config';
import { createDataSource, guardPoolClients } from './data-source';
import { restrictDataDir } from './data-dir-mode';
import { Database } from './database.service';
import { migrateServer, warnIfPrivileged } from './migrate';
import { EmbeddedStatistics } from './statistics';

/** TypeORM data source (PostgreSQL or PGlite), migrations run on start-up (as the owner role on PostgreSQL), and the Database door. */
@Global()
@Module({})
export class DatabaseModule {
  static forRoot(config: AppConfig, embeddedSnapshot?: Blob): DynamicModule {
    const choice = createDataSource(config, embeddedSnapshot);
    return {
      module: DatabaseModule,
      imports: [
        TypeOrmModule.forRootAsync({
          useFactory: () => choice.dataSource.options,
          dataSourceFactory: async () => {
            // PostgreSQL: migrate as the owner role on a connection of its own, then connect as the runtime role
            if (!choice.embedded) await migrateServer(config);
            await choice.dataSource.initialize();
            guardPoolClients(choice.dataSource);
            if (choice.embedded) await choice.dataSource.runMigrations({ transaction: 'each' });
            else await warnIfPrivileged(choice.dataSource);
            if (choice.dataDir) restrictDataDir(choice.dataDir);
            return choice.dataSource;
          },
        }),
      ],
      providers: [{ provide: Database, inject: [DataSource], useFactory: (ds: DataSource) => new Database(ds, choice.embedded, choice.dataDir) }, EmbeddedStatistics],
      exports: [Database],
    };
  }
}

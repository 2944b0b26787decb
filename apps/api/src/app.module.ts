import { Module, type DynamicModule, type Type } from '@nestjs/common';
import { APP_INTERCEPTOR } from '@nestjs/core';
import { ConfigModule } from '@nestjs/config';
import { CalculationsModule } from './calculations/calculations.module';
import { CheckpointsModule } from './checkpoints/checkpoints.module';
import { EvaluationsModule } from './evaluations/evaluations.module';
import { HealthModule } from './health/health.module';
import { IdentitiesModule } from './identities/identities.module';
import { ReportsModule } from './reports/reports.module';
import { ReviewsModule } from './reviews/reviews.module';
import { APP_CONFIG, type AppConfig } from './infra/config';
import { CLOCK, systemClock, type Clock } from './infra/clock';
import { UserLimitInterceptor } from './infra/http/user-limits';
import { DatabaseModule } from './infra/database/database.module';
import { LibraryModule } from './library/library.module';
import { PagesModule } from './pages/pages.module';
import { ProductsModule } from './products/products.module';
import { RecordsModule } from './records/records.module';
import { RulesModule } from './rules/rules.module';
import { SizingModule } from './sizing/sizing.module';
import { WorkbenchModule } from './workbench/workbench.module';
import { DesignFileModule } from './design-file/design-file.module';

/** What a process hands the service besides its configuration. */
export interface RuntimeOptions {
  /** The clock application code decides by (default: the system clock) */
  clock?: Clock;
  /** A migrated embedded database to start from (a PGlite data-folder dump), instead of an empty one */
  embeddedSnapshot?: Blob;
}

@Module({})
export class AppModule {
  /** The whole service for one validated configuration. */
  static forRoot(config: AppConfig, extraModules: Type[] = [], runtime: RuntimeOptions = {}): DynamicModule {
    return {
      module: AppModule,
      global: true,
      imports: [
        ConfigModule.forRoot({ isGlobal: true, ignoreEnvFile: true, ignoreEnvVars: true, load: [() => config] }),
        DatabaseModule.forRoot(config, runtime.embeddedSnapshot),
        IdentitiesModule,
        RecordsModule,
        CheckpointsModule,
        RulesModule,
        EvaluationsModule,
        ProductsModule,
        CalculationsModule,
        LibraryModule,
        ReviewsModule,
        ReportsModule,
        HealthModule,
        PagesModule,
        SizingModule,
        WorkbenchModule,
        DesignFileModule,
        ...extraModules,
      ],
      providers: [
        { provide: APP_CONFIG, useValue: config },
        { provide: CLOCK, useValue: runtime.clock ?? systemClock },
        { provide: APP_INTERCEPTOR, useClass: UserLimitInterceptor },
      ],
      exports: [APP_CONFIG, CLOCK],
    };
  }
}

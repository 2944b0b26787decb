/**
 * Builds the Nest application on Fastify for a configuration. Used by main.ts, the end-to-end tests and the benchmark.
 */
import type { Type } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { FastifyAdapter, type NestFastifyApplication } from '@nestjs/platform-fastify';
import type { DestinationStream } from 'pino';
import { AppModule, type RuntimeOptions } from './app.module';
import { loadConfig, type AppConfig } from './infra/config';
import { ProblemFilter } from './infra/http/problem';
import { TextInputInterceptor } from './infra/http/text-input';
import { addSecurityHeaders } from './infra/http/security-headers';
import { registerJsonBodyParser } from './infra/http/json-body';
import { createLogger, PinoNestLogger } from './infra/logging';
import { mountOpenApi } from './infra/openapi';

export interface CreateAppOptions {
  /** Environment to validate (defaults to process.env in main.ts) */
  env: Record<string, string | undefined>;
  /** Where JSON logs go (a test captures them) */
  logDestination?: DestinationStream;
  /** Extra modules mounted beside the service (the benchmark's baseline routes) */
  extraModules?: Type[];
  /** What the process provides besides configuration (tests: a clock they move, a migrated embedded snapshot) */
  runtime?: RuntimeOptions;
}

export async function createApp(options: CreateAppOptions): Promise<{ app: NestFastifyApplication; config: AppConfig }> {
  const config = loadConfig(options.env);
  const logger = createLogger(config.LOG_LEVEL, options.logDestination);
  const adapter = new FastifyAdapter({
    loggerInstance: logger,
    bodyLimit: config.LEADLINE_BODY_LIMIT,
    trustProxy: config.LEADLINE_TRUST_PROXY,
    // A request (headers and body) must arrive within its time-out, or Node answers 408 and closes the connection;
    // the checking interval is short enough for a short configured time-out to act promptly.
    requestTimeout: config.LEADLINE_REQUEST_TIMEOUT_MS,
    http: {
      requestTimeout: config.LEADLINE_REQUEST_TIMEOUT_MS,
      headersTimeout: Math.min(config.LEADLINE_HEADERS_TIMEOUT_MS, config.LEADLINE_REQUEST_TIMEOUT_MS),
      connectionsCheckingInterval: Math.max(50, Math.min(30_000, Math.floor(Math.min(config.LEADLINE_HEADERS_TIMEOUT_MS, config.LEADLINE_REQUEST_TIMEOUT_MS) / 4))),
    },
  });
  registerJsonBodyParser(adapter.getInstance(), { maxDepth: config.LEADLINE_JSON_MAX_DEPTH, bodyLimit: config.LEADLINE_BODY_LIMIT });
  const app = await NestFactory.create<NestFastifyApplication>(AppModule.forRoot(config, options.extraModules ?? [], options.runtime ?? {}), adapter, {
    logger: new PinoNestLogger(logger),
    bufferLogs: false,
    // the body parser is registerJsonBodyParser's (JSON only, depth-limited), not Nest's JSON + form-encoded pair
    bodyParser: false,
  });
  app.useGlobalFilters(new ProblemFilter());
  app.useGlobalInterceptors(new TextInputInterceptor());
  addSecurityHeaders(adapter.getInstance());
  app.enableShutdownHooks();
  mountOpenApi(app);
  await app.init();
  return { app, config };
}

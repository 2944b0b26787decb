/**
 * Configuration: read once from the environment, validated at boot, typed. Nothing else reads process.env.
 */
import { z } from 'zod';

const flag = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

export const configSchema = z.object({
  /** PostgreSQL connection string; without it the service runs on an embedded PGlite database */
  DATABASE_URL: z.string().url().optional(),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  /** Folder of the embedded database */
  LEADLINE_DATA_DIR: z.string().default('./data'),
  /** Bootstrap token for the first admin of a fresh deployment */
  LEADLINE_ADMIN_TOKEN: z.string().min(24, 'LEADLINE_ADMIN_TOKEN must be at least 24 characters').optional(),
  /** Seed the invented demo scenario when the database is empty (default: on for the embedded database) */
  LEADLINE_DEMO_SEED: flag.optional(),
  /** Chromium used for PDF reports (never downloaded) */
  LEADLINE_CHROMIUM_PATH: z.string().default('/usr/bin/chromium'),
  /** Largest accepted request body [bytes] */
  LEADLINE_BODY_LIMIT: z.coerce.number().int().min(1024).default(256 * 1024),
  /** Pool size for PostgreSQL */
  LEADLINE_DB_POOL: z.coerce.number().int().min(1).max(100).default(10),
  /** Behind a reverse proxy: take the client address from X-Forwarded-For (the failed-auth limit counts per address) */
  LEADLINE_TRUST_PROXY: flag.default(false),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export type AppConfig = z.output<typeof configSchema>;

/** Validates an environment; throws one readable error listing every bad variable. */
export function loadConfig(env: Record<string, string | undefined>): AppConfig {
  const cleaned = Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined && v !== ''));
  const parsed = configSchema.safeParse(cleaned);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`invalid configuration:\n${lines.join('\n')}`);
  }
  return parsed.data;
}

export const APP_CONFIG = Symbol('APP_CONFIG');

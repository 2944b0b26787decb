/**
 * The real service (reviewer pages included) listening on a real port so that Chromium can load it, on a fresh
 * PostgreSQL database: test/support/harness.ts with { listen: true }, with the pages tests' names for its users.
 */
import type { NestFastifyApplication } from '@nestjs/platform-fastify';
import type { DestinationStream } from 'pino';
import { startTestApp, type Who } from '../support/harness';

export type PageUser = 'author' | 'reviewer' | 'checkerAuthor' | 'admin';

/** checkerAuthor may both submit and check, so that the four-eyes rule (not the role check) refuses self-approval. */
const AS: Record<PageUser, Who> = { author: 'author', reviewer: 'reviewer', checkerAuthor: 'reviewer2', admin: 'admin' };

export interface PagesApp {
  app: NestFastifyApplication;
  /** http://127.0.0.1:<port> */
  baseUrl: string;
  tokens: Record<PageUser, string>;
  /** Emails and passwords the pages sign in with (the admin is the bootstrap admin: a token only, no account) */
  accounts: Record<Exclude<PageUser, 'admin'>, { email: string; password: string }>;
  call(method: string, url: string, body?: unknown, as?: PageUser): Promise<{ status: number; body: any; headers: Record<string, unknown>; raw: Buffer }>;
  close(): Promise<void>;
}

export async function startPagesApp(env: Record<string, string> = {}, logDestination?: DestinationStream): Promise<PagesApp> {
  const t = await startTestApp('postgres', env, logDestination, { listen: true });
  const tokens = Object.fromEntries((Object.keys(AS) as PageUser[]).map((u) => [u, t.tokens[AS[u] as Exclude<Who, 'anonymous'>]])) as Record<PageUser, string>;
  return {
    app: t.app,
    baseUrl: t.baseUrl as string,
    tokens,
    accounts: {
      author: { email: t.emails.author, password: t.passwords.author },
      reviewer: { email: t.emails.reviewer, password: t.passwords.reviewer },
      checkerAuthor: { email: t.emails.reviewer2, password: t.passwords.reviewer2 },
    },
    call: (method, url, body, as = 'author') => t.call(method, url, body, { as: AS[as] }),
    close: () => t.close(),
  };
}

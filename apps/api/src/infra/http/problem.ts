/**
 * Errors as RFC 9457 problem details (application/problem+json), with the invalid field paths.
 * Stack traces and SQL never leave the service.
 */
import { ArgumentsHost, Catch, ExceptionFilter, HttpException, HttpStatus, Logger } from '@nestjs/common';
import type { FastifyReply, FastifyRequest } from 'fastify';
import { findTextIssues, type FieldIssue } from '@leadline/contracts';
import type { ZodType } from 'zod';

export interface Problem {
  type: string;
  title: string;
  status: number;
  detail?: string;
  instance?: string;
  errors?: readonly FieldIssue[];
  [extra: string]: unknown;
}

/** Thrown by services and controllers; the filter renders it as problem+json. */
export class ProblemError extends Error {
  constructor(
    readonly status: number,
    readonly title: string,
    readonly detail?: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(detail ?? title);
  }
}

export class ValidationProblem extends ProblemError {
  constructor(readonly errors: readonly FieldIssue[]) {
    super(422, 'The request has invalid fields', errors.map((e) => `${e.path}: ${e.message}`).join('; '), { errors });
  }
}

export const notFound = (what: string) => new ProblemError(404, 'Not found', `${what} does not exist`);

const TYPE_BASE = 'https://leadline.invalid/problems/';

/** Validates a request part with a zod schema; field paths are prefixed (e.g. "design."). */
export function validate<T>(schema: ZodType<T>, value: unknown, prefix = ''): T {
  // Text that cannot be stored is refused here too (callers outside HTTP, e.g. the seed)
  const textIssues = findTextIssues(value, prefix);
  if (textIssues.length > 0) throw new ValidationProblem(textIssues);
  const r = schema.safeParse(value);
  if (r.success) return r.data;
  throw new ValidationProblem(
    r.error.issues.map((i) => ({ path: prefix + (i.path.map(String).join('.') || '(body)'), message: i.message })),
  );
}

@Catch()
export class ProblemFilter implements ExceptionFilter {
  private readonly logger = new Logger('http');

  catch(exception: unknown, host: ArgumentsHost): void {
    const ctx = host.switchToHttp();
    const reply = ctx.getResponse<FastifyReply>();
    const request = ctx.getRequest<FastifyRequest>();
    const problem = toProblem(exception);
    problem.instance = request.url.split('?')[0];
    if (problem.status === 503) this.logger.warn(`database unavailable: ${exception instanceof Error ? exception.message : String(exception)}`);
    else if (problem.status >= 500) {
      const err = exception instanceof Error ? exception : new Error(String(exception));
      this.logger.error(`unhandled error: ${err.message}`, err.stack);
    }
    // 429 and 503 say when to come back (RFC 9110 Retry-After, in seconds)
    if (typeof problem.retryAfter === 'number') reply.header('retry-after', String(Math.max(1, Math.ceil(problem.retryAfter))));
    if (problem.status === 503 && !reply.hasHeader('retry-after')) reply.header('retry-after', String(RETRY_AFTER_SECONDS));
    reply.status(problem.status).header('content-type', 'application/problem+json').send(problem);
  }
}

/** A problem with the request body as a whole (too large, not JSON) names the body-level path "(body)". */
const BODY_PATH = '(body)';
const BODY_STATUSES = new Set([400, 413, 415]);

const slug = (title: string) => title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '');

export function toProblem(exception: unknown): Problem {
  if (exception instanceof ProblemError) {
    return { type: TYPE_BASE + slug(exception.title), title: exception.title, status: exception.status, detail: exception.detail, ...exception.extra };
  }
  const fastifyCode = (exception as { code?: string; statusCode?: number })?.code;
  if (fastifyCode === 'FST_ERR_CTP_BODY_TOO_LARGE') {
    return { type: TYPE_BASE + 'body-too-large', title: 'Request body too large', status: 413, errors: [{ path: BODY_PATH, message: 'the request body is too large' }] };
  }
  if (exception instanceof HttpException) {
    const status = exception.getStatus();
    const body = exception.getResponse();
    const detail = typeof body === 'string' ? body : ((body as { message?: string | string[] }).message ?? exception.message);
    const text = Array.isArray(detail) ? detail.join('; ') : detail;
    return {
      type: TYPE_BASE + slug(exception.name), title: HttpStatus[status]?.replace(/_/g, ' ').toLowerCase() ?? 'error', status, detail: text,
      // the body parser's refusals (not JSON, forbidden prototype keys, too large, not a JSON media type)
      ...(BODY_STATUSES.has(status) ? { errors: [{ path: BODY_PATH, message: text }] } : {}),
    };
  }
  const statusCode = (exception as { statusCode?: number })?.statusCode;
  if (statusCode && statusCode >= 400 && statusCode < 500) {
    // fastify's own client errors: malformed JSON, unsupported media type, ...
    const detail = (exception as Error).message;
    return { type: TYPE_BASE + 'bad-request', title: 'Bad request', status: statusCode, detail, errors: [{ path: BODY_PATH, message: detail }] };
  }
  if (databaseUnavailable(exception)) {
    return { type: TYPE_BASE + 'database-unavailable', title: 'Database unavailable', status: 503, detail: 'the database cannot be reached; retry shortly' };
  }
  return { type: TYPE_BASE + 'internal', title: 'Internal error', status: 500, detail: 'the service could not complete the request' };
}

/** Seconds a client should wait before retrying a 503 (the pool reconnects on the next request). */
export const RETRY_AFTER_SECONDS = 2;

/**
 * PostgreSQL error classes 08 (connection exception) and 57P (operator intervention: terminated, shutting down,
 * starting up), and the socket errors of a server that is gone: the request may succeed on retry.
 */
const UNAVAILABLE_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENOTFOUND', 'EAI_AGAIN']);
const UNAVAILABLE_MESSAGES = /Connection terminated|connection error and is not queryable|timeout exceeded when trying to connect|Client was closed and is not queryable|terminating connection|the database system is (starting up|shutting down|in recovery mode)/i;

export function databaseUnavailable(exception: unknown): boolean {
  for (let e = exception as { code?: unknown; message?: unknown; driverError?: unknown; errors?: unknown[]; cause?: unknown } | undefined, depth = 0; e && depth < 4; depth++) {
    const code = typeof e.code === 'string' ? e.code : '';
    if (code.startsWith('08') || code.startsWith('57P') || UNAVAILABLE_CODES.has(code)) return true;
    if (typeof e.message === 'string' && UNAVAILABLE_MESSAGES.test(e.message)) return true;
    if (Array.isArray(e.errors) && e.errors.some((x) => databaseUnavailable(x))) return true; // AggregateError of a multi-address connect
    e = (e.driverError ?? e.cause) as typeof e;
  }
  return false;
}

/**
 * Webhook endpoints (admin-managed) and the delivery of record events to them, signed per the Standard Webhooks
 * specification. A delivery is a queue job per (event, endpoint): the same webhook-id and body on every attempt,
 * retried with backoff (queue/backoff.ts) or after the receiver's Retry-After, given up after the last attempt; a
 * 410 Gone disables the endpoint. Every attempt is recorded (queue.webhook_attempts) and listed to admins.
 */
import { Inject, Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { request as httpRequest, type IncomingMessage } from 'node:http';
import { request as httpsRequest } from 'node:https';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { CLOCK, type Clock } from '../infra/clock';
import { Database, type Queryer } from '../infra/database/database.service';
import { ValidationProblem, notFound, validate } from '../infra/http/problem';
import { retryAfterMs, retryDelayMs, WEBHOOK_MAX_ATTEMPTS } from '../queue/backoff';
import { QueueService, type Job, type JobOutcome } from '../queue/queue.service';
import { checkHost, guardedLookup, RefusedAddress } from './address-guard';
import { newSecret, signedHeaders } from './signature';

/** The events an endpoint may subscribe to */
export const WEBHOOK_EVENTS = [
  'revision.submitted',
  'revision.approved',
  'revision.rejected',
  'revision.withdrawn',
  'calculation.opened',
  'rule-set.adopted',
] as const;
export type WebhookEvent = (typeof WEBHOOK_EVENTS)[number];

/** A record event as the outbox trigger enqueues it: the thin payload every receiver gets */
export interface OutboxEvent {
  type: string;
  timestamp: string;
  data: Record<string, unknown>;
}

export const createEndpointSchema = z.strictObject({
  url: z.string().max(2000).url(),
  events: z.array(z.enum(WEBHOOK_EVENTS)).min(1).max(WEBHOOK_EVENTS.length).refine((e) => new Set(e).size === e.length, 'each event once'),
});

interface DeliveryPayload {
  endpointId: string;
  messageId: string;
  type: string;
  body: string;
}

/** Longest a receiver may take to answer [ms] */
const DELIVERY_TIMEOUT_MS = 15_000;
/** Longest Retry-After honoured [ms]: beyond it the message would outlive its retry window */
const MAX_RETRY_AFTER_MS = 24 * 3600_000;

export interface EndpointView {
  id: string;
  url: string;
  events: string[];
  enabled: boolean;
  disabledReason: string | null;
  disabledAt: string | null;
  rotatedAt: string | null;
  createdAt: string;
}

const iso = (v: unknown) => (v ? new Date(v as string).toISOString() : null);

@Injectable()
export class WebhooksService {
  constructor(
    private readonly db: Database,
    private readonly queue: QueueService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    queue.handle('webhook.deliver', (job) => this.deliver(job as Job<DeliveryPayload>));
  }

  /** Creates an endpoint; the answer carries its secret, the only time it is shown. */
  async create(body: unknown, actorId: string | null): Promise<EndpointView & { secret: string }> {
    const input = validate(createEndpointSchema, body);
    const url = new URL(input.url);
    if (url.protocol !== 'https:' && url.protocol !== 'http:') throw new ValidationProblem([{ path: 'url', message: 'an http:// or https:// address' }]);
    if (url.username || url.password) throw new ValidationProblem([{ path: 'url', message: 'credentials in the address are not kept secret; use the signature' }]);
    try {
      await checkHost(url.hostname, this.config.LEADLINE_WEBHOOK_ALLOW_PRIVATE);
    } catch (err) {
      const message = err instanceof RefusedAddress ? err.message : `${url.hostname} does not resolve`;
      throw new ValidationProblem([{ path: 'url', message }]);
    }
    const id = randomUUID();
    const secret = newSecret();
    await this.db.query(`INSERT INTO queue.webhook_endpoints (id, url, events, secret, created_by) VALUES ($1, $2, $3::text[], $4, $5)`, [
      id, url.toString(), input.events, secret, actorId,
    ]);
    return { ...(await this.get(id)), secret };
  }

  async list(): Promise<EndpointView[]> {
    const rows = await this.db.query(`SELECT * FROM queue.webhook_endpoints ORDER BY created_at, id`);
    return rows.map((r) => this.view(r));
  }

  async get(id: string): Promise<EndpointView> {
    if (!z.uuid().safeParse(id).success) throw notFound('webhook endpoint');
    const [row] = await this.db.query(`SELECT * FROM queue.webhook_endpoints WHERE id = $1`, [id]);
    if (!row) throw notFound('webhook endpoint');
    return this.view(row);
  }

  async disable(id: string): Promise<EndpointView> {
    await this.get(id);
    await this.db.query(`SELECT queue.disable_endpoint($1, $2)`, [id, 'disabled by an admin']);
    return this.get(id);
  }

  /** A new secret, shown once; deliveries from now on are signed with it. */
  async rotate(id: string): Promise<EndpointView & { secret: string }> {
    await this.get(id);
    const secret = newSecret();
    await this.db.query(`SELECT queue.rotate_endpoint_secret($1, $2)`, [id, secret]);
    return { ...(await this.get(id)), secret };
  }

  /** Delivery attempts to one endpoint, newest first. */
  async attempts(id: string, limit = 100) {
    await this.get(id);
    const rows = await this.db.query<Record<string, any>>(
      `SELECT message_id, event_type, attempt, attempted_at, status, error, outcome, next_attempt_at, duration_ms
         FROM queue.webhook_attempts WHERE endpoint_id = $1 ORDER BY attempted_at DESC, attempt DESC LIMIT $2`,
      [id, limit],
    );
    return rows.map((r) => ({
      messageId: r.message_id, type: r.event_type, attempt: r.attempt, attemptedAt: iso(r.attempted_at), status: r.status ?? null,
      error: r.error ?? null, outcome: r.outcome, nextAttemptAt: iso(r.next_attempt_at), durationMs: r.duration_ms,
    }));
  }

  /** Enqueues one delivery per enabled endpoint subscribed to the event (inside the fan-out's transaction). */
  async fanOut(q: Queryer, eventJobId: string, event: OutboxEvent): Promise<void> {
    if (!(WEBHOOK_EVENTS as readonly string[]).includes(event.type)) return;
    const endpoints = await q.query<{ id: string }>(`SELECT id FROM queue.webhook_endpoints WHERE enabled AND $1 = ANY (events) ORDER BY id`, [event.type]);
    // One message id per event: the same webhook-id on every attempt lets receivers drop duplicates
    const messageId = `msg_${eventJobId.replace(/-/g, '')}`;
    const body = JSON.stringify({ type: event.type, timestamp: event.timestamp, data: event.data });
    for (const { id } of endpoints) {
      const payload: DeliveryPayload = { endpointId: id, messageId, type: event.type, body };
      await this.queue.enqueue(q, 'webhook.deliver', payload, { dedupeKey: `webhook:${eventJobId}:${id}`, maxAttempts: WEBHOOK_MAX_ATTEMPTS });
    }
  }

  private async deliver(job: Job<DeliveryPayload>): Promise<JobOutcome> {
    const { endpointId, messageId, type, body } = job.payload;
    const [endpoint] = await this.db.query<{ url: string; secret: string; enabled: boolean }>(
      `SELECT url, secret, enabled FROM queue.webhook_endpoints WHERE id = $1`,
      [endpointId],
    );
    const started = this.clock.now();
    const record = (outcome: string, status: number | null, error: string | null, next: number | null) =>
      this.db.query(
        `INSERT INTO queue.webhook_attempts (endpoint_id, job_id, message_id, event_type, attempt, attempted_at, status, error, outcome, next_attempt_at, duration_ms)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11)`,
        [endpointId, job.id, messageId, type, job.attempts, new Date(started).toISOString(), status, error, outcome,
          next === null ? null : new Date(next).toISOString(), Math.max(0, Math.round(this.clock.now() - started))],
      );
    if (!endpoint?.enabled) {
      await record('gave-up', null, 'the endpoint is disabled', null);
      return { state: 'failed', error: 'the endpoint is disabled' };
    }
    const headers = signedHeaders(endpoint.secret, messageId, Math.floor(started / 1000), body);
    const answer = await this.post(endpoint.url, headers, body);
    if (answer.status !== null && answer.status >= 200 && answer.status < 300) {
      await record('delivered', answer.status, null, null);
      return { state: 'done', result: { status: answer.status } };
    }
    const error = answer.error ?? `the receiver answered ${answer.status}`;
    if (answer.status === 410) {
      await this.db.query(`SELECT queue.disable_endpoint($1, $2)`, [endpointId, 'the receiver answered 410 Gone']);
      await record('disabled', 410, error, null);
      return { state: 'failed', error };
    }
    if (job.attempts >= job.maxAttempts) {
      await record('gave-up', answer.status, error, null);
      return { state: 'failed', error };
    }
    const asked = retryAfterMs(answer.retryAfter, this.clock.now());
    const next = this.clock.now() + (asked !== null ? Math.min(asked, MAX_RETRY_AFTER_MS) : retryDelayMs(job.attempts));
    await record('retry', answer.status, error, next);
    return { state: 'retry', at: next, error };
  }

  /** One POST; never follows redirects; connects only to addresses the guard allows. */
  private post(url: string, headers: Record<string, string>, body: string): Promise<{ status: number | null; retryAfter?: string; error?: string }> {
    const target = new URL(url);
    const send = target.protocol === 'https:' ? httpsRequest : httpRequest;
    return new Promise((resolve) => {
      const req = send(
        target,
        {
          method: 'POST',
          headers: { ...headers, 'content-type': 'application/json', 'content-length': Buffer.byteLength(body), 'user-agent': 'Leadline-Webhooks/1' },
          lookup: guardedLookup(this.config.LEADLINE_WEBHOOK_ALLOW_PRIVATE) as never,
          timeout: DELIVERY_TIMEOUT_MS,
        },
        (res: IncomingMessage) => {
          res.resume();
          const retryAfter = typeof res.headers['retry-after'] === 'string' ? res.headers['retry-after'] : undefined;
          res.on('end', () => resolve({ status: res.statusCode ?? null, retryAfter }));
          res.on('error', () => resolve({ status: res.statusCode ?? null, retryAfter }));
        },
      );
      req.on('timeout', () => req.destroy(new Error(`no answer within ${DELIVERY_TIMEOUT_MS / 1000} s`)));
      req.on('error', (err) => resolve({ status: null, error: err.message }));
      req.end(body);
    });
  }

  private view(r: Record<string, any>): EndpointView {
    return {
      id: r.id, url: r.url, events: r.events, enabled: r.enabled, disabledReason: r.disabled_reason ?? null,
      disabledAt: iso(r.disabled_at), rotatedAt: iso(r.rotated_at), createdAt: iso(r.created_at)!,
    };
  }
}

/**
 * Notification mail (nodemailer over LEADLINE_SMTP_URL): reviewers when a revision awaits review, the author when
 * their revision is decided or commented on. A mail names the calculation, the product, the state and a link to the
 * page (LEADLINE_PUBLIC_URL); never design content (inputs, results or comment text). Each user chooses by their
 * preference (PUT /api/v1/me/notifications): mail goes to the preference's address, or to the account's own email
 * (users.email) when the preference names none or the user never set one; with mail off, or with neither address,
 * nothing is sent to them.
 * Mails are queue jobs, so a mail server that is down delays them and loses none.
 */
import { Inject, Injectable, OnApplicationShutdown } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database, type Queryer } from '../infra/database/database.service';
import { validate } from '../infra/http/problem';
import { QueueService, type Job } from '../queue/queue.service';
import type { OutboxEvent } from '../webhooks/webhooks.service';
import { USER_ACTIVE } from '../identities/identities.service';

interface MailPayload {
  to: string;
  subject: string;
  text: string;
}

export const mailPreferenceSchema = z.strictObject({
  email: z.email().max(320).nullable(),
  enabled: z.boolean(),
});

/** Words for each event a mail is sent for */
const MAILED: Record<string, { to: 'reviewers' | 'author'; state: string }> = {
  'revision.submitted': { to: 'reviewers', state: 'awaiting review' },
  'revision.approved': { to: 'author', state: 'approved' },
  'revision.rejected': { to: 'author', state: 'rejected' },
  'revision.commented': { to: 'author', state: 'commented on' },
};

@Injectable()
export class MailService implements OnApplicationShutdown {
  private transport: Transporter | null = null;

  constructor(
    private readonly db: Database,
    private readonly queue: QueueService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {
    queue.handle('mail.send', (job) => this.send(job as Job<MailPayload>));
  }

  /** The user's preference; `sendsTo` is where their mail goes now (their own address, or the account's email). */
  async preference(userId: string): Promise<{ email: string | null; enabled: boolean; sendsTo: string | null }> {
    const [row] = await this.db.query<{ email: string | null; enabled: boolean; account_email: string | null }>(
      `SELECT m.email, coalesce(m.enabled, true) AS enabled, u.email AS account_email
         FROM users u LEFT JOIN LATERAL (
           SELECT email, enabled FROM queue.mail_preferences WHERE user_id = u.id ORDER BY set_at DESC, id DESC LIMIT 1) m ON true
        WHERE u.id = $1`,
      [userId],
    );
    if (!row) return { email: null, enabled: true, sendsTo: null };
    return { email: row.email ?? null, enabled: row.enabled, sendsTo: row.enabled ? row.email ?? row.account_email ?? null : null };
  }

  async setPreference(userId: string, body: unknown): Promise<{ email: string | null; enabled: boolean; sendsTo: string | null }> {
    const input = validate(mailPreferenceSchema, body);
    await this.db.query(`INSERT INTO queue.mail_preferences (user_id, email, enabled) VALUES ($1, $2, $3)`, [userId, input.email, input.enabled]);
    return this.preference(userId);
  }

  /** Enqueues the mails one record event causes (inside the fan-out's transaction). */
  async fanOut(q: Queryer, eventJobId: string, event: OutboxEvent): Promise<void> {
    const rule = MAILED[event.type];
    const revisionId = event.data.revisionId;
    if (!rule || !this.config.LEADLINE_SMTP_URL || typeof revisionId !== 'string') return;
    const [rev] = await q.query<{ revision: number; calculation_id: string; title: string; code: string; name: string; author_id: string | null; actor_id: string | null }>(
      `SELECT r.revision, r.calculation_id, c.title, p.code, p.name, r.author_id, e.actor_id
         FROM revisions r JOIN calculations c ON c.id = r.calculation_id JOIN products p ON p.id = r.product_id
         LEFT JOIN events e ON e.id = $2::uuid
        WHERE r.id = $1`,
      [revisionId, event.data.eventId ?? null],
    );
    if (!rev) return;
    // Each active user's latest preference (none: mail on); the address set there, else the account's email; the one
    // who acted is not told of their own act
    const recipients = await q.query<{ user_id: string; email: string }>(
      `SELECT u.id AS user_id, coalesce(m.email, u.email) AS email
         FROM users u LEFT JOIN LATERAL (
           SELECT p.email, p.enabled FROM queue.mail_preferences p WHERE p.user_id = u.id ORDER BY p.set_at DESC, p.id DESC LIMIT 1) m ON true
        WHERE (CASE WHEN $3::text = 'reviewers' THEN 'reviewer' = ANY (u.roles) ELSE u.id = $1::uuid END)
          AND u.id IS DISTINCT FROM $2::uuid AND ${USER_ACTIVE('u')}
          AND coalesce(m.enabled, true) AND coalesce(m.email, u.email) IS NOT NULL
        ORDER BY u.id`,
      [rule.to === 'author' ? rev.author_id : null, rev.actor_id, rule.to],
    );
    const base = (this.config.LEADLINE_PUBLIC_URL ?? `http://127.0.0.1:${this.config.PORT}`).replace(/\/+$/, '');
    const link = rule.to === 'reviewers' ? `${base}/review/revisions/${revisionId}` : `${base}/design/calculations/${rev.calculation_id}`;
    const subject = `${rev.title} (${rev.code}), revision ${rev.revision}: ${rule.state}`;
    const text = [
      `Calculation: ${rev.title}`,
      `Product: ${rev.code} ${rev.name}`,
      `Revision: ${rev.revision}`,
      `State: ${rule.state}`,
      '',
      `Open it here: ${link}`,
      '',
      'You receive this mail because notifications are on for your Leadline account; turn them off with PUT /api/v1/me/notifications.',
    ].join('\n');
    for (const r of recipients) {
      await this.queue.enqueue(q, 'mail.send', { to: r.email, subject, text } satisfies MailPayload, { dedupeKey: `mail:${eventJobId}:${r.user_id}`, maxAttempts: 8 });
    }
  }

  private async send(job: Job<MailPayload>): Promise<void> {
    if (!this.config.LEADLINE_SMTP_URL) throw new Error('LEADLINE_SMTP_URL is not set');
    this.transport ??= createTransport(this.config.LEADLINE_SMTP_URL);
    await this.transport.sendMail({ from: this.config.LEADLINE_MAIL_FROM, to: job.payload.to, subject: job.payload.subject, text: job.payload.text });
  }

  onApplicationShutdown(): void {
    this.transport?.close();
  }
}

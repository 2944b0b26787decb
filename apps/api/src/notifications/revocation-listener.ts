/**
 * Token revocation honoured by every instance at once: a trigger on `token_revocations` sends
 * NOTIFY leadline_revocations when the revocation commits (migrations/20261205000200); each instance on PostgreSQL
 * listens and drops its cached token lookups on arrival. If the listening connection is lost, the cache's own
 * lifetime (two seconds) still bounds the delay. The embedded database is one process: its own revocation clears
 * its cache directly.
 */
import { Inject, Injectable, Logger, OnApplicationBootstrap, OnApplicationShutdown } from '@nestjs/common';
import { EventEmitter } from 'node:events';
import { Client } from 'pg';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database } from '../infra/database/database.service';
import { IdentitiesService } from '../identities/identities.service';

export const REVOCATION_CHANNEL = 'leadline_revocations';

@Injectable()
export class RevocationListener implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger('identities');
  private client: Client | null = null;
  private stopped = false;
  /** Emits 'revoked' (token id) after the cache was cleared: what tests wait on */
  readonly events = new EventEmitter();

  constructor(
    private readonly db: Database,
    private readonly identities: IdentitiesService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  async onApplicationBootstrap(): Promise<void> {
    if (this.db.embedded || !this.config.DATABASE_URL) return;
    const client = new Client({ connectionString: this.config.DATABASE_URL });
    client.on('error', (err) => {
      this.logger.warn(`revocation listener lost its connection (${err.message}); revoked tokens expire from the cache within 2 s`);
      if (this.client === client) this.client = null;
    });
    client.on('notification', (n) => {
      if (n.channel !== REVOCATION_CHANNEL) return;
      this.identities.forgetCachedTokens();
      this.events.emit('revoked', n.payload ?? '');
    });
    try {
      await client.connect();
      await client.query(`LISTEN ${REVOCATION_CHANNEL}`);
      if (this.stopped) await client.end();
      else this.client = client;
    } catch (err) {
      this.logger.warn(`revocation listener could not connect (${(err as Error).message})`);
      await client.end().catch(() => undefined);
    }
  }

  async onApplicationShutdown(): Promise<void> {
    this.stopped = true;
    const client = this.client;
    this.client = null;
    await client?.end().catch(() => undefined);
  }
}

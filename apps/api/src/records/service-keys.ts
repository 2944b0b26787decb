/**
 * The record key of this service (record-key.ts) and its one registration in the database: the first start writes
 * the key's id and the SHA-256 of the service credential into service_keys; a start with another key is refused,
 * since every sealed link and every keyed token hash of the database would stop verifying.
 */
import { Inject, Injectable, Logger } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database } from '../infra/database/database.service';
import { RecordKey } from './record-key';

@Injectable()
export class ServiceKeys {
  private readonly logger = new Logger('records');
  readonly key: RecordKey;
  private registered: Promise<string> | null = null;

  constructor(
    private readonly db: Database,
    @Inject(APP_CONFIG) config: AppConfig,
  ) {
    this.key = RecordKey.load(config.LEADLINE_RECORD_KEY_FILE, config.LEADLINE_DATA_DIR);
    const { origin, path } = this.key.source;
    if (origin === 'generated' && config.DATABASE_URL) {
      this.logger.warn(`no LEADLINE_RECORD_KEY_FILE: generated the record key ${path}; keep a copy outside this host, or give a key file`);
    } else if (origin === 'generated') this.logger.log(`generated the record key ${path}`);
  }

  /** The service's credential for the record functions, once the database has it registered under this key. */
  serviceCredential(): Promise<string> {
    this.registered ??= this.register().catch((err) => {
      this.registered = null;
      throw err;
    });
    return this.registered;
  }

  private async register(): Promise<string> {
    const [row] = await this.db.query<{ key_id: string; credential_digest: string }>(`SELECT key_id, credential_digest FROM leadline_register_service($1, $2)`, [
      this.key.keyId, this.key.serviceCredentialDigest,
    ]);
    if (!row || row.key_id !== this.key.keyId || row.credential_digest !== this.key.serviceCredentialDigest) {
      throw new Error(
        `this database's records are sealed with another record key (key id ${row?.key_id ?? 'unknown'}, this service's ${this.key.keyId}): ` +
          `start with the LEADLINE_RECORD_KEY_FILE it was written with${this.key.source.path ? ` (not ${this.key.source.path})` : ''}`,
      );
    }
    return this.key.serviceCredential;
  }
}

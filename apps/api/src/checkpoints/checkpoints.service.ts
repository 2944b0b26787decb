/**
 * Signed checkpoints: the service signs { product, seq, head hash, time } of a product's chain with an Ed25519
 * key kept outside the database (the idea of a certificate-transparency signed tree head). Whoever keeps a
 * checkpoint (a printed report, a decision's response, a log) can later ask whether the chain still contains
 * that link with that hash: a chain rewound or rewritten by someone who can write the database, but does not
 * hold the key, no longer matches what was signed. Every key that signed is kept in the signing-key history
 * (table signing_keys, migrations/20261204230100) with the time it signs from; a start with a key other than the
 * latest one is refused unless LEADLINE_SIGNING_KEY_ROTATE is set, so a lost key is never silently replaced.
 */
import { Inject, Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { createPublicKey, verify as verifySignature } from 'node:crypto';
import canonicalize from 'canonicalize';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database } from '../infra/database/database.service';
import { notFound, ProblemError, validate } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { TS_TEXT } from '../records/chain';
import { RecordStore, type ChainVerification } from '../records/record-store';
import { ServiceKeys } from '../records/service-keys';
import { SigningKey } from './signing-key';

export const CHECKPOINT_ALGORITHM = 'Ed25519';

export const checkpointSchema = z.strictObject({
  productId: z.string().uuid(),
  seq: z.number().int().min(1),
  headHash: z.string().regex(/^[0-9a-f]{64}$/, 'a SHA-256 hash, 64 lower-case hex digits'),
  time: z.string().min(1).max(40),
  algorithm: z.literal(CHECKPOINT_ALGORITHM).optional(),
  keyId: z.string().regex(/^[0-9a-f]{64}$/).optional(),
  signature: z.string().min(1).max(200).describe('base64 Ed25519 signature over the canonical JSON of the signed fields'),
});

export type Checkpoint = z.output<typeof checkpointSchema> & { algorithm: typeof CHECKPOINT_ALGORITHM; keyId: string };

/**
 * The bytes that are signed: RFC 8785 canonical JSON of the checkpoint's fields, tagged so a checkpoint signature
 * can never be mistaken for a signature over anything else.
 */
export function signedText(c: { productId: string; seq: number; headHash: string; time: string }): string {
  return canonicalize({ type: 'leadline-checkpoint', productId: c.productId, seq: c.seq, headHash: c.headHash, time: c.time }) as string;
}

export interface CheckpointVerification {
  /** the signature is ours and the current chain still contains that link with that hash, every link up to it intact */
  valid: boolean;
  signatureValid: boolean;
  /** the checkpoint names our key (false: signed by another key, or a key this service no longer holds) */
  keyMatches: boolean;
  /** a link with that seq and that hash is in the chain, at or below its current head */
  linkPresent: boolean;
  storedHash: string | null;
  currentHead: { seq: number; hash: string | null } | null;
  /** the links 1..seq recomputed (GET /products/:id/verify checks the rest: the head and the derived tables) */
  chain: ChainVerification | null;
  reason: string | null;
}

@Injectable()
export class CheckpointsService implements OnModuleInit {
  private readonly logger = new Logger('checkpoints');
  readonly key: SigningKey;
  private readonly embedded: boolean;
  private readonly rotate: boolean;

  constructor(
    private readonly db: Database,
    private readonly records: RecordStore,
    private readonly keys: ServiceKeys,
    @Inject(APP_CONFIG) config: AppConfig,
  ) {
    this.key = SigningKey.load(config.LEADLINE_SIGNING_KEY_FILE, config.LEADLINE_DATA_DIR);
    this.embedded = !config.DATABASE_URL;
    this.rotate = config.LEADLINE_SIGNING_KEY_ROTATE;
  }

  async onModuleInit(): Promise<void> {
    const [row] = await this.db.query<{ outcome: string; current_key_id: string }>(
      `SELECT outcome, current_key_id FROM leadline_register_signing_key($1, $2, $3, $4, $5)`,
      [await this.keys.serviceCredential(), this.key.keyId, CHECKPOINT_ALGORITHM, this.key.publicKeyPem, this.rotate],
    );
    if (row.outcome === 'mismatch') {
      throw new Error(
        `the checkpoint signing key ${row.current_key_id} signed this database's earlier checkpoints, but the configured key is ${this.key.keyId}` +
          `${this.key.source.path ? ` (${this.key.source.path})` : ''}: restore that key (LEADLINE_SIGNING_KEY_FILE), or set LEADLINE_SIGNING_KEY_ROTATE=true ` +
          'to rotate to the new key (earlier checkpoints keep verifying against the history at GET /api/v1/checkpoints/public-key)',
      );
    }
    if (row.outcome === 'rotated') this.logger.warn(`rotated the checkpoint signing key to ${this.key.keyId} (LEADLINE_SIGNING_KEY_ROTATE)`);
    const { origin, path } = this.key.source;
    if (origin === 'memory') this.logger.warn('checkpoints are signed with a key held in memory only (in-memory data folder): they cannot be verified after a restart');
    else if (origin === 'generated' && !this.embedded) {
      this.logger.warn(`no LEADLINE_SIGNING_KEY_FILE: generated the checkpoint signing key ${path}; keep a copy outside this host, or give a key file`);
    } else if (origin === 'generated') this.logger.log(`generated the checkpoint signing key ${path}`);
  }

  /** Signs a link of a product's chain. */
  sign(productId: string, seq: number, headHash: string, time: string): Checkpoint {
    const fields = { productId, seq, headHash, time };
    return { ...fields, algorithm: CHECKPOINT_ALGORITHM, keyId: this.key.keyId, signature: this.key.sign(signedText(fields)) };
  }

  /**
   * Signs the product's current head, at the database's time, only when the chain up to it verifies (hashes, MACs,
   * meaning and derived tables): a checkpoint is never signed over a forged or broken link (409 naming it).
   */
  async signHead(productId: string, time?: string): Promise<Checkpoint> {
    const rows = await this.db.query<{ seq: string; hash: string; now: string }>(
      `SELECT seq, hash, ${TS_TEXT('now()')} AS now FROM chain_heads WHERE product_id = $1`,
      [checkUuid(productId, 'product')],
    );
    if (rows.length === 0) throw notFound(`product ${productId}`);
    await this.requireValid(productId, Number(rows[0].seq), rows[0].hash);
    return this.sign(productId, Number(rows[0].seq), rows[0].hash, time ?? rows[0].now);
  }

  /**
   * The checkpoint after a decision: its event is the head it signs, once the chain up to it verifies. The decision is
   * committed already, so a chain that does not verify gives no checkpoint (null, logged) rather than an error.
   */
  async afterDecision(productId: string, seq: number, hash: string, time: string): Promise<Checkpoint | null> {
    try {
      await this.requireValid(productId, seq, hash);
    } catch (err) {
      if (!(err instanceof ProblemError)) throw err;
      this.logger.error(`no checkpoint after the decision at link ${seq} of product ${productId}: ${err.message}`);
      return null;
    }
    const checkpoint = this.sign(productId, seq, hash, time);
    this.logger.log(`checkpoint ${JSON.stringify(checkpoint)}`);
    return checkpoint;
  }

  /** Refuses (409, naming the first bad link) to sign a head whose chain does not verify. */
  private async requireValid(productId: string, seq: number, hash: string): Promise<void> {
    const refuse = (v: ChainVerification) => {
      const at = v.firstBrokenLink;
      return new ProblemError(409, 'Chain does not verify', `no checkpoint is signed over a chain that does not verify: ${at ? `link ${at.seq} (${at.kind} ${at.id}): ${at.reason}` : `link ${seq} is not in the chain`}`, {
        firstBrokenLink: at ?? null,
      });
    };
    const full = await this.records.verify(productId);
    if (!full.valid) throw refuse(full);
    if (full.links === seq && full.headHash === hash) return;
    const prefix = await this.records.verify(productId, undefined, seq);
    if (!prefix.valid || prefix.headHash !== hash) throw refuse(prefix);
  }

  /** Every key that signed checkpoints here, oldest first, each valid from its time until the next one's. */
  async history(): Promise<{ seq: number; keyId: string; algorithm: string; publicKey: string; validFrom: string; validUntil: string | null; hash: string }[]> {
    const rows = await this.db.query<{ seq: number; key_id: string; algorithm: string; public_key: string; valid_from: string; hash: string }>(
      `SELECT seq, key_id, algorithm, public_key, ${TS_TEXT('valid_from')} AS valid_from, hash FROM signing_keys ORDER BY seq`,
    );
    return rows.map((r, i) => ({
      seq: Number(r.seq), keyId: r.key_id, algorithm: r.algorithm, publicKey: r.public_key, validFrom: r.valid_from, validUntil: rows[i + 1]?.valid_from ?? null, hash: r.hash,
    }));
  }

  async verify(body: unknown): Promise<CheckpointVerification> {
    const c = validate(checkpointSchema, body);
    // the key the checkpoint names (the current one when it names none), from the signing-key history
    const keyId = c.keyId ?? this.key.keyId;
    // (the first key also covers the checkpoints it signed before the history was kept)
    const known = (await this.history()).find((k) => k.keyId === keyId && (k.seq === 1 || c.time >= k.validFrom) && (k.validUntil === null || c.time < k.validUntil));
    const signatureValid = known ? verifyWith(known.publicKey, signedText(c), c.signature) : false;
    const keyMatches = known !== undefined;
    const head = await this.db.query<{ seq: string; hash: string }>(`SELECT seq, hash FROM chain_heads WHERE product_id = $1`, [c.productId]);
    if (head.length === 0) {
      return { valid: false, signatureValid, keyMatches, linkPresent: false, storedHash: null, currentHead: null, chain: null, reason: 'the product has no chain here' };
    }
    const currentHead = { seq: Number(head[0].seq), hash: head[0].hash || null };
    const [link] = await this.db.query<{ hash: string }>(
      `SELECT hash FROM revisions WHERE product_id = $1 AND seq = $2 UNION ALL SELECT hash FROM events WHERE product_id = $1 AND seq = $2`,
      [c.productId, c.seq],
    );
    const storedHash = link?.hash ?? null;
    const linkPresent = storedHash === c.headHash && c.seq <= currentHead.seq;
    const chain = linkPresent ? await this.records.verify(c.productId, undefined, c.seq) : null;
    const reason = !signatureValid
      ? !keyMatches
        ? 'the checkpoint names a key that is not in this service\'s signing-key history for its time'
        : 'the signature does not verify with the key it names'
      : !keyMatches
        ? 'the checkpoint names another signing key'
        : storedHash === null || c.seq > currentHead.seq
          ? `the chain no longer contains link ${c.seq} (its head is at ${currentHead.seq}): it was rewound`
          : storedHash !== c.headHash
            ? `link ${c.seq} of the chain now has another hash: the chain was rewritten`
            : chain && !chain.valid
              ? `the chain contains the link but a link up to it does not verify: ${chain.firstBrokenLink?.reason}`
              : null;
    return { valid: reason === null, signatureValid, keyMatches, linkPresent, storedHash, currentHead, chain, reason };
  }
}

/** An Ed25519 signature checked against a public key (SPKI PEM); malformed input is simply false. */
function verifyWith(publicKeyPem: string, data: string, signature: string): boolean {
  try {
    return verifySignature(null, Buffer.from(data, 'utf8'), createPublicKey(publicKeyPem), Buffer.from(signature, 'base64'));
  } catch {
    return false;
  }
}

/**
 * Appends records to a product's chain inside a transaction and reads them back.
 * The chain head row is locked FOR UPDATE, so appends to one product are serialized and every link
 * names the true previous hash; heads are found by primary key, never by scanning history.
 * The service is the one writer of links (link format 3): it computes each link's hash and its MAC with the record
 * key (record-key.ts, never stored in the database) and hands both to a SECURITY DEFINER function
 * (migrations/20261204230000) that checks the acting credential and the workflow's invariants, inserts the link and
 * moves the head. The runtime role has no INSERT or UPDATE on the record tables.
 */
import { Injectable, OnModuleInit } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import type { Actor, EventType, Finding, Verdict } from '@leadline/contracts';
import { Database, PG_NO_DATA_FOUND, pgErrorCode, type Queryer } from '../infra/database/database.service';
import { notFound, ProblemError } from '../infra/http/problem';
import { contentDigest, LINK_VERSION, linkHash, TS_TEXT, type EventLink, type RevisionLink } from './chain';
import { ServiceKeys } from './service-keys';
import { MeaningState, type MeaningRules } from './meaning';
import { ruleSetDefinitionSchema } from '@leadline/rules';
import { SEALED_LINK_VERSION } from './chain';

export interface ChainCursor {
  seq: number;
  hash: string | null;
  /** Transaction time (server clock), exact text */
  now: string;
}

export interface RevisionSubmission {
  input: unknown;
  normalized: unknown;
  evaluation: unknown;
  findings: readonly Finding[];
  verdict: Verdict;
  engineVersion: string;
  ruleSetVersion: string;
  note: string | null;
}

/** A submission with its JSON texts and content digest computed ahead, outside the chain lock. */
export interface PreparedSubmission extends RevisionSubmission {
  json: { input: string; normalized: string; evaluation: string; findings: string };
  content: string;
}

export function prepareSubmission(s: RevisionSubmission): PreparedSubmission {
  const json = {
    input: JSON.stringify(s.input),
    normalized: JSON.stringify(s.normalized),
    evaluation: JSON.stringify(s.evaluation),
    findings: JSON.stringify(s.findings),
  };
  return Object.assign({}, s, { json, content: contentDigest(json) }); // as { ...s, json, content }, without Node 20's slow spread path
}

/**
 * The acting user as the controllers pass it: an Actor, optionally carrying the id of the bearer token used
 * (non-enumerable, see infra/http/actor.ts, so it never leaks into a stored or returned actor object).
 */
export type Acting = Actor & { readonly tokenId?: string | null; readonly credential?: string | null };

/** The actor as stored and hashed ({ id, name } only), and the token id it acted with. */
export function splitActing(a: Acting | null): { actor: Actor | null; tokenId: string | null } {
  return a ? { actor: { id: a.id, name: a.name }, tokenId: a.tokenId ?? null } : { actor: null, tokenId: null };
}

/** SQLSTATE raised by leadline_append_revision when the submitter does not own the calculation. */
export const PG_NOT_OWNER = 'LL403';

/**
 * A refusal by one of the record functions, as an HTTP problem. The service checks the same rules first and answers
 * with its own words; these arise only when a request races another or a caller bypasses the service.
 */
export function functionRefusal(err: unknown): ProblemError | null {
  const code = pgErrorCode(err);
  const message = String((err as { message?: string })?.message ?? '').replace(/^leadline: /, '');
  if (code === 'LL401') return new ProblemError(401, 'Authentication required', 'the bearer token is unknown or revoked, or has expired');
  if (code === 'LL403') return new ProblemError(403, 'Not permitted', message);
  if (code === 'LL409') return new ProblemError(409, 'Conflict with the record', message);
  if (code === 'LL422') return new ProblemError(422, 'Refused by the record', message);
  if (code === PG_NO_DATA_FOUND) return notFound(message);
  return null;
}

/** Links per verification batch: bounded memory (a revision link carries its stored content, ~12 KB). */
export const VERIFY_BATCH = 256;

export interface AppendedRevision {
  id: string;
  revision: number;
  hash: string;
  previousHash: string | null;
  createdAt: string;
}

/** A row of leadline_lock_head: the head's seq, its hash ('' before the first link) and the transaction's time. */
interface HeadRow {
  seq: string;
  hash: string;
  now: string;
}

function cursorOf(row: HeadRow): ChainCursor {
  return { seq: Number(row.seq), hash: row.hash === '' ? null : row.hash, now: row.now };
}

@Injectable()
export class RecordStore implements OnModuleInit {
  constructor(
    readonly db: Database,
    readonly keys: ServiceKeys,
  ) {}

  /** Refuses to start when the database names another record key (docs/reliability.md, "Threat model"). */
  async onModuleInit(): Promise<void> {
    await this.keys.serviceCredential();
  }

  /** The credential a write is made with: the acting user's token hash, or the service's own when it acts by itself. */
  private async credentialOf(acting: Acting | null): Promise<string> {
    return acting?.credential ?? (await this.keys.serviceCredential());
  }

  /** Locks the product's chain head for the rest of the transaction. */
  async lockHead(q: Queryer, productId: string): Promise<ChainCursor | null> {
    const rows = await q.query<HeadRow>(`SELECT seq, hash, now FROM leadline_lock_head($1)`, [productId]);
    return rows.length === 0 ? null : cursorOf(rows[0]);
  }

  /**
   * Locks the chain head of a calculation's product for the rest of the transaction, found through the calculation
   * in the same statement: the product and the cursor, or null when there is no such calculation.
   */
  async lockHeadOfCalculation(q: Queryer, calculationId: string): Promise<{ productId: string; cursor: ChainCursor } | null> {
    const rows = await q.query<HeadRow & { product_id: string }>(
      `SELECT c.product_id, h.seq, h.hash, h.now FROM calculations c CROSS JOIN LATERAL leadline_lock_head(c.product_id) h WHERE c.id = $1`,
      [calculationId],
    );
    return rows.length === 0 ? null : { productId: rows[0].product_id, cursor: cursorOf(rows[0]) };
  }

  /** Runs a record function call; its refusals become HTTP problems. */
  private async call(q: Queryer, sql: string, params: unknown[]): Promise<void> {
    try {
      await q.query(sql, params);
    } catch (err) {
      throw functionRefusal(err) ?? err;
    }
  }

  /**
   * Registers a product: its row, its chain head and the product-registered link, in one function call
   * (leadline_register_product), timed by the transaction's clock.
   */
  async registerProduct(q: Queryer, p: { id: string; code: string; name: string; description: string | null }, acting: Acting | null): Promise<EventLink & { hash: string }> {
    const [{ now }] = await q.query<{ now: string }>(`SELECT ${TS_TEXT('now()')} AS now`);
    const { actor, tokenId } = splitActing(acting);
    const link: EventLink = {
      kind: 'event', id: randomUUID(), productId: p.id, seq: 1, type: 'product-registered', calculationId: null, revisionId: null, actor,
      data: { code: p.code, name: p.name, description: p.description }, createdAt: now, linkVersion: LINK_VERSION, tokenId,
    };
    const hash = linkHash(link as unknown as Record<string, unknown>, null);
    const credential = await this.credentialOf(acting);
    await q.query(`SELECT leadline_register_product($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12)`, [
      credential, p.id, p.code, p.name, p.description, link.id, actor ? JSON.stringify(actor) : null, tokenId, JSON.stringify(link.data), now, hash, this.keys.key.linkMac(hash),
    ]).catch((err) => {
      throw (pgErrorCode(err) === '23505' ? err : functionRefusal(err)) ?? err;
    });
    return { ...link, hash };
  }

  /**
   * Appends one event to the chain through leadline_append_event (link format 3: hashed and sealed here, checked and
   * inserted there, the head moved with it); advances the cursor.
   */
  async appendEvent(
    q: Queryer,
    cursor: ChainCursor,
    e: { productId: string; type: EventType; calculationId: string | null; revisionId: string | null; actor: Acting | null; data: Record<string, unknown> },
  ): Promise<EventLink & { hash: string; previousHash: string | null }> {
    const { actor, tokenId } = splitActing(e.actor);
    const link: EventLink = {
      kind: 'event',
      id: randomUUID(),
      productId: e.productId,
      seq: cursor.seq + 1,
      type: e.type,
      calculationId: e.calculationId,
      revisionId: e.revisionId,
      actor,
      data: e.data,
      createdAt: cursor.now,
      linkVersion: LINK_VERSION,
      tokenId,
    };
    const hash = linkHash(link as unknown as Record<string, unknown>, cursor.hash);
    await this.call(q, `SELECT leadline_append_event($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14)`, [
      await this.credentialOf(e.actor), link.id, link.productId, link.seq, link.type, link.calculationId, link.revisionId,
      actor ? JSON.stringify(actor) : null, tokenId, JSON.stringify(link.data), link.createdAt, hash, cursor.hash, this.keys.key.linkMac(hash),
    ]);
    const previousHash = cursor.hash;
    cursor.seq = link.seq;
    cursor.hash = hash;
    return { ...link, hash, previousHash };
  }

  /**
   * Appends the next revision of a calculation and its submission event (leadline_append_revision): the head is
   * locked, the revision numbered under the lock, both links hashed and sealed here; the function checks that the
   * submitter owns the calculation, that the verdict follows from the findings, and moves the head.
   * Runs in the caller's transaction, or in one of its own when given the Database.
   * @param productId - null to read it from the calculation; when given, it must be the calculation's product
   * @throws 404 when there is no such calculation (or product)
   * @param cursor - when given (inside a transaction that already holds the head), it is advanced past the new links
   */
  async appendRevision(
    q: Queryer,
    productId: string | null,
    calculationId: string,
    s: PreparedSubmission,
    acting: Acting | null,
    cursor?: ChainCursor,
    known?: { readonly nextRevision: number },
  ): Promise<AppendedRevision> {
    if (q instanceof Database) return q.transaction((tq) => this.appendRevision(tq, productId, calculationId, s, acting, cursor, known));
    // With `known`, the caller found the product through the calculation and read its latest revision under this
    // head's lock (one statement less each; leadline_append_revision still refuses a product or number that does not follow)
    const trusted = known !== undefined && cursor !== undefined && productId !== null;
    let product = productId;
    if (!trusted) {
      const [calc] = await q.query<{ product_id: string }>(`SELECT product_id FROM calculations WHERE id = $1`, [calculationId]);
      if (!calc || (productId !== null && calc.product_id !== productId)) throw notFound(productId === null ? `calculation ${calculationId}` : `product ${productId}`);
      product = calc.product_id;
    }
    const head = cursor ?? (await this.lockHead(q, product as string));
    if (!head) throw notFound(`product ${product}`);
    const next = trusted
      ? known.nextRevision
      : Number((await q.query<{ next: number }>(`SELECT coalesce(max(revision), 0) + 1 AS next FROM revisions WHERE calculation_id = $1`, [calculationId]))[0].next);
    const { actor, tokenId } = splitActing(acting);
    const revision: RevisionLink = {
      kind: 'revision', id: randomUUID(), productId: product as string, calculationId, revision: next, seq: head.seq + 1, note: s.note,
      content: s.content, verdict: s.verdict, engineVersion: s.engineVersion, ruleSetVersion: s.ruleSetVersion, author: actor,
      createdAt: head.now, linkVersion: LINK_VERSION, tokenId,
    };
    const hash = linkHash(revision as unknown as Record<string, unknown>, head.hash);
    const event: EventLink = {
      kind: 'event', id: randomUUID(), productId: product as string, seq: head.seq + 2, type: 'revision-submitted', calculationId, revisionId: revision.id,
      actor, data: { note: s.note, revision: revision.revision, revisionHash: hash, verdict: s.verdict }, createdAt: head.now, linkVersion: LINK_VERSION, tokenId,
    };
    const eventHash = linkHash(event as unknown as Record<string, unknown>, hash);
    try {
      await q.query(
        `SELECT leadline_append_revision($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16, $17, $18, $19, $20, $21, $22, $23)`,
        [await this.credentialOf(acting), calculationId, revision.id, revision.revision, revision.seq, s.note, s.json.input, s.json.normalized,
          s.json.evaluation, s.json.findings, s.verdict, s.engineVersion, s.ruleSetVersion, actor ? JSON.stringify(actor) : null, tokenId,
          head.now, hash, head.hash, this.keys.key.linkMac(hash), event.id, JSON.stringify(event.data), eventHash, this.keys.key.linkMac(eventHash)],
      );
    } catch (err) {
      if (pgErrorCode(err) === PG_NOT_OWNER) {
        throw new ProblemError(403, 'Not the owner of this calculation', 'only the author who owns a calculation may add revisions to it (an admin can reassign it)');
      }
      throw functionRefusal(err) ?? err;
    }
    const previousHash = head.hash;
    head.seq = event.seq;
    head.hash = eventHash;
    return { id: revision.id, revision: revision.revision, hash, previousHash, createdAt: head.now };
  }

  /**
   * Recomputes a product's chain from its stored rows and names the first mismatch: a broken link (gap, wrong
   * previous hash, content changed, a column that contradicts the hashed record, records missing after the head)
   * or a row of a table derived from the chain that the chain does not bear out (the products row against its
   * product-registered event, calculations against their calculation-opened events, review closures against the
   * decision and withdrawal events, in both directions).
   *
   * Streamed: the head is read once at the start and the links up to that seq are read in batches of
   * VERIFY_BATCH, each batch its own statement, yielding to the event loop between batches. Memory stays bounded
   * whatever the chain's length, and on the embedded database the one connection is free between batches.
   * Consistency: links are immutable and a head only moves in the transaction that inserted its links, so every
   * link up to the head seen at the start is committed and cannot change while we read; later appends lie beyond
   * that seq and are simply not part of this check.
   * @param upTo - check only the links 1..upTo, hash by hash (the prefix a checkpoint signed); skips the head and
   *   derived-table checks
   */
  async verify(productId: string, batch = VERIFY_BATCH, upTo?: number): Promise<ChainVerification> {
    const head = await this.db.query<{ seq: string; hash: string }>(`SELECT seq, hash FROM chain_heads WHERE product_id = $1`, [productId]);
    if (head.length === 0) throw notFound(`product ${productId}`);
    const headSeq = upTo === undefined ? Number(head[0].seq) : Math.min(upTo, Number(head[0].seq));
    const [product] = await this.db.query<{ code: string; name: string; description: string | null; created_by: string | null }>(
      `SELECT code, name, description, created_by FROM products WHERE id = $1`,
      [productId],
    );

    let previous: string | null = null;
    let expected = 1;
    let last: { seq: number; kind: 'revision' | 'event'; id: string } | null = null;
    let sealedFrom: number | null = null;
    const meaning = new MeaningState(await this.meaningRules(productId, headSeq));
    for (let lo = 0; lo < headSeq; lo += batch) {
      const hi = Math.min(lo + batch, headSeq);
      const revisions = await this.db.query<RevisionRow>(
        `SELECT id, product_id, calculation_id, revision, seq, note, input::text AS input, normalized::text AS normalized,
                evaluation::text AS evaluation, findings::text AS findings, verdict, engine_version, rule_set_version, author_id, author,
                ${TS_TEXT('created_at')} AS created_at, hash, previous_hash, link_version, token_id, mac
           FROM revisions WHERE product_id = $1 AND seq > $2 AND seq <= $3 ORDER BY seq`,
        [productId, lo, hi],
      );
      const events = await this.db.query<EventRow>(
        `SELECT id, product_id, seq, type, calculation_id, revision_id, actor_id, actor, data, ${TS_TEXT('created_at')} AS created_at,
                hash, previous_hash, link_version, token_id, mac
           FROM events WHERE product_id = $1 AND seq > $2 AND seq <= $3 ORDER BY seq`,
        [productId, lo, hi],
      );
      const links = mergeBySeq(revisions, events);
      for (const l of links) {
        const at = { seq: l.seq, kind: l.kind, id: l.row.id };
        if (l.seq !== expected) return broken(productId, expected - 1, { ...at, reason: `sequence gap: expected link ${expected}, found ${l.seq}` });
        if (l.row.previous_hash !== previous) return broken(productId, expected, { ...at, reason: 'previous hash does not match the prior link' });
        const version = Number(l.row.link_version ?? 1);
        if (version !== 1 && version !== 2 && version !== LINK_VERSION) return broken(productId, expected, { ...at, reason: `unknown link format ${version}` });
        const body = l.kind === 'revision' ? revisionLinkOf(l.row as RevisionRow) : eventLinkOf(l.row as EventRow);
        if (linkHash(body as unknown as Record<string, unknown>, previous) !== l.row.hash) return broken(productId, expected, { ...at, reason: 'content does not match its hash' });
        if (version >= SEALED_LINK_VERSION) {
          sealedFrom ??= l.seq;
          if (!this.keys.key.verifyLinkMac(l.row.hash, l.row.mac)) {
            return broken(productId, expected, { ...at, reason: "the link's MAC does not verify with this service's record key: the service did not write it" });
          }
        } else if (sealedFrom !== null) {
          return broken(productId, expected, { ...at, reason: `an unsealed link of format ${version} after the sealed links from ${sealedFrom} on` });
        }
        const contradiction = columnContradiction(l, version);
        if (contradiction) return broken(productId, expected, { ...at, reason: contradiction });
        const wrong = meaning.check(meaningLinkOf(l));
        if (wrong) return broken(productId, expected, { ...at, reason: wrong });
        if (l.seq === 1) {
          const reason = registrationMismatch(l, product);
          if (reason) return broken(productId, expected, { seq: 1, kind: 'product', id: productId, reason });
        }
        previous = l.row.hash;
        last = at;
        expected++;
      }
      await new Promise<void>((resolve) => setImmediate(resolve));
    }
    if (upTo !== undefined) {
      // links 1..upTo only (a checkpoint's prefix): the head and the derived tables are not part of this check
      if (expected - 1 !== headSeq) return broken(productId, expected - 1, { seq: expected, kind: 'event', id: '', reason: `link ${expected} is missing` });
      return { productId, valid: true, links: headSeq, headHash: previous, firstBrokenLink: null };
    }
    const headHash = head[0].hash || null;
    if (expected - 1 !== headSeq || previous !== headHash) {
      return broken(productId, expected - 1, { seq: last?.seq ?? 0, kind: last?.kind ?? 'event', id: last?.id ?? '', reason: 'the chain head does not point at the last link (records missing)' });
    }
    const derived = await this.derivedMismatch(productId, headSeq);
    if (derived) return broken(productId, headSeq, derived);
    return { productId, valid: true, links: headSeq, headHash: previous, firstBrokenLink: null };
  }

  private readonly ruleSetValidity = new Map<string, boolean>();

  /** Whether a stored rule-set definition is valid (definitions are immutable, so the answer is kept). */
  async ruleSetValid(version: string, definition?: unknown): Promise<boolean> {
    const known = this.ruleSetValidity.get(version);
    if (known !== undefined) return known;
    if (definition === undefined) {
      const [row] = await this.db.query<{ definition: unknown }>(`SELECT definition FROM rule_sets WHERE version = $1`, [version]);
      if (!row) return false;
      definition = row.definition;
    }
    const parsed = ruleSetDefinitionSchema.safeParse(definition);
    const valid = parsed.success && parsed.data.version === version;
    this.ruleSetValidity.set(version, valid);
    return valid;
  }

  /** What the meaning check reads beyond the chain: deciders' roles, issuers of their tokens, valid rule sets. */
  private async meaningRules(productId: string, headSeq: number): Promise<MeaningRules> {
    // each decider as the identity record stood at the decision (the newest role and deactivation events before it;
    // users.roles for roles no event names, as leadline_user_roles reads them)
    const signers = await this.db.query<{ event_id: string; roles: string[]; active: boolean }>(
      `SELECT e.id AS event_id,
              ARRAY(SELECT r FROM unnest(ARRAY['author', 'reviewer', 'admin']) AS r WHERE COALESCE(
                (SELECT ce.type = 'role-granted' FROM identity_events ce WHERE ce.subject_user_id = u.id AND ce.type IN ('role-granted', 'role-revoked')
                    AND ce.data->>'role' = r AND ce.created_at <= e.created_at ORDER BY ce.seq DESC NULLS LAST, ce.created_at DESC, ce.id DESC LIMIT 1),
                r = ANY (u.roles))) AS roles,
              NOT COALESCE((SELECT ae.type = 'user-deactivated' FROM identity_events ae WHERE ae.subject_user_id = u.id
                  AND ae.type IN ('user-deactivated', 'user-reactivated') AND ae.created_at <= e.created_at
                ORDER BY ae.seq DESC NULLS LAST, ae.created_at DESC, ae.id DESC LIMIT 1), false) AS active
         FROM events e JOIN users u ON u.id = e.actor_id AND u.created_at <= e.created_at
        WHERE e.product_id = $1 AND e.seq <= $2 AND e.type IN ('approved', 'rejected')`,
      [productId, headSeq],
    );
    const tokens = await this.db.query<{ id: string; created_by: string | null }>(
      `SELECT t.id, t.created_by FROM tokens t WHERE t.id IN (SELECT e.token_id FROM events e WHERE e.product_id = $1 AND e.seq <= $2 AND e.type IN ('approved', 'rejected'))`,
      [productId, headSeq],
    );
    const sets = await this.db.query<{ version: string; definition: unknown }>(
      `SELECT s.version, s.definition FROM rule_sets s WHERE s.version IN (SELECT DISTINCT r.rule_set_version FROM revisions r WHERE r.product_id = $1 AND r.seq <= $2)`,
      [productId, headSeq],
    );
    const passkeys = await this.db.query<{ credential_id: string; user_id: string; public_key: string; rp_id: string; created_at: string }>(
      `SELECT k.credential_id, k.user_id, k.public_key, k.rp_id, ${TS_TEXT('k.created_at')} AS created_at FROM passkey_credentials k
        WHERE k.credential_id IN (SELECT e.data->'signature'->'passkey'->>'credentialId' FROM events e
                                   WHERE e.product_id = $1 AND e.seq <= $2 AND e.type IN ('approved', 'rejected') AND e.data->'signature'->>'method' = 'passkey')`,
      [productId, headSeq],
    );
    const keys = new Map(passkeys.map((k) => [k.credential_id, { userId: k.user_id, publicKey: k.public_key, rpId: k.rp_id, createdAt: k.created_at }]));
    const valid = new Set<string>();
    for (const r of sets) if (await this.ruleSetValid(r.version, r.definition)) valid.add(r.version);
    const signerAt = new Map(signers.map((u) => [u.event_id, { roles: u.roles, active: u.active }]));
    const issuers = new Map(tokens.map((t) => [t.id, t.created_by]));
    return { signerAt: (id) => signerAt.get(id) ?? null, tokenIssuer: (id) => issuers.get(id), ruleSetValid: (v) => valid.has(v), passkeyOf: (id) => keys.get(id) ?? null };
  }

  /**
   * Whether a stored event is one this service wrote: its hash matches its content and, from link format 3 on, its
   * MAC verifies. Review state is read only from such events (a closure pointing elsewhere closes nothing).
   */
  sealedEvent(row: EventRow): boolean {
    if (linkHash(eventLinkOf(row) as unknown as Record<string, unknown>, row.previous_hash) !== row.hash) return false;
    return Number(row.link_version ?? 1) < SEALED_LINK_VERSION || this.keys.key.verifyLinkMac(row.hash, row.mac);
  }

  /**
   * Tables derived from the chain, checked against it by set queries (one statement each, bounded output):
   * links stored beyond the current head, calculations without their calculation-opened event, closures without
   * the decision or withdrawal event they index, and such events without their closure. The earliest by seq wins.
   */
  private async derivedMismatch(productId: string, headSeq: number): Promise<BrokenLink | null> {
    const found: BrokenLink[] = [];
    const beyond = await this.db.query<{ seq: string; kind: 'revision' | 'event'; id: string }>(
      `SELECT x.seq, x.kind, x.id FROM chain_heads h CROSS JOIN LATERAL (
         (SELECT seq, 'revision' AS kind, id FROM revisions WHERE product_id = h.product_id AND seq > h.seq ORDER BY seq LIMIT 1)
         UNION ALL
         (SELECT seq, 'event' AS kind, id FROM events WHERE product_id = h.product_id AND seq > h.seq ORDER BY seq LIMIT 1)) x
        WHERE h.product_id = $1 ORDER BY x.seq LIMIT 1`,
      [productId],
    );
    if (beyond.length) found.push({ seq: Number(beyond[0].seq), kind: beyond[0].kind, id: beyond[0].id, reason: 'a link is stored beyond the chain head' });
    const calculation = await this.db.query<{ id: string }>(
      `SELECT c.id FROM calculations c
        WHERE c.product_id = $1 AND NOT EXISTS (
          SELECT 1 FROM events e WHERE e.calculation_id = c.id AND e.product_id = $1 AND e.type = 'calculation-opened'
             AND e.data->>'title' = c.title AND (e.actor->>'id') IS NOT DISTINCT FROM c.created_by::text AND e.created_at = c.created_at)
        ORDER BY c.created_at, c.id LIMIT 1`,
      [productId],
    );
    if (calculation.length) found.push({ seq: 0, kind: 'calculation', id: calculation[0].id, reason: 'the calculation row does not match its calculation-opened event' });
    const closure = await this.db.query<{ revision_id: string; seq: string | null }>(
      `SELECT c.revision_id, (SELECT e.seq FROM events e WHERE e.id = c.event_id) AS seq
         FROM revision_closures c JOIN revisions r ON r.id = c.revision_id
        WHERE r.product_id = $1 AND NOT EXISTS (
          SELECT 1 FROM events e WHERE e.id = c.event_id AND e.product_id = $1 AND e.revision_id = c.revision_id AND e.type = c.kind
             AND e.actor->>'id' = c.actor_id::text)
        LIMIT 1`,
      [productId],
    );
    if (closure.length) {
      found.push({ seq: Number(closure[0].seq ?? 0), kind: 'closure', id: closure[0].revision_id, reason: 'a review closure is not borne out by a decision or withdrawal event in the chain' });
    }
    const decision = await this.db.query<{ id: string; seq: string }>(
      `SELECT e.id, e.seq FROM events e
        WHERE e.product_id = $1 AND e.seq <= $2 AND e.type IN ('approved', 'rejected', 'withdrawn') AND NOT EXISTS (
          SELECT 1 FROM revision_closures c WHERE c.event_id = e.id AND c.revision_id = e.revision_id AND c.kind = e.type)
        ORDER BY e.seq LIMIT 1`,
      [productId, headSeq],
    );
    if (decision.length) found.push({ seq: Number(decision[0].seq), kind: 'event', id: decision[0].id, reason: 'a decision or withdrawal event has no review closure (or a second one for the same revision)' });
    return found.sort((a, b) => a.seq - b.seq)[0] ?? null;
  }
}

type Link = { seq: number; kind: 'revision'; row: RevisionRow } | { seq: number; kind: 'event'; row: EventRow };

/** Merges two seq-ordered lists into one. */
function mergeBySeq(revisions: RevisionRow[], events: EventRow[]): Link[] {
  const out: Link[] = [];
  let i = 0;
  let j = 0;
  while (i < revisions.length || j < events.length) {
    const r = revisions[i];
    const e = events[j];
    if (e === undefined || (r !== undefined && Number(r.seq) <= Number(e.seq))) out.push({ seq: Number(r.seq), kind: 'revision', row: revisions[i++] });
    else out.push({ seq: Number(e.seq), kind: 'event', row: events[j++] });
  }
  return out;
}

function meaningLinkOf(l: Link): Parameters<MeaningState['check']>[0] {
  if (l.kind === 'revision') {
    const r = l.row;
    return {
      kind: 'revision', id: r.id, calculationId: r.calculation_id, revision: Number(r.revision), verdict: r.verdict, ruleSetVersion: r.rule_set_version,
      findings: r.findings, actorId: (r.author as { id?: string } | null)?.id ?? null, tokenId: r.token_id ?? null, hash: r.hash,
    };
  }
  const e = l.row;
  return {
    kind: 'event', id: e.id, type: e.type, calculationId: e.calculation_id, revisionId: e.revision_id,
    actorId: (e.actor as { id?: string } | null)?.id ?? null, tokenId: e.token_id ?? null, data: e.data, createdAt: e.created_at,
  };
}

/** A stored column the services read that contradicts the hashed record (author_id, actor_id, token_id). */
function columnContradiction(l: Link, version: number): string | null {
  if (l.kind === 'revision') {
    const hashed = (l.row.author as { id?: string } | null)?.id ?? null;
    if ((l.row.author_id ?? null) !== hashed) return 'author_id does not match the hashed author';
  } else {
    const hashed = (l.row.actor as { id?: string } | null)?.id ?? null;
    if ((l.row.actor_id ?? null) !== hashed) return 'actor_id does not match the hashed actor';
  }
  if (version < 2 && (l.row.token_id ?? null) !== null) return 'a token id on a link whose format does not hash it';
  return null;
}

/** The products row must say what the chain's first link registered. */
function registrationMismatch(l: Link, product: { code: string; name: string; description: string | null; created_by: string | null } | undefined): string | null {
  if (l.kind !== 'event' || l.row.type !== 'product-registered') return 'the first link is not the product registration';
  const data = l.row.data as { code?: string; name?: string; description?: string | null };
  const actor = (l.row.actor as { id?: string } | null)?.id ?? null;
  if (!product || data.code !== product.code || data.name !== product.name || (data.description ?? null) !== product.description || actor !== product.created_by) {
    return 'the product row does not match its product-registered event';
  }
  return null;
}

export interface BrokenLink {
  seq: number;
  /** revision or event: a chain link; product, calculation, closure: a row of a table derived from the chain */
  kind: 'revision' | 'event' | 'product' | 'calculation' | 'closure';
  id: string;
  reason: string;
}

export interface ChainVerification {
  productId: string;
  valid: boolean;
  links: number;
  headHash: string | null;
  firstBrokenLink: BrokenLink | null;
}

function broken(productId: string, links: number, at: BrokenLink): ChainVerification {
  return { productId, valid: false, links, headHash: null, firstBrokenLink: at };
}

/** A revision row as read for the chain: the content columns as their stored JSON text. */
export interface RevisionRow {
  id: string;
  product_id: string;
  calculation_id: string;
  revision: number;
  seq: string;
  note: string | null;
  input: string;
  normalized: string;
  evaluation: string;
  findings: string;
  verdict: string;
  engine_version: string;
  rule_set_version: string;
  author: unknown;
  created_at: string;
  hash: string;
  previous_hash: string | null;
  /** read by verify (link format, the token id it hashes, the column four-eyes reads) */
  author_id?: string | null;
  link_version?: number | string;
  token_id?: string | null;
  mac?: string | null;
}

export interface EventRow {
  id: string;
  product_id: string;
  seq: string;
  type: string;
  calculation_id: string | null;
  revision_id: string | null;
  actor: unknown;
  data: unknown;
  created_at: string;
  hash: string;
  previous_hash: string | null;
  actor_id?: string | null;
  link_version?: number | string;
  token_id?: string | null;
  mac?: string | null;
}

export function revisionLinkOf(r: RevisionRow): RevisionLink {
  return {
    kind: 'revision',
    id: r.id,
    productId: r.product_id,
    calculationId: r.calculation_id,
    revision: Number(r.revision),
    seq: Number(r.seq),
    note: r.note,
    content: contentDigest({ input: r.input, normalized: r.normalized, evaluation: r.evaluation, findings: r.findings }),
    verdict: r.verdict,
    engineVersion: r.engine_version,
    ruleSetVersion: r.rule_set_version,
    author: r.author ?? null,
    createdAt: r.created_at,
    ...(Number(r.link_version ?? 1) >= 2 ? { linkVersion: Number(r.link_version), tokenId: r.token_id ?? null } : {}),
  };
}

export function eventLinkOf(e: EventRow): EventLink {
  return {
    kind: 'event',
    id: e.id,
    productId: e.product_id,
    seq: Number(e.seq),
    type: e.type,
    calculationId: e.calculation_id,
    revisionId: e.revision_id,
    actor: e.actor ?? null,
    data: e.data,
    createdAt: e.created_at,
    ...(Number(e.link_version ?? 1) >= 2 ? { linkVersion: Number(e.link_version), tokenId: e.token_id ?? null } : {}),
  };
}

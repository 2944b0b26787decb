/**
 * Rule-set versions: stored once, never edited. The service keeps them in memory (they are immutable)
 * and records every version it judges with, so a revision's rule-set version always resolves.
 * New submissions are judged by the latest adopted version (the built-in default until an admin adopts another);
 * another instance of a multi-instance deployment picks an adoption up within ADOPTION_REFRESH_MS.
 * Definitions are validated when stored and again when loaded: a stored definition that does not validate (written
 * around the service) is skipped and reported (GET /rule-sets lists it under `invalid`; asking for it answers 422),
 * never judged with and never a 5xx. Rule sets are stored and adopted only through the record functions
 * leadline_store_rule_set and leadline_adopt_rule_set (an admin's live token; an adoption is timed by the database).
 */
import { Injectable, Logger, OnModuleDestroy, OnModuleInit } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { BUILT_IN_RULE_SETS, DEFAULT_RULE_SET, ruleSetDefinitionSchema, type RuleSet } from '@leadline/rules';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode } from '../infra/database/database.service';
import { ProblemError, notFound, validate } from '../infra/http/problem';
import { LINK_VERSION, linkHash, TS_TEXT } from '../records/chain';
import { lockLedger, nextLink } from '../records/ledger';
import { functionRefusal, type Acting } from '../records/record-store';
import { ServiceKeys } from '../records/service-keys';

export interface StoredRuleSet {
  version: string;
  definition: RuleSet;
  createdAt: string;
}

export const ADOPTION_REFRESH_MS = 10_000;

export const adoptSchema = z.strictObject({ note: z.string().max(2000).optional() }).optional();

@Injectable()
export class RuleSetsService implements OnModuleInit, OnModuleDestroy {
  private readonly cache = new Map<string, StoredRuleSet>();
  private currentVersion = DEFAULT_RULE_SET.version;
  private timer: NodeJS.Timeout | null = null;
  private readonly logger = new Logger('rule-sets');
  /** adoptions whose link does not verify (logged once) */
  private readonly unsealed = new Set<string>();
  /** stored versions whose definition does not validate, with the first problem */
  private readonly rejected = new Map<string, string>();

  constructor(
    private readonly db: Database,
    private readonly keys: ServiceKeys,
  ) {}

  async onModuleInit(): Promise<void> {
    // Every built-in version, oldest first, so revisions judged under an earlier default still resolve
    const credential = await this.keys.serviceCredential();
    for (const builtIn of BUILT_IN_RULE_SETS) {
      await this.db.query(`SELECT leadline_store_rule_set($1, $2, $3, true)`, [credential, builtIn.version, JSON.stringify(builtIn)]);
    }
    for (const r of await this.list()) this.cache.set(r.version, r);
    await this.refreshAdoption();
    this.timer = setInterval(() => void this.refreshAdoption().catch(() => undefined), ADOPTION_REFRESH_MS);
    this.timer.unref();
  }

  onModuleDestroy(): void {
    if (this.timer) clearInterval(this.timer);
  }

  /**
   * The current set: the latest adoption in the adoption chain (by seq, at or below its head) whose link verifies (hash
   * and MAC: the service wrote it) and whose definition validates; before the chain began, the latest adoption made
   * before it; the default before any. A link that does not verify is skipped and logged, never judged with.
   */
  private async refreshAdoption(): Promise<void> {
    const rows = await this.db.query<{ id: string; version: string; adopted_by: string | null; note: string | null; adopted_at: string; seq: string; hash: string;
      previous_hash: string | null; mac: string | null }>(
      `SELECT a.id, a.version, a.adopted_by, a.note, ${TS_TEXT('a.adopted_at')} AS adopted_at, a.seq, a.hash, a.previous_hash, a.mac
         FROM rule_set_adoptions a JOIN ledger_heads h ON h.ledger = 'rule-adoption' AND a.seq <= h.seq
        ORDER BY a.seq DESC LIMIT 50`,
    );
    for (const r of rows) {
      const record = { kind: 'rule-adoption', id: r.id, version: r.version, adoptedBy: r.adopted_by, note: r.note, seq: Number(r.seq), createdAt: r.adopted_at, linkVersion: LINK_VERSION };
      if (linkHash(record, r.previous_hash) !== r.hash || !this.keys.key.verifyLinkMac(r.hash, r.mac)) {
        if (!this.unsealed.has(r.id)) this.logger.error(`adoption ${r.seq} of rule set ${JSON.stringify(r.version)} does not verify (hash or MAC) and is skipped`);
        this.unsealed.add(r.id);
        continue;
      }
      if (await this.load(r.version)) {
        this.currentVersion = r.version;
        return;
      }
    }
    const legacy = await this.db.query<{ version: string }>(
      `SELECT a.version FROM rule_set_adoptions a JOIN ledger_heads h ON h.ledger = 'rule-adoption'
        WHERE a.seq IS NULL AND a.adopted_at < h.started_at ORDER BY a.adopted_at DESC, a.id DESC LIMIT 50`,
    );
    for (const { version } of legacy) {
      if (await this.load(version)) {
        this.currentVersion = version;
        return;
      }
    }
    this.currentVersion = DEFAULT_RULE_SET.version;
  }

  /** Makes a stored version the one new submissions are judged by; the adoption is recorded, never edited. */
  async adopt(version: string, body: unknown, actor: Acting | null) {
    const input = validate(adoptSchema, body) ?? {};
    await this.get(version);
    const credential = await this.credentialOf(actor);
    try {
      await this.db.transaction(async (q) => {
        const cursor = await lockLedger(q, 'rule-adoption');
        const link = nextLink(this.keys.key, cursor, { kind: 'rule-adoption', id: randomUUID(), version, adoptedBy: actor?.id ?? null, note: input.note ?? null });
        await q.query(`SELECT leadline_adopt_rule_set($1, $2, $3, $4, $5, $6, $7, $8, $9)`, [
          credential, link.id, version, link.note, link.seq, link.createdAt, link.hash, link.previousHash, link.mac,
        ]);
      });
    } catch (err) {
      throw functionRefusal(err) ?? err;
    }
    await this.refreshAdoption();
    return { current: this.currentVersion, adoptions: await this.adoptions() };
  }

  async adoptions() {
    return this.db.query(
      `SELECT version, adopted_by AS "adoptedBy", note, ${TS_TEXT('adopted_at')} AS "adoptedAt" FROM rule_set_adoptions ORDER BY adopted_at, id`,
    );
  }

  /** The rule set new submissions are judged by. */
  current(): RuleSet {
    return this.cache.get(this.currentVersion)?.definition ?? DEFAULT_RULE_SET;
  }

  /** Stored versions whose definition validates, oldest first (the others: invalid()). */
  async list(): Promise<StoredRuleSet[]> {
    const rows = await this.db.query<{ version: string; definition: unknown; created_at: string }>(
      `SELECT version, definition, ${TS_TEXT('created_at')} AS created_at FROM rule_sets ORDER BY created_at, version`,
    );
    return rows.map((r) => this.accept(r)).filter((r): r is StoredRuleSet => r !== null);
  }

  /** Stored versions skipped because their definition does not validate, with the reason. */
  invalid(): { version: string; problem: string }[] {
    return [...this.rejected].map(([version, problem]) => ({ version, problem }));
  }

  /** A stored row as a rule set when its definition validates (under its own version); otherwise recorded as rejected. */
  private accept(r: { version: string; definition: unknown; created_at: string }): StoredRuleSet | null {
    const parsed = ruleSetDefinitionSchema.safeParse(r.definition);
    const problem = !parsed.success
      ? parsed.error.issues.map((i) => `${i.path.join('.') || '(definition)'}: ${i.message}`).slice(0, 3).join('; ')
      : parsed.data.version !== r.version
        ? `the definition names version "${parsed.data.version}"`
        : null;
    if (problem !== null) {
      if (!this.rejected.has(r.version)) this.logger.error(`stored rule set ${JSON.stringify(r.version)} is not valid and is skipped: ${problem}`);
      this.rejected.set(r.version, problem);
      return null;
    }
    return { version: r.version, definition: parsed.data as RuleSet, createdAt: r.created_at };
  }

  /** A stored valid version, or null (absent or invalid). */
  private async load(version: string): Promise<StoredRuleSet | null> {
    const cached = this.cache.get(version);
    if (cached) return cached;
    const rows = await this.db.query<{ version: string; definition: unknown; created_at: string }>(
      `SELECT version, definition, ${TS_TEXT('created_at')} AS created_at FROM rule_sets WHERE version = $1`,
      [version],
    );
    const stored = rows.length ? this.accept(rows[0]) : null;
    if (stored) this.cache.set(version, stored);
    return stored;
  }

  async get(version: string): Promise<StoredRuleSet> {
    const stored = await this.load(version);
    if (stored) return stored;
    const problem = this.rejected.get(version);
    if (problem !== undefined) throw new ProblemError(422, 'Stored rule set is not valid', `rule set ${version} is stored but does not validate (${problem}); it is never judged with`);
    throw notFound(`rule set ${version}`);
  }

  private async credentialOf(actor: Acting | null): Promise<string> {
    if (actor === null) return this.keys.serviceCredential();
    if (!actor.credential) throw new ProblemError(401, 'Authentication required', "this change needs the acting admin's own bearer token");
    return actor.credential;
  }

  /** Creates a new version; an existing version is never replaced. */
  async create(body: unknown, actor: Acting | null = null): Promise<StoredRuleSet> {
    const definition = validate(ruleSetDefinitionSchema, body) as RuleSet;
    try {
      await this.db.query(`SELECT leadline_store_rule_set($1, $2, $3, false)`, [await this.credentialOf(actor), definition.version, JSON.stringify(definition)]);
    } catch (err) {
      if (pgErrorCode(err) === PG_UNIQUE_VIOLATION) {
        throw new ProblemError(409, 'Rule set version exists', `rule set ${definition.version} already exists; versions are never edited, create a new one`);
      }
      throw functionRefusal(err) ?? err;
    }
    this.cache.delete(definition.version);
    return this.get(definition.version);
  }
}

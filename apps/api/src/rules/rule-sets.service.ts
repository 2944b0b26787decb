/**
 * Rule-set versions: stored once, never edited. The service keeps them in memory (they are immutable)
 * and records every version it judges with, so a revision's rule-set version always resolves.
 * New submissions are judged by the latest adopted version (the built-in default until an admin adopts another);
 * another instance of a multi-instance deployment picks an adoption up within ADOPTION_REFRESH_MS.
 */
import { Injectable, OnModuleDestroy, OnModuleInit } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { BUILT_IN_RULE_SETS, DEFAULT_RULE_SET, ruleSetDefinitionSchema, type RuleSet } from '@leadline/rules';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode } from '../infra/database/database.service';
import { ProblemError, notFound, validate } from '../infra/http/problem';
import { TS_TEXT } from '../records/chain';

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

  constructor(private readonly db: Database) {}

  async onModuleInit(): Promise<void> {
    // Every built-in version, oldest first, so revisions judged under an earlier default still resolve
    for (const builtIn of BUILT_IN_RULE_SETS) {
      await this.db.query(
        `INSERT INTO rule_sets (version, definition) VALUES ($1, $2) ON CONFLICT (version) DO NOTHING`,
        [builtIn.version, JSON.stringify(builtIn)],
      );
    }
    for (const r of await this.list()) this.cache.set(r.version, r);
    await this.refreshAdoption();
    this.timer = setInterval(() => void this.refreshAdoption().catch(() => undefined), ADOPTION_REFRESH_MS);
    this.timer.unref();
  }

  onModuleDestroy(): void {
    if (this.timer) clearInterval(this.timer);
  }

  private async refreshAdoption(): Promise<void> {
    const rows = await this.db.query<{ version: string }>(`SELECT version FROM rule_set_adoptions ORDER BY adopted_at DESC, id LIMIT 1`);
    const version = rows[0]?.version ?? DEFAULT_RULE_SET.version;
    await this.get(version);
    this.currentVersion = version;
  }

  /** Makes a stored version the one new submissions are judged by; the adoption is recorded, never edited. */
  async adopt(version: string, body: unknown, adoptedBy: string | null) {
    const input = validate(adoptSchema, body) ?? {};
    await this.get(version);
    await this.db.query(`INSERT INTO rule_set_adoptions (id, version, adopted_by, note) VALUES ($1, $2, $3, $4)`, [randomUUID(), version, adoptedBy, input.note ?? null]);
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

  async list(): Promise<StoredRuleSet[]> {
    const rows = await this.db.query<{ version: string; definition: RuleSet; created_at: string }>(
      `SELECT version, definition, ${TS_TEXT('created_at')} AS created_at FROM rule_sets ORDER BY created_at, version`,
    );
    return rows.map((r) => ({ version: r.version, definition: r.definition, createdAt: r.created_at }));
  }

  async get(version: string): Promise<StoredRuleSet> {
    const cached = this.cache.get(version);
    if (cached) return cached;
    const rows = await this.db.query<{ version: string; definition: RuleSet; created_at: string }>(
      `SELECT version, definition, ${TS_TEXT('created_at')} AS created_at FROM rule_sets WHERE version = $1`,
      [version],
    );
    if (rows.length === 0) throw notFound(`rule set ${version}`);
    const stored = { version: rows[0].version, definition: rows[0].definition, createdAt: rows[0].created_at };
    this.cache.set(version, stored);
    return stored;
  }

  /** Creates a new version; an existing version is never replaced. */
  async create(body: unknown): Promise<StoredRuleSet> {
    const definition = validate(ruleSetDefinitionSchema, body) as RuleSet;
    try {
      await this.db.query(`INSERT INTO rule_sets (version, definition) VALUES ($1, $2)`, [definition.version, JSON.stringify(definition)]);
    } catch (err) {
      if (pgErrorCode(err) === PG_UNIQUE_VIOLATION) {
        throw new ProblemError(409, 'Rule set version exists', `rule set ${definition.version} already exists; versions are never edited, create a new one`);
      }
      throw err;
    }
    this.cache.delete(definition.version);
    return this.get(definition.version);
  }
}

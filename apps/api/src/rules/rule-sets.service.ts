/**
 * Rule-set versions: stored once, never edited. The service keeps them in memory (they are immutable)
 * and records every version it judges with, so a revision's rule-set version always resolves.
 */
import { Injectable, OnModuleInit } from '@nestjs/common';
import { DEFAULT_RULE_SET, ruleSetDefinitionSchema, type RuleSet } from '@leadline/rules';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode } from '../infra/database/database.service';
import { ProblemError, notFound, validate } from '../infra/http/problem';
import { TS_TEXT } from '../records/chain';

export interface StoredRuleSet {
  version: string;
  definition: RuleSet;
  createdAt: string;
}

@Injectable()
export class RuleSetsService implements OnModuleInit {
  private readonly cache = new Map<string, StoredRuleSet>();
  private currentVersion = DEFAULT_RULE_SET.version;

  constructor(private readonly db: Database) {}

  async onModuleInit(): Promise<void> {
    await this.db.query(
      `INSERT INTO rule_sets (version, definition) VALUES ($1, $2) ON CONFLICT (version) DO NOTHING`,
      [DEFAULT_RULE_SET.version, JSON.stringify(DEFAULT_RULE_SET)],
    );
    for (const r of await this.list()) this.cache.set(r.version, r);
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

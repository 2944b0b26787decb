/**
 * Impact of another rule-set version: re-judges stored revisions (their stored design and evaluation, so the
 * engine's numbers are exactly those on record) and reports which would change verdict. Nothing is written.
 */
import { Injectable } from '@nestjs/common';
import type { Finding } from '@leadline/contracts';
import type { Design, Evaluation } from '@leadline/mechanics';
import { judge, verdictOf } from '@leadline/rules';
import { z } from 'zod';
import { Database } from '../infra/database/database.service';
import { validate } from '../infra/http/problem';
import { revisionScope } from './revision-scope';
import { RuleSetsService } from './rule-sets.service';

export const impactSchema = z
  .strictObject({
    scope: z.enum(['latest', 'approved']).default('latest').describe('every latest revision of each calculation, or every approved revision'),
    productId: z.string().uuid().optional(),
  })
  .default({ scope: 'latest' });

@Injectable()
export class ImpactService {
  constructor(
    private readonly db: Database,
    private readonly ruleSets: RuleSetsService,
  ) {}

  async impact(version: string, body: unknown) {
    const input = validate(impactSchema, body ?? {});
    const target = await this.ruleSets.get(version);
    const { where, params } = revisionScope(input.scope, input.productId);
    const rows = await this.db.query<{
      id: string; product_id: string; calculation_id: string; revision: number; verdict: string; rule_set_version: string;
      normalized: Design; evaluation: Evaluation; findings: Finding[];
    }>(
      `SELECT r.id, r.product_id, r.calculation_id, r.revision, r.verdict, r.rule_set_version, r.normalized, r.evaluation, r.findings
         FROM revisions r WHERE ${where} ORDER BY r.created_at, r.seq`,
      params,
    );
    const changes = [];
    for (const r of rows) {
      const findings = judge(r.normalized, r.evaluation, target.definition);
      const verdict = verdictOf(findings);
      if (verdict === r.verdict) continue;
      const before = new Map(r.findings.map((f) => [f.ruleId, f.severity]));
      const after = new Map(findings.map((f) => [f.ruleId, f.severity]));
      const ids = [...new Set([...before.keys(), ...after.keys()])].filter((k) => before.get(k) !== after.get(k));
      changes.push({
        revisionId: r.id, productId: r.product_id, calculationId: r.calculation_id, revision: Number(r.revision),
        judgedBy: r.rule_set_version, verdict: { from: r.verdict, to: verdict },
        findingChanges: ids.map((ruleId) => ({ ruleId, from: before.get(ruleId) ?? null, to: after.get(ruleId) ?? null })),
      });
    }
    return { ruleSetVersion: version, scope: input.scope, examined: rows.length, changed: changes.length, revisions: changes };
  }
}

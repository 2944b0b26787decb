/**
 * Re-check of stored work after an engine or rule correction: re-evaluates stored revisions (the latest of each
 * calculation and every approved one) from their stored input with the current engine and the adopted rule set, and
 * lists each one whose verdict changes or whose governing margin drops below its limit, with the figures it was judged
 * by beside the new ones. Nothing is written: stored revisions keep the engine version and evaluation they were judged
 * with, and a new revision is how a design gets re-judged. (The sibling impact report re-judges the stored evaluations
 * under another rule set without re-running the engine.)
 */
import { Injectable } from '@nestjs/common';
import { parseDesign, type Finding, type Verdict } from '@leadline/contracts';
import { ENGINE_VERSION, evaluate, type Design, type Evaluation } from '@leadline/mechanics';
import { governingMargin, judge, verdictOf, type CheckMargin, type Thresholds } from '@leadline/rules';
import { z } from 'zod';
import { Database } from '../infra/database/database.service';
import { validate } from '../infra/http/problem';
import { APPROVED_SQL, LATEST_SQL, revisionScope } from './revision-scope';
import { RuleSetsService } from './rule-sets.service';

export const recheckSchema = z
  .strictObject({
    scope: z
      .enum(['latest-and-approved', 'latest', 'approved'])
      .default('latest-and-approved')
      .describe('the latest revision of each calculation and every approved revision (default), or one of the two'),
    productId: z.string().uuid().optional(),
  })
  .default({ scope: 'latest-and-approved' });

const verdictEnum = z.enum(['blocked', 'needs-acknowledgement', 'clear']);
// null sits on the number branch: OpenAPI 3.0 allows `nullable` only beside a `type` (as in the finding schema)
const scalar = z.union([z.number().nullable(), z.boolean(), z.string()]);
const marginSchema = z
  .object({
    subject: z.string(), ruleId: z.string(), label: z.string(), measured: z.number().nullable(), limit: z.number(), kind: z.enum(['min', 'max']),
    margin: z.number().nullable(), status: z.enum(['pass', 'warning', 'fail', 'not-computed']),
  })
  .nullable()
  .describe('the governing check: the one furthest past its limit, else the one that meets it by the smallest factor (margin >= 1 meets it)');
const figuresSchema = z.object({ severity: z.enum(['blocking', 'warning', 'info']), measured: scalar, limit: scalar, unit: z.string().nullable(), subject: z.string().nullable() });

/** The re-check's answer, as the OpenAPI document describes it. */
export const recheckResponseSchema = z.object({
  engineVersion: z.string(),
  ruleSetVersion: z.string(),
  scope: z.enum(['latest-and-approved', 'latest', 'approved']),
  examined: z.number().int(),
  changed: z.number().int(),
  revisions: z.array(
    z.object({
      revisionId: z.string().uuid(), productId: z.string().uuid(), calculationId: z.string().uuid(), revision: z.number().int(),
      approved: z.boolean(), latest: z.boolean(),
      reasons: z.array(z.enum(['verdict-changed', 'margin-below-limit', 'input-refused'])),
      judged: z.object({ engineVersion: z.string(), ruleSetVersion: z.string(), verdict: verdictEnum, governing: marginSchema }),
      recheck: z.object({
        engineVersion: z.string(), ruleSetVersion: z.string(), verdict: verdictEnum.nullable(), governing: marginSchema,
        issues: z.array(z.object({ path: z.string(), message: z.string() })).optional().describe('only when the stored input is now refused'),
      }),
      findingChanges: z.array(z.object({ ruleId: z.string(), from: figuresSchema.nullable(), to: figuresSchema.extend({ message: z.string() }).nullable() })),
    }),
  ),
});

interface Judged {
  readonly engineVersion: string;
  readonly ruleSetVersion: string;
  readonly verdict: Verdict;
  readonly governing: CheckMargin | null;
  readonly findings: readonly Finding[];
}

const marginText = (m: CheckMargin | null) =>
  m === null ? null : { subject: m.subject, ruleId: m.ruleId, label: m.label, measured: m.measured, limit: m.limit, kind: m.kind, margin: m.margin, status: m.status };
// A check past its limit by the declarations' own reading (a missing value the rules block on included)
const fails = (m: CheckMargin | null) => m !== null && m.status === 'fail';

@Injectable()
export class RecheckService {
  constructor(
    private readonly db: Database,
    private readonly ruleSets: RuleSetsService,
  ) {}

  async recheck(body: unknown) {
    const input = validate(recheckSchema, body ?? {});
    const ruleSet = this.ruleSets.current();
    const { where, params } = revisionScope(input.scope, input.productId);
    const rows = await this.db.query<{
      id: string; product_id: string; calculation_id: string; revision: number; verdict: Verdict; rule_set_version: string;
      engine_version: string; input: unknown; normalized: Design; evaluation: Evaluation; findings: Finding[]; approved: boolean; latest: boolean;
    }>(
      `SELECT r.id, r.product_id, r.calculation_id, r.revision, r.verdict, r.rule_set_version, r.engine_version, r.input, r.normalized,
              r.evaluation, r.findings, ${APPROVED_SQL} AS approved, ${LATEST_SQL} AS latest
         FROM revisions r WHERE ${where} ORDER BY r.created_at, r.seq`,
      params,
    );
    const thresholdsOf = new Map<string, Thresholds>();
    const changes = [];
    for (const r of rows) {
      let judgedBy = thresholdsOf.get(r.rule_set_version);
      if (!judgedBy) {
        judgedBy = (await this.ruleSets.get(r.rule_set_version)).definition.thresholds;
        thresholdsOf.set(r.rule_set_version, judgedBy);
      }
      const before: Judged = {
        engineVersion: r.engine_version,
        ruleSetVersion: r.rule_set_version,
        verdict: r.verdict,
        governing: governingMargin(r.normalized, r.evaluation, judgedBy),
        findings: r.findings,
      };
      const base = {
        revisionId: r.id, productId: r.product_id, calculationId: r.calculation_id, revision: Number(r.revision),
        approved: r.approved, latest: r.latest,
      };
      const parsed = parseDesign(r.input);
      if (!parsed.success) {
        // The stored input no longer passes the contract (a correction refuses it): that changes its judgment
        changes.push({
          ...base, reasons: ['input-refused'],
          judged: { engineVersion: before.engineVersion, ruleSetVersion: before.ruleSetVersion, verdict: before.verdict, governing: marginText(before.governing) },
          recheck: { engineVersion: ENGINE_VERSION, ruleSetVersion: ruleSet.version, verdict: null, governing: null, issues: parsed.issues },
          findingChanges: [],
        });
        continue;
      }
      const evaluation = evaluate(parsed.design);
      const findings = judge(parsed.design, evaluation, ruleSet);
      const after: Judged = {
        engineVersion: ENGINE_VERSION,
        ruleSetVersion: ruleSet.version,
        verdict: verdictOf(findings),
        governing: governingMargin(parsed.design, evaluation, ruleSet.thresholds),
        findings,
      };
      const reasons: string[] = [];
      if (after.verdict !== before.verdict) reasons.push('verdict-changed');
      if (fails(after.governing) && !fails(before.governing)) reasons.push('margin-below-limit');
      if (reasons.length === 0) continue;
      changes.push({
        ...base,
        reasons,
        judged: { engineVersion: before.engineVersion, ruleSetVersion: before.ruleSetVersion, verdict: before.verdict, governing: marginText(before.governing) },
        recheck: { engineVersion: after.engineVersion, ruleSetVersion: after.ruleSetVersion, verdict: after.verdict, governing: marginText(after.governing) },
        findingChanges: findingChanges(before.findings, after.findings),
      });
    }
    return {
      engineVersion: ENGINE_VERSION,
      ruleSetVersion: ruleSet.version,
      scope: input.scope,
      examined: rows.length,
      changed: changes.length,
      revisions: changes,
    };
  }
}

/** Every rule whose severity or figures differ, old and new side by side. */
function findingChanges(before: readonly Finding[], after: readonly Finding[]) {
  const b = new Map(before.map((f) => [f.ruleId, f]));
  const a = new Map(after.map((f) => [f.ruleId, f]));
  const out = [];
  for (const ruleId of new Set([...b.keys(), ...a.keys()])) {
    const x = b.get(ruleId) ?? null;
    const y = a.get(ruleId) ?? null;
    if (x?.severity === y?.severity && x?.measured === y?.measured && x?.limit === y?.limit) continue;
    out.push({
      ruleId,
      from: x && { severity: x.severity, measured: x.measured, limit: x.limit, unit: x.unit, subject: x.subject },
      to: y && { severity: y.severity, measured: y.measured, limit: y.limit, unit: y.unit, subject: y.subject, message: y.message },
    });
  }
  return out;
}

/**
 * Turns a raw design input into an assessment: validated design, engine evaluation, findings and verdict.
 * Pure apart from the rule set it is given; used by the stateless route and by durable submissions alike.
 */
import { Injectable } from '@nestjs/common';
import { parseDesign, type Finding, type Verdict } from '@leadline/contracts';
import { evaluate, ENGINE_VERSION, type Design, type Evaluation } from '@leadline/mechanics';
import { judge, verdictOf, type RuleSet } from '@leadline/rules';
import { ValidationProblem } from '../infra/http/problem';

export interface Assessment {
  readonly design: Design;
  readonly evaluation: Evaluation;
  readonly findings: readonly Finding[];
  readonly verdict: Verdict;
  readonly engineVersion: string;
  readonly ruleSetVersion: string;
}

@Injectable()
export class AssessmentService {
  /** @param pathPrefix - prefix for field paths in errors, e.g. "design." when the input is nested */
  assess(raw: unknown, ruleSet: RuleSet, pathPrefix = ''): Assessment {
    const parsed = parseDesign(raw);
    if (!parsed.success) {
      throw new ValidationProblem(parsed.issues.map((i) => ({ path: pathPrefix + i.path, message: i.message })));
    }
    const evaluation = evaluate(parsed.design);
    // Second line of defence behind the contract's plausible ranges: a figure that overflowed to Infinity or NaN
    // cannot be judged, and a check that cannot be computed is never passed, so the design is refused as a whole.
    const broken = nonFiniteFigure(evaluation, 'evaluation');
    if (broken) {
      throw new ValidationProblem([{
        path: pathPrefix ? pathPrefix.replace(/\.$/, '') : '(body)',
        message: `the design cannot be computed: ${broken} is not a finite number (check the magnitudes of the input values)`,
      }]);
    }
    const findings = judge(parsed.design, evaluation, ruleSet);
    return {
      design: parsed.design,
      evaluation: Object.assign({}, evaluation, { findings }), // not { ...evaluation, findings }: a slow path on Node 20 (docs/performance.md)
      findings,
      verdict: verdictOf(findings),
      engineVersion: ENGINE_VERSION,
      ruleSetVersion: ruleSet.version,
    };
  }
}

/**
 * True when every number in the value is finite; walks without building paths (this runs on every evaluation).
 * Numbers are tested in the loop rather than by a call per leaf, and an evaluation's formula trace (a map of
 * path -> { formula, inputs }, about half its numbers) is walked by its known shape: together half the time of a
 * generic walk on the benchmark jack (docs/performance.md).
 */
function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return value - value === 0;
  if (value === null || typeof value !== 'object') return true;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const v: unknown = value[i];
      if (typeof v === 'number' ? v - v !== 0 : v !== null && typeof v === 'object' && !allFinite(v)) return false;
    }
    return true;
  }
  const o = value as Record<string, unknown>;
  for (const k in o) {
    const v = o[k];
    if (typeof v === 'number' ? v - v !== 0 : v !== null && typeof v === 'object' && !(k === 'trace' ? traceFinite(v) : allFinite(v))) return false;
  }
  return true;
}

/**
 * A formula trace all finite. Its entries are the engine's TraceEntry, { formula: string, inputs: number record },
 * so only their inputs hold numbers; they are read directly (an entry of another shape is walked generically).
 */
function traceFinite(trace: object): boolean {
  const entries = trace as Record<string, { formula?: unknown; inputs?: unknown }>;
  for (const k in entries) {
    const entry = entries[k];
    if (entry === null || typeof entry !== 'object' || typeof entry.formula !== 'string' || entry.inputs === null || typeof entry.inputs !== 'object') {
      if (!allFinite(entry)) return false;
    } else if (!flatFinite(entry.inputs)) return false;
  }
  return true;
}

/** The numbers of one trace entry's inputs (a flat record; anything nested is walked generically). */
function flatFinite(inputs: object): boolean {
  const record = inputs as Record<string, unknown>;
  for (const j in record) {
    const v = record[j];
    if (typeof v === 'number' ? v - v !== 0 : v !== null && typeof v === 'object' && !allFinite(v)) return false;
  }
  return true;
}

/** The path of the first number in an evaluation that is not finite (Infinity or NaN), or null when all are. */
export function nonFiniteFigure(value: unknown, path: string): string | null {
  return allFinite(value) ? null : pathOfNonFinite(value, path);
}

function pathOfNonFinite(value: unknown, path: string): string | null {
  if (typeof value === 'number') return Number.isFinite(value) ? null : path;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const found = pathOfNonFinite(value[i], `${path}.${i}`);
      if (found) return found;
    }
  } else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      const found = pathOfNonFinite(v, `${path}.${k}`);
      if (found) return found;
    }
  }
  return null;
}

/**
 * The assessment of a raw design input as data: validated design, engine evaluation, findings, declared checks and
 * verdict, or the fields that refuse it. Pure (no Nest, no HTTP, no database), so that the evaluation route's worker
 * threads (evaluation-pool.ts) run exactly what the service runs in the request.
 */
import { parseDesign, type Finding, type Verdict } from '@leadline/contracts';
import { evaluate, ENGINE_VERSION, type Design, type Evaluation } from '@leadline/mechanics';
import { judgeWithChecks, verdictOf, type Check, type RuleSet } from '@leadline/rules';

export interface Assessment {
  readonly design: Design;
  readonly evaluation: Evaluation;
  readonly findings: readonly Finding[];
  /** Every declared check that applies, and the governing one (not part of the stored record: derived on reading) */
  readonly checks: readonly Check[];
  readonly governing: Check | null;
  readonly verdict: Verdict;
  readonly engineVersion: string;
  readonly ruleSetVersion: string;
}

/** A field refused by the assessment: its path (with the caller's prefix) and why. */
export interface AssessmentProblem {
  readonly path: string;
  readonly message: string;
}

/**
 * The assessment as data: the assessment, or the fields that refuse it. Pure (no Nest, no HTTP), so that the
 * evaluation route's worker threads (evaluation-pool.ts) run exactly what the service runs.
 * @param pathPrefix - prefix for field paths in errors, e.g. "design." when the input is nested
 */
export function assessDesign(raw: unknown, ruleSet: RuleSet, pathPrefix = ''): { assessment: Assessment } | { problems: AssessmentProblem[] } {
  const parsed = parseDesign(raw);
  if (!parsed.success) return { problems: parsed.issues.map((i) => ({ path: pathPrefix + i.path, message: i.message })) };
  const evaluation = evaluate(parsed.design);
  // Second line of defence behind the contract's plausible ranges: a figure that overflowed to Infinity or NaN
  // cannot be judged, and a check that cannot be computed is never passed, so the design is refused as a whole.
  const broken = nonFiniteFigure(evaluation, 'evaluation');
  if (broken) {
    return {
      problems: [{
        path: pathPrefix ? pathPrefix.replace(/\.$/, '') : '(body)',
        message: `the design cannot be computed: ${broken} is not a finite number (check the magnitudes of the input values)`,
      }],
    };
  }
  const { findings, checks, governing } = judgeWithChecks(parsed.design, evaluation, ruleSet);
  return {
    assessment: {
      design: parsed.design,
      evaluation: { ...evaluation, findings },
      findings,
      checks,
      governing,
      verdict: verdictOf(findings),
      engineVersion: ENGINE_VERSION,
      ruleSetVersion: ruleSet.version,
    },
  };
}

/**
 * True when every number in the value is finite (x - x is 0 only for finite x); walks without building paths.
 * A number is tested where it is read, not by a call per leaf (a third of the walk's time on an evaluation).
 */
function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return value - value === 0;
  if (value === null || typeof value !== 'object') return true;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) if (!finiteLeafOrWalk(value[i])) return false;
    return true;
  }
  const o = value as Record<string, unknown>;
  for (const k in o) if (!finiteLeafOrWalk(o[k])) return false;
  return true;
}

/** One element: a number tested on the spot, an object or array walked, anything else passes. */
function finiteLeafOrWalk(v: unknown): boolean {
  return typeof v === 'number' ? v - v === 0 : v === null || typeof v !== 'object' || allFinite(v);
}

/**
 * An evaluation's numbers all finite (this runs on every evaluation): its formula trace, about half its numbers, is
 * read by its known shape, the rest walked generically; half the time of a generic walk (docs/performance.md).
 */
function figuresFinite(value: unknown): boolean {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) return allFinite(value);
  const o = value as Record<string, unknown>;
  for (const k in o) if (!(k === 'trace' ? traceFinite(o[k]) : allFinite(o[k]))) return false;
  return true;
}

/**
 * A formula trace all finite. Its entries are the engine's TraceEntry, { formula: string, inputs: number record },
 * so only their inputs hold numbers and they are read directly; an entry of another shape is walked whole.
 */
function traceFinite(trace: unknown): boolean {
  if (trace === null || typeof trace !== 'object') return allFinite(trace);
  const entries = trace as Record<string, { formula?: unknown; inputs?: unknown } | null>;
  for (const k in entries) {
    const entry = entries[k];
    const shaped = entry !== null && typeof entry === 'object' && typeof entry.formula === 'string' && entry.inputs !== null && typeof entry.inputs === 'object';
    if (!(shaped ? allFinite(entry.inputs) : allFinite(entry))) return false;
  }
  return true;
}

/** The path of the first number in an evaluation that is not finite (Infinity or NaN), or null when all are. */
export function nonFiniteFigure(value: unknown, path: string): string | null {
  return figuresFinite(value) ? null : pathOfNonFinite(value, path);
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

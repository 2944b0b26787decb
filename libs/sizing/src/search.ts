/**
 * Screw selection: every standard size of the chosen forms, at every number of starts and nut length, judged by the
 * engine and a rule set; the ones not blocked ranked by an objective, the rest counted by the rule that stopped them.
 * Pure: the rule set comes in as data; no I/O, no clock, no randomness.
 *
 * Pruning (docs/sizing.md): each screw (size and starts) is judged first at its shortest nut. When a rule that does
 * not depend on the nut (NUT_INDEPENDENT_RULES) blocks it there, it blocks at every nut length, so the screw's other
 * nut lengths are counted under that rule without being evaluated.
 */
import { parseDesign, type DesignInput, type Finding, type Verdict } from '@leadline/contracts';
import { ENGINE_VERSION, evaluate, type Design, type Evaluation, type ThreadSize } from '@leadline/mechanics';
import { judge, verdictOf, type RuleSet } from '@leadline/rules';
import { figuresOf, firstBlockingRule, governingCheck, screwBlockingRule, type CheckMargin, type Figures } from './checks';
import { candidateInput, lengthText, type SizingPlan } from './request';

export interface SizingCandidate {
  readonly rank: number;
  readonly size: string;
  readonly form: string;
  readonly starts: number;
  readonly nutLength: string;
  readonly nutLengthRatio: number;
  readonly verdict: Verdict;
  readonly governing: Omit<CheckMargin, never> | null;
  readonly figures: Figures;
  readonly design: DesignInput;
}

export interface SizingHeadroom {
  readonly rank: number;
  readonly size: string;
  readonly starts: number;
  readonly nutLength: string;
  /** Largest axial load at which the candidate still passes, e.g. "15321 N"; null if no blocking load was found */
  readonly axialLoad: string | null;
  readonly factor: number | null;
  readonly blockedBy: string | null;
}

export interface SizingResult {
  readonly ruleSetVersion: string;
  readonly engineVersion: string;
  readonly objective: SizingPlan['objective'];
  readonly searched: number;
  readonly evaluations: number;
  readonly pruned: number;
  readonly passed: number;
  readonly candidates: readonly SizingCandidate[];
  readonly rejected: Readonly<Record<string, number>>;
  readonly headroom: readonly SizingHeadroom[];
}

/** One candidate's design in engine units: the requirements with this thread, nut length and collar. */
export function candidateDesign(plan: SizingPlan, size: ThreadSize, starts: number, nutLengthRatio: number): Design {
  const b = plan.base;
  return {
    ...b,
    thread: { form: size.form, size: size.designation, majorDiameter: size.majorDiameter, pitch: size.pitch, starts, loadFlankAngle: null },
    nut: { ...b.nut, length: nutLengthRatio * size.majorDiameter },
    collar: plan.collarRatio === null || (b.collar.kind !== 'plain' && b.collar.kind !== 'rolling')
      ? b.collar
      : { kind: b.collar.kind, meanDiameter: plan.collarRatio * size.majorDiameter },
  };
}

interface Judged {
  readonly design: Design;
  readonly evaluation: Evaluation;
  readonly findings: readonly Finding[];
  readonly verdict: Verdict;
}

function judged(design: Design, ruleSet: RuleSet): Judged {
  const evaluation = evaluate(design);
  const findings = judge(design, evaluation, ruleSet);
  return { design, evaluation, findings, verdict: verdictOf(findings) };
}

interface Passing extends Judged {
  readonly size: ThreadSize;
  readonly starts: number;
  readonly ratio: number;
}

/** The number an objective ranks by, smaller first. */
export function objectiveKey(objective: SizingPlan['objective'], design: Design, e: Evaluation): number {
  switch (objective) {
    case 'smallest-diameter':
      return design.thread.majorDiameter;
    case 'lowest-torque':
      return e.torque.raise.atMaxFriction;
    case 'highest-efficiency':
      return -e.efficiency.atMinFriction;
    case 'lightest':
      return figuresOf(design, e).massPerMetre;
  }
}

const VERDICT_ORDER: Record<Verdict, number> = { clear: 0, 'needs-acknowledgement': 1, blocked: 2 };

/**
 * Runs the search. One entry is listed per screw (size and starts): its best passing nut length (clear before
 * needs-acknowledgement, then the shortest). Ties on the objective go to the better verdict, then the lower raise
 * torque, then the size name.
 */
export function searchScrews(plan: SizingPlan, ruleSet: RuleSet): SizingResult {
  const rejected: Record<string, number> = {};
  const reject = (ruleId: string, count = 1) => {
    rejected[ruleId] = (rejected[ruleId] ?? 0) + count;
  };
  let evaluations = 0;
  let pruned = 0;
  let searched = 0;
  let passed = 0;
  const best: Passing[] = [];
  const ratios = plan.nutLengthRatios;

  for (const size of plan.sizes) {
    for (const starts of plan.starts) {
      searched += ratios.length;
      let pick: Passing | null = null;
      for (let k = 0; k < ratios.length; k++) {
        const j = judged(candidateDesign(plan, size, starts, ratios[k]), ruleSet);
        evaluations++;
        const blockedBy = firstBlockingRule(j.findings);
        if (blockedBy !== null) {
          reject(blockedBy);
          if (k === 0 && screwBlockingRule(j.findings) !== null) {
            // The screw itself fails: every other nut length fails the same way.
            reject(blockedBy, ratios.length - 1);
            pruned += ratios.length - 1;
            break;
          }
          continue;
        }
        passed++;
        if (pick === null || VERDICT_ORDER[j.verdict] < VERDICT_ORDER[pick.verdict]) pick = { ...j, size, starts, ratio: ratios[k] };
      }
      if (pick) best.push(pick);
    }
  }

  const keyed = best.map((p) => ({ p, key: objectiveKey(plan.objective, p.design, p.evaluation) }));
  keyed.sort(
    (a, b) =>
      a.key - b.key ||
      VERDICT_ORDER[a.p.verdict] - VERDICT_ORDER[b.p.verdict] ||
      a.p.evaluation.torque.raise.atMaxFriction - b.p.evaluation.torque.raise.atMaxFriction ||
      a.p.size.designation.localeCompare(b.p.size.designation) ||
      a.p.starts - b.p.starts,
  );

  // Listed candidates are re-derived from their own design input, so that the answer is exactly what POST
  // /evaluations gives for it (the search itself works on the converted requirements).
  const candidates: SizingCandidate[] = [];
  const listedDesigns: Design[] = [];
  for (const { p } of keyed) {
    if (candidates.length >= plan.limit) break;
    const input = candidateInput(plan, p.size, p.starts, p.ratio);
    const parsed = parseDesign(input);
    if (!parsed.success) throw new Error(`sizing built an invalid design for ${p.size.designation}: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
    const j = judged(parsed.design, ruleSet);
    if (j.verdict === 'blocked') continue; // float noise at a limit: the submitted form decides
    const governing = governingCheck(j.design, j.evaluation, ruleSet.thresholds);
    candidates.push({
      rank: candidates.length + 1,
      size: p.size.designation,
      form: p.size.form,
      starts: p.starts,
      nutLength: lengthText(p.ratio * p.size.majorDiameter, p.size),
      nutLengthRatio: p.ratio,
      verdict: j.verdict,
      governing,
      figures: figuresOf(j.design, j.evaluation),
      design: input,
    });
    listedDesigns.push(j.design);
  }

  const headroom = candidates.slice(0, 3).map((c, i) => ({
    rank: c.rank,
    size: c.size,
    starts: c.starts,
    nutLength: c.nutLength,
    ...loadHeadroom(listedDesigns[i], ruleSet),
  }));

  return {
    ruleSetVersion: ruleSet.version,
    engineVersion: ENGINE_VERSION,
    objective: plan.objective,
    searched,
    evaluations,
    pruned,
    passed,
    candidates,
    rejected,
    headroom,
  };
}

/** Rounds a positive number down to `digits` significant figures. */
export function floorSignificant(x: number, digits: number): number {
  const step = 10 ** (Math.floor(Math.log10(x)) - digits + 1);
  let r = Number((Math.floor(x / step) * step).toPrecision(digits));
  if (r > x) r = Number(((Math.floor(x / step) - 1) * step).toPrecision(digits));
  return r;
}

const HEADROOM_TOLERANCE = 1e-4;
const HEADROOM_DIGITS = 5;

/**
 * The largest axial load at which a passing design still passes, by bisection on the load with the engine and the
 * rule set: the load is doubled until the design blocks, then the bracket is halved geometrically until it is
 * narrower than 0.01 %. The answer is rounded down to 5 significant figures, so the design passes at it and blocks
 * at 1 % more (the checks only get worse as the load grows: stresses, pressures and drive demand rise with it,
 * the buckling factor falls, and self-locking, whirl and friction do not depend on it).
 */
export function loadHeadroom(design: Design, ruleSet: RuleSet): { axialLoad: string | null; factor: number | null; blockedBy: string | null } {
  const at = (F: number) => judged({ ...design, load: { ...design.load, axial: F } }, ruleSet);
  const F0 = design.load.axial;
  let lo = F0;
  let hi = F0 * 2;
  let blockedAtHi = firstBlockingRule(at(hi).findings);
  for (let i = 0; blockedAtHi === null && i < 60; i++) {
    lo = hi;
    hi *= 2;
    blockedAtHi = firstBlockingRule(at(hi).findings);
  }
  if (blockedAtHi === null) return { axialLoad: null, factor: null, blockedBy: null };
  while (hi / lo > 1 + HEADROOM_TOLERANCE) {
    const mid = Math.sqrt(lo * hi);
    const b = firstBlockingRule(at(mid).findings);
    if (b === null) lo = mid;
    else {
      hi = mid;
      blockedAtHi = b;
    }
  }
  const load = floorSignificant(lo, HEADROOM_DIGITS);
  return { axialLoad: `${load} N`, factor: load / F0, blockedBy: blockedAtHi };
}

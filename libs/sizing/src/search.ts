/**
 * Screw selection: every standard size of the chosen forms, at every number of starts and nut length, judged by the
 * engine and a rule set; the ones not blocked ranked by an objective, the rest counted by the rule that stopped them.
 * Pure: the rule set comes in as data; no I/O, no clock, no randomness.
 *
 * Pruning (docs/sizing.md): each screw (size and starts) is judged first at its shortest nut. When a rule that does
 * not depend on the nut (NUT_INDEPENDENT_RULES) blocks it there, it blocks at every nut length, so the screw's other
 * nut lengths are counted under that rule without being evaluated.
 */
import type { DesignInput, Finding, Verdict } from '@leadline/contracts';
import { ENGINE_VERSION, evaluate, parseQuantity, QuantityError, type Design, type Evaluation, type ThreadSize } from '@leadline/mechanics';
import { checksOf, governingCheck, judge, verdictOf, type Check, type RuleSet } from '@leadline/rules';
import {
  checkMargins, closeness, figuresOf, firstBlockingRule, loadDependent, massPerMetre, screwBlockingRule, sizingGoverning, type Figures, type SizingGoverning,
} from './checks';
import { candidateInput, lengthText, type SizingPlan } from './request';

export interface SizingCandidate {
  readonly rank: number;
  readonly size: string;
  readonly form: string;
  readonly starts: number;
  readonly nutLength: string;
  readonly nutLengthRatio: number;
  readonly verdict: Verdict;
  readonly governing: SizingGoverning | null;
  /** Every check the rules apply to the candidate, as an evaluation answer carries them */
  readonly checks: readonly Check[];
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

/**
 * One candidate's design in engine units: the requirements with this thread, nut length and collar. The nut length
 * and collar diameter are converted from the very text the candidate's design input carries (lengthText), so the
 * design equals what parsing that input gives and POST /evaluations reproduces the search's verdict and figures.
 */
export function candidateDesign(plan: SizingPlan, size: ThreadSize, starts: number, nutLengthRatio: number): Design {
  return withThread(plan.base, size, starts, ratioLength(size, nutLengthRatio), collarFor(plan, size), classFor(plan, size), outsideFor(plan, size));
}

/**
 * A candidate's nut length or collar diameter, ratio x major diameter [m], as the candidate's text reads back (lengthText, then the input conversion). Formatting
 * and reading that text took about a microsecond a time, half of the search's cost beyond its evaluations, so the
 * value is kept per thread size (the library's size objects) and ratio: a pure function of both, bounded in size.
 */
const ratioLengths = new WeakMap<ThreadSize, Map<number, number>>();
function ratioLength(size: ThreadSize, ratio: number): number {
  let bySize = ratioLengths.get(size);
  if (bySize === undefined) ratioLengths.set(size, (bySize = new Map()));
  let value = bySize.get(ratio);
  if (value === undefined) {
    if (bySize.size >= 64) bySize.clear();
    value = textLength(lengthText(ratio * size.majorDiameter, size));
    bySize.set(ratio, value);
  }
  return value;
}

/** The tolerance class a candidate of this size is judged at (search.toleranceClass of its form), or null: basic profile. */
function classFor(plan: SizingPlan, size: ThreadSize): string | null {
  return (plan.toleranceClass as Readonly<Record<string, string | undefined>>)[size.form] ?? null;
}

/** The collar of a candidate: the requirements' own, or ratio x major diameter read from its text. */
function collarFor(plan: SizingPlan, size: ThreadSize): Design['collar'] {
  const c = plan.base.collar;
  if (plan.collarRatio === null || (c.kind !== 'plain' && c.kind !== 'rolling')) return c;
  return { kind: c.kind, meanDiameter: ratioLength(size, plan.collarRatio) };
}

/** The nut body's outside diameter of a candidate: ratio x major diameter read from its text, or none. */
function outsideFor(plan: SizingPlan, size: ThreadSize): number | null {
  return plan.nutOutsideRatio === null ? null : ratioLength(size, plan.nutOutsideRatio);
}

function withThread(
  base: Design, size: ThreadSize, starts: number, length: number, collar: Design['collar'], toleranceClass: string | null, outsideDiameter: number | null,
): Design {
  return {
    ...base,
    thread: { form: size.form, size: size.designation, majorDiameter: size.majorDiameter, pitch: size.pitch, starts, loadFlankAngle: null, toleranceClass },
    nut: { ...base.nut, length, outsideDiameter },
    collar,
  };
}

/** A length text as the design input's conversion reads it [m]. */
function textLength(text: string): number {
  const q = parseQuantity(text, 'length');
  if (q instanceof QuantityError) throw new Error(`sizing wrote an invalid length "${text}": ${q.message}`);
  return q.si;
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

const NO_TRACE: Evaluation['trace'] = Object.freeze({});

/**
 * An evaluation kept for ranking without its formula trace (most of its size; no answer of the search prints it):
 * a worst-case search keeps one per screw, thousands, and retained traces made the heap large enough for
 * garbage-collection pauses of tens of milliseconds. Copied key by key (a spread followed by a key is a slow path).
 */
function withoutTrace(e: Evaluation): Evaluation {
  const lean: Record<string, unknown> = {};
  const source = e as unknown as Record<string, unknown>;
  for (const key in source) lean[key] = key === 'trace' ? NO_TRACE : source[key];
  return lean as unknown as Evaluation;
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
      return massPerMetre(design.screw.density, e.geometry.meanDiameter);
  }
}

const VERDICT_ORDER: Record<Verdict, number> = { clear: 0, 'needs-acknowledgement': 1, blocked: 2 };

/**
 * Runs the search. One entry is listed per screw (size and starts): its best passing nut length (clear before
 * needs-acknowledgement, then the shortest). Ties on the objective go to the better verdict, then the lower raise
 * torque, then the size name.
 */
export function searchScrews(plan: SizingPlan, ruleSet: RuleSet): SizingResult {
  const steps = searchSteps(plan, ruleSet);
  for (;;) {
    const step = steps.next();
    if (step.done) return step.value;
  }
}

/**
 * The same search in steps: it pauses after each screw (size and starts, up to a dozen evaluations) and after each
 * headroom bisection, so a caller can let other work run between steps (a service keeps its event loop free while a
 * large search runs). Driving it to the end gives exactly searchScrews' answer.
 */
export function* searchSteps(plan: SizingPlan, ruleSet: RuleSet): Generator<void, SizingResult, void> {
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
    const collar = collarFor(plan, size);
    const toleranceClass = classFor(plan, size);
    const outsideDiameter = outsideFor(plan, size);
    const lengths = ratios.map((r) => ratioLength(size, r));
    for (const starts of plan.starts) {
      searched += ratios.length;
      let pick: Passing | null = null;
      for (let k = 0; k < ratios.length; k++) {
        const j = judged(withThread(plan.base, size, starts, lengths[k], collar, toleranceClass, outsideDiameter), ruleSet);
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
        // search.verdicts: a nut length whose verdict is not asked for is counted as passing but never listed
        if (plan.verdicts !== null && !plan.verdicts.includes(j.verdict)) continue;
        if (pick === null || VERDICT_ORDER[j.verdict] < VERDICT_ORDER[pick.verdict]) {
          pick = { design: j.design, evaluation: withoutTrace(j.evaluation), findings: j.findings, verdict: j.verdict, size, starts, ratio: ratios[k] };
        }
      }
      if (pick) best.push(pick);
      yield;
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

  const candidates: SizingCandidate[] = keyed.slice(0, plan.limit).map(({ p }, i) => {
    const checks = checksOf(p.design, p.evaluation, ruleSet.thresholds);
    return {
    rank: i + 1,
    size: p.size.designation,
    form: p.size.form,
    starts: p.starts,
    nutLength: lengthText(p.ratio * p.size.majorDiameter, p.size),
    nutLengthRatio: p.ratio,
    verdict: p.verdict,
    governing: sizingGoverning(governingCheck(checks)),
    checks,
    figures: figuresOf(p.design, p.evaluation, checks),
    design: candidateInput(plan, p.size, p.starts, p.ratio),
    };
  });
  const best3 = keyed.slice(0, Math.min(3, candidates.length)).map(({ p }) => p);

  const headroom: SizingHeadroom[] = [];
  for (const [i, c] of candidates.slice(0, 3).entries()) {
    yield;
    headroom.push({ rank: c.rank, size: c.size, starts: c.starts, nutLength: c.nutLength, ...loadHeadroom(best3[i].design, ruleSet, best3[i].evaluation) });
  }

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
 * rule set. The bracket starts around a first guess, the stated load times the closeness of the nearest
 * load-dependent check (exact when that check scales with the load, as stresses, pressures and drive demand do), and
 * widens by doubling steps until one end passes and the other blocks; it is then halved geometrically until it is
 * narrower than 0.01 %. The answer is rounded down to 5 significant figures, so the design passes at it and blocks at
 * 1 % more (the checks only get worse as the load grows; self-locking and whirl do not depend on it).
 */
export function loadHeadroom(design: Design, ruleSet: RuleSet, evaluation: Evaluation = evaluate(design)): { axialLoad: string | null; factor: number | null; blockedBy: string | null } {
  const at = (F: number) => firstBlockingRule(judged({ ...design, load: { ...design.load, axial: F } }, ruleSet).findings);
  const F0 = design.load.axial;
  const dependent = checkMargins(design, evaluation, ruleSet.thresholds).filter(loadDependent);
  const factors = dependent.map(closeness).filter((x) => x > 0 && Number.isFinite(x));
  const guess = F0 * (factors.length > 0 ? Math.max(1, Math.min(...factors)) : 2);
  let lo: number;
  let hi: number;
  let step = 0.9 * HEADROOM_TOLERANCE; // the guess is usually exact: the first bracket is already narrow enough
  let blockedBy = at(guess);
  if (blockedBy === null) {
    lo = guess;
    hi = guess * (1 + step);
    blockedBy = at(hi);
    while (blockedBy === null) {
      if (hi > F0 * 2 ** 40) return { axialLoad: null, factor: null, blockedBy: null };
      lo = hi;
      step *= 2;
      hi = lo * (1 + step);
      blockedBy = at(hi);
    }
  } else {
    hi = guess;
    lo = Math.max(F0, guess / (1 + step));
    for (let b = at(lo); lo > F0 && b !== null; b = at(lo)) {
      hi = lo;
      blockedBy = b;
      step *= 2;
      lo = Math.max(F0, lo / (1 + step));
    }
  }
  while (hi / lo > 1 + HEADROOM_TOLERANCE) {
    const mid = Math.sqrt(lo * hi);
    const b = at(mid);
    if (b === null) lo = mid;
    else {
      hi = mid;
      blockedBy = b;
    }
  }
  const load = floorSignificant(lo, HEADROOM_DIGITS);
  return { axialLoad: `${load} N`, factor: load / F0, blockedBy };
}

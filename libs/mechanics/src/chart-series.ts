/**
 * Chart series of a stored evaluation, read from its formula trace: the inputs the engine recorded when it computed
 * the revision (its own engine version), fed to the formulas the trace names. A view never recomputes a geometry,
 * a collar model or an end-condition constant from today's tables; what the trace does not hold is not drawn.
 * Pure; SI units.
 */
import type { Evaluation, TraceEntry } from './evaluate';
import { eulerCriticalLoad, johnsonCriticalLoad, lowerTorque, raiseTorque } from './mechanics';

const DEG = Math.PI / 180;

/** The trace keys each series reads, with what a reader calls them (labels stay beside the keys they name). */
export const CHART_TRACE_KEYS = {
  threadRaiseMin: ['torque.threadRaise.atMinFriction', 'thread raise torque at minimum friction'],
  threadRaiseMax: ['torque.threadRaise.atMaxFriction', 'thread raise torque at maximum friction'],
  raiseMin: ['torque.raise.atMinFriction', 'raise torque at minimum friction (thread + collar)'],
  raiseMax: ['torque.raise.atMaxFriction', 'raise torque at maximum friction (thread + collar)'],
  collarMin: ['torque.collar.atMinFriction', 'collar torque at minimum friction'],
  collarMax: ['torque.collar.atMaxFriction', 'collar torque at maximum friction'],
  transition: ['buckling.transitionSlenderness', 'transition slenderness (Johnson to Euler)'],
  critical: ['buckling.criticalLoad', 'critical load of the column'],
} as const;

export interface TorqueSweepPoint {
  /** Thread friction coefficient */
  readonly f: number;
  /** Collar friction used with it */
  readonly fc: number;
  readonly raise: number;
  readonly lower: number;
  readonly lowerThread: number;
}

export interface TorqueSweep {
  readonly points: readonly TorqueSweepPoint[];
  readonly range: { readonly min: number; readonly max: number };
  readonly boundaryFriction: number;
}

export interface ColumnCurve {
  /** Critical stress P_cr / A [Pa] against slenderness l/k */
  readonly johnson: readonly { readonly s: number; readonly stress: number }[];
  readonly euler: readonly { readonly s: number; readonly stress: number }[];
  /** Euler continued below the transition (where it does not govern) */
  readonly eulerBelow: readonly { readonly s: number; readonly stress: number }[];
  readonly transition: number;
  readonly yieldStrength: number;
  readonly design: { readonly s: number; readonly stress: number };
  readonly critical: { readonly s: number; readonly stress: number };
}

type Trace = Readonly<Record<string, TraceEntry | undefined>>;
const inputsOf = (trace: Trace, key: string): Readonly<Record<string, number>> | null => trace[key]?.inputs ?? null;

/**
 * Raise and lowering torque against thread friction, 0 to 1.5 × the larger of the range's maximum and the
 * self-locking boundary, from the traced thread inputs (F, d_m, l, alpha_n) and collar torques. Every collar model
 * gives a torque proportional to its friction coefficient (Shigley 10th ed. Eqs. (8-6), (16-23), (16-26)), so the
 * collar torque at f_c is the traced torque scaled by f_c; f_c moves linearly with f between the two traced ends
 * (extended beyond them, never below zero), so the curves pass through the tabulated torques at both ends.
 * Null when the trace lacks the torque entries.
 */
export function torqueSweepFromTrace(evaluation: Pick<Evaluation, 'trace' | 'selfLocking'>, steps = 60): TorqueSweep | null {
  const trace = evaluation.trace as Trace;
  const tMin = inputsOf(trace, CHART_TRACE_KEYS.threadRaiseMin[0]);
  const tMax = inputsOf(trace, CHART_TRACE_KEYS.threadRaiseMax[0]);
  const rMin = inputsOf(trace, CHART_TRACE_KEYS.raiseMin[0]);
  const rMax = inputsOf(trace, CHART_TRACE_KEYS.raiseMax[0]);
  if (tMin === null || tMax === null || rMin === null || rMax === null) return null;
  const { F, d_m: dm, l } = tMin;
  const alphaN = tMin.alpha_n * DEG;
  const fMin = tMin.f;
  const fMax = tMax.f;
  const fcMin = inputsOf(trace, CHART_TRACE_KEYS.collarMin[0])?.f_c ?? 0;
  const fcMax = inputsOf(trace, CHART_TRACE_KEYS.collarMax[0])?.f_c ?? 0;
  // Collar torque per unit of collar friction, from the traced torque at the larger friction
  const perFc = fcMax > 0 ? rMax.T_c / fcMax : fcMin > 0 ? rMin.T_c / fcMin : 0;
  const fcFor = (f: number): number =>
    fMax - fMin > 1e-12 ? Math.max(0, fcMin + ((f - fMin) * (fcMax - fcMin)) / (fMax - fMin)) : fMax > 0 ? (f * fcMax) / fMax : fcMax;
  const boundary = evaluation.selfLocking.boundaryFriction;
  const fEnd = 1.5 * Math.max(fMax, boundary, 0.01);
  const fs = new Set<number>([fMin, fMax]);
  for (let i = 0; i <= steps; i++) fs.add((fEnd * i) / steps);
  const points = [...fs]
    .sort((a, b) => a - b)
    .map((f) => {
      const fc = fcFor(f);
      const tc = perFc * fc;
      const lowerThread = lowerTorque(F, dm, l, f, alphaN);
      return { f, fc, raise: raiseTorque(F, dm, l, f, alphaN) + tc, lower: lowerThread + tc, lowerThread };
    });
  return { points, range: { min: fMin, max: fMax }, boundaryFriction: boundary };
}

/**
 * The Johnson and Euler branches of the column curve with the design point, from the traced column inputs (C, E,
 * S_y, A, l/k) of the critical-load entry: Shigley 9th ed. Eqs. (4-43) and (4-47). Null when the screw is not a
 * column (tension) or the trace lacks the entry.
 */
export function columnCurveFromTrace(evaluation: Pick<Evaluation, 'trace' | 'buckling'>, axialLoad: number, steps = 60): ColumnCurve | null {
  const b = evaluation.buckling;
  const c = inputsOf(evaluation.trace as Trace, CHART_TRACE_KEYS.critical[0]);
  if (!b.applies || b.criticalLoad === null || c === null) return null;
  const { C, E, S_y: Sy, A } = c;
  const slenderness = c['l/k'];
  const transition = b.transitionSlenderness;
  const sEnd = Math.max(1.4 * slenderness, 1.6 * transition);
  const johnson = [];
  for (let i = 0; i <= steps / 2; i++) {
    const s = (transition * i) / (steps / 2);
    johnson.push({ s, stress: johnsonCriticalLoad(C, E, Sy, A, s) / A });
  }
  const euler = [];
  for (let i = 0; i <= steps; i++) {
    const s = transition + ((sEnd - transition) * i) / steps;
    euler.push({ s, stress: eulerCriticalLoad(C, E, A, s) / A });
  }
  // Euler's hyperbola below the transition, drawn only up to 1.5 S_y so the plot keeps its scale
  const sStart = Math.sqrt((C * Math.PI ** 2 * E) / (1.5 * Sy));
  const eulerBelow = [];
  for (let i = 0; i <= steps / 3; i++) {
    const s = sStart + ((transition - sStart) * i) / (steps / 3);
    eulerBelow.push({ s, stress: eulerCriticalLoad(C, E, A, s) / A });
  }
  return {
    johnson,
    euler,
    eulerBelow,
    transition,
    yieldStrength: Sy,
    design: { s: slenderness, stress: axialLoad / A },
    critical: { s: slenderness, stress: b.criticalLoad / A },
  };
}

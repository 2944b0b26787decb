/**
 * How the report prints each engine formula: the kind (hence display unit) of every traced input and of the
 * result, and the equation with the values substituted. The equations themselves, symbols and sources stay in
 * the engine's FORMULAS registry; this file only knows how to lay the numbers into them.
 */
import type { QuantityKind } from '@leadline/presentation';

/** Formatted inputs by trace symbol, e.g. { F: '28.0 kN', d_m: '29.0 mm' } */
export type Substituted = Readonly<Record<string, string>>;

export interface FormulaPresentation {
  /** Kind of each trace input; inputs missing here fall back to SYMBOL_KINDS */
  readonly inputs?: Readonly<Record<string, QuantityKind>>;
  readonly result: QuantityKind;
  /** Right-hand side with values in place; absent: the report lists the inputs instead */
  readonly substitute?: (v: Substituted) => string;
}

/** Default kinds of trace symbols across formulas. */
export const SYMBOL_KINDS: Readonly<Record<string, QuantityKind>> = {
  F: 'force', F_t: 'force', P_cr: 'force',
  d: 'length', p: 'length', d_m: 'length', d_r: 'length', l: 'length', a_c: 'length', L_nut: 'length', h: 'length',
  a: 'length', b: 'length', b_n: 'length', D: 'length', D_o: 'length', D_i: 'length', d_c: 'length', L: 'length', k: 'length',
  f: 'coefficient', f_c: 'coefficient', f_min: 'coefficient',
  alpha: 'angle', alpha_n: 'angle', lambda: 'angle',
  T: 'torque', T_thread: 'torque', T_c: 'torque', T_R: 'torque', T_av: 'torque',
  sigma: 'stress', tau: 'stress', sigma_b: 'stress', S_y: 'stress', E: 'modulus',
  A: 'area', rho: 'density', C: 'ratio', beta_1L: 'ratio', n_s: 'count', n_t: 'ratio', 'l/k': 'ratio',
  n: 'revPerSecond', n_c: 'rpm', v: 'travelSpeed', v_s: 'slidingSpeed',
};

/** Wraps a value that carries a sign or unit in parentheses before it is squared or negated. */
const sq = (x: string): string => `(${x})²`;
const cube = (x: string): string => `(${x})³`;

const threadTorque = (sign: '+' | '−', other: '+' | '−') => (v: Substituted) =>
  `${v.F} × ${v.d_m}/2 × (${v.f} × π × ${v.d_m} ${sign} ${v.l} × cos ${v.alpha_n}) / (π × ${v.d_m} × cos ${v.alpha_n} ${other} ${v.f} × ${v.l})`;

const threadStress = {
  inputs: { F_t: 'force', d_m: 'length', h: 'length', d_r: 'length', a: 'length', b: 'length' },
} as const;

export const PRESENTATION: Readonly<Record<string, FormulaPresentation>> = {
  // geometry
  lead: { result: 'length', substitute: (v) => `${v.n_s} × ${v.p}` },
  'mean-diameter-half-pitch': { result: 'length', substitute: (v) => `${v.d} − ${v.p}/2` },
  'mean-diameter-stub-acme': { result: 'length', substitute: (v) => `${v.d} − 0.3 × ${v.p}` },
  'mean-diameter-60deg': { result: 'length', substitute: (v) => `${v.d} − 0.649519 × ${v.p}` },
  'mean-diameter-buttress': { result: 'length' },
  'minor-diameter-full-pitch': { result: 'length', substitute: (v) => `${v.d} − ${v.p}` },
  'minor-diameter-stub-acme': { result: 'length', substitute: (v) => `${v.d} − 0.6 × ${v.p}` },
  'minor-diameter-trapezoidal': { result: 'length', substitute: (v) => `${v.d} − ${v.p} − 2 × ${v.a_c}` },
  'minor-diameter-60deg': { result: 'length', substitute: (v) => `${v.d} − 1.226869 × ${v.p}` },
  'minor-diameter-buttress': { result: 'length' },
  'lead-angle': { result: 'angle', substitute: (v) => `atan(${v.l} / (π × ${v.d_m}))` },
  'normal-flank-angle': { result: 'angle', substitute: (v) => `atan(tan ${v.alpha} × cos ${v.lambda})` },
  'engaged-threads': { result: 'ratio', substitute: (v) => `${v.L_nut} / ${v.p}` },
  'tensile-stress-area-iso': { result: 'area', substitute: (v) => `(π/4) × (${v.d} − 0.938194 × ${v.p})²` },
  'tensile-stress-area-unified': { result: 'area', substitute: (v) => `0.7854 × (${v.d} − 0.9743 × ${v.p})²` },
  // torque
  'thread-raise-torque': { result: 'torque', substitute: threadTorque('+', '−') },
  'thread-lower-torque': { result: 'torque', substitute: threadTorque('−', '+') },
  'thread-raise-torque-sec-alpha': {
    result: 'torque',
    substitute: (v) => `${v.F} × ${v.d_m}/2 × (${v.l} + π × ${v.f} × ${v.d_m} × sec ${v.alpha}) / (π × ${v.d_m} − ${v.f} × ${v.l} × sec ${v.alpha})`,
  },
  'collar-torque-plain': { result: 'torque', substitute: (v) => `${v.F} × ${v.f_c} × ${v.d_c} / 2` },
  'collar-torque-rolling': { result: 'torque', substitute: (v) => `${v.F} × ${v.f_c} × ${v.d_c} / 2` },
  'collar-torque-uniform-wear': { result: 'torque', substitute: (v) => `${v.F} × ${v.f_c} × (${v.D_o} + ${v.D_i}) / 4` },
  'collar-torque-uniform-pressure': {
    result: 'torque',
    substitute: (v) => `${v.F} × ${v.f_c} × (${cube(v.D_o)} − ${cube(v.D_i)}) / (3 × (${sq(v.D_o)} − ${sq(v.D_i)}))`,
  },
  'raise-torque-total': { result: 'torque', substitute: (v) => `${v.T_thread} + ${v.T_c}` },
  'lower-torque-total': { result: 'torque', substitute: (v) => `${v.T_thread} + ${v.T_c}` },
  efficiency: { result: 'percent', substitute: (v) => `${v.F} × ${v.l} / (2π × ${v.T})` },
  'self-locking-margin': { result: 'ratio', substitute: (v) => `${v.f_min} / (cos ${v.alpha_n} × tan ${v.lambda})` },
  'back-driving-torque': { result: 'torque', substitute: (v) => `−[${threadTorque('−', '+')(v)}]` },
  // body stresses
  'body-axial-stress': { result: 'stress', substitute: (v) => `4 × (${v.F}) / (π × ${sq(v.d_r)})` },
  'body-torsion-stress': { result: 'stress', substitute: (v) => `16 × ${v.T} / (π × ${cube(v.d_r)})` },
  'von-mises-axial-torsion': { result: 'stress', substitute: (v) => `√(${sq(v.sigma)} + 3 × ${sq(v.tau)})` },
  // thread stresses
  'thread-bearing-stress': { ...threadStress, result: 'stress', substitute: (v) => `${v.F_t} / (π × ${v.d_m} × ${v.h})` },
  'thread-root-bending': { ...threadStress, result: 'stress', substitute: (v) => `6 × ${v.F_t} × ${v.a} / (π × ${v.d_r} × ${sq(v.b)})` },
  'thread-root-shear': { ...threadStress, result: 'stress', substitute: (v) => `3 × ${v.F_t} / (2π × ${v.d_r} × ${v.b})` },
  'thread-root-von-mises': {
    result: 'stress',
    substitute: (v) => `√(${sq(v.sigma_b)} + ${sq(v.sigma)} + |(${v.sigma_b}) × (${v.sigma})| + 3 × ${sq(v.tau)})`,
  },
  'thread-load-share-first': { inputs: { n_t: 'ratio' }, result: 'force', substitute: (v) => `max(0.38 × ${v.F}, ${v.F} / ${v.n_t})` },
  'thread-stripping-screw': { inputs: { D_1: 'length', t_s: 'length' }, result: 'stress', substitute: (v) => `${v.F} / (π × ${v.D_1} × ${v.t_s} × ${v.n_t})` },
  'thread-stripping-nut': { inputs: { d: 'length', t_n: 'length' }, result: 'stress', substitute: (v) => `${v.F} / (π × ${v.d} × ${v.t_n} × ${v.n_t})` },
  'nut-thread-root-bending': { inputs: { D_4: 'length', a_n: 'length', b_n: 'length' }, result: 'stress', substitute: (v) => `6 × ${v.F_t} × ${v.a_n} / (π × ${v.D_4} × ${sq(v.b_n)})` },
  'nut-thread-root-shear': { inputs: { D_4: 'length', b_n: 'length' }, result: 'stress', substitute: (v) => `3 × ${v.F_t} / (2π × ${v.D_4} × ${v.b_n})` },
  // column
  slenderness: { result: 'ratio', substitute: (v) => `${v.l} / ${v.k}` },
  'transition-slenderness': { result: 'ratio', substitute: (v) => `√(2π² × ${v.C} × ${v.E} / ${v.S_y})` },
  'euler-critical-load': { result: 'force', substitute: (v) => `${v.C} × π² × ${v.E} × ${v.A} / ${sq(v['l/k'])}` },
  'johnson-critical-load': {
    result: 'force',
    substitute: (v) => `${v.A} × (${v.S_y} − (${v.S_y} × ${v['l/k']} / (2π))² / (${v.C} × ${v.E}))`,
  },
  'buckling-safety-factor': { result: 'ratio', substitute: (v) => `${v.P_cr} / ${v.F}` },
  // whirl
  'critical-speed': {
    result: 'rpm',
    substitute: (v) => `${sq(v.beta_1L)} / (2π × ${sq(v.L)}) × √(${v.E} × ${sq(v.d_r)}/16 / ${v.rho}) × 60 s/min`,
  },
  'critical-speed-ratio': { inputs: { n: 'rpm', n_c: 'rpm' }, result: 'ratio', substitute: (v) => `${v.n} / ${v.n_c}` },
  // wear, speed, power
  'nut-bearing-pressure': { result: 'pressure', substitute: (v) => `${v.F} / (π × ${v.d_m} × ${v.h} × ${v.n_t})` },
  'sliding-velocity': { result: 'slidingSpeed', substitute: (v) => `π × ${v.d_m} × ${v.n} / cos ${v.lambda}` },
  pv: { inputs: { p: 'pressure' }, result: 'pv', substitute: (v) => `${v.p} × ${v.v_s}` },
  'rotational-speed-from-linear': { inputs: { v: 'travelSpeed' }, result: 'rpm', substitute: (v) => `${v.v} / ${v.l}` },
  'input-power': { result: 'power', substitute: (v) => `${v.T_R} × 2π × ${v.n}` },
  'linear-speed': { result: 'travelSpeed', substitute: (v) => `${v.l} × ${v.n}` },
  'drive-margin': { result: 'ratio', substitute: (v) => `${v.T_av} / ${v.T_R}` },
  // brake and back-driving
  'brake-holding-torque-no-friction': { result: 'torque', substitute: (v) => `${v.F} × ${v.l} / (2π)` },
  'brake-holding-torque-min-friction': { result: 'torque', substitute: (v) => `max(0, −[${threadTorque('−', '+')(v)}])` },
  'reverse-efficiency': { result: 'percent' },
  'brake-torque-ratio': { inputs: { T_brake: 'torque', T_0: 'torque' }, result: 'ratio', substitute: (v) => `${v.T_brake} / ${v.T_0}` },
  // whirl, partly fixed ends
  'critical-speed-partly-fixed': { inputs: { C: 'ratio' }, result: 'ratio', substitute: (v) => `π × √${v.C}` },
  'critical-speed-partly-fixed-factor': { inputs: { C: 'ratio', beta_1L: 'ratio' }, result: 'ratio', substitute: (v) => `π² × ${v.C} / ${sq(v.beta_1L)}` },
  // drive: inertia, acceleration, gearbox
  'load-mass-from-weight': { result: 'mass', substitute: (v) => `${v.F} / 9.80665 m/s²` },
  'screw-inertia': { inputs: { rho: 'density', L: 'length', d_r: 'length', d: 'length' }, result: 'inertia' },
  'load-inertia-reflected': { inputs: { m: 'mass', l: 'length' }, result: 'inertia', substitute: (v) => `${v.m} × (${v.l} / (2π))²` },
  'angular-acceleration-from-time': { inputs: { n: 'revPerSecond', t_a: 'time' }, result: 'angularAcceleration', substitute: (v) => `2π × ${v.n} / ${v.t_a}` },
  'angular-acceleration-from-linear': { inputs: { a_nut: 'linearAcceleration', l: 'length' }, result: 'angularAcceleration', substitute: (v) => `2π × ${v.a_nut} / ${v.l}` },
  'acceleration-torque': {
    inputs: { J_s: 'inertia', J_L: 'inertia', e: 'percent', alpha_acc: 'angularAcceleration' },
    result: 'torque',
    substitute: (v) => `(${v.J_s} + ${v.J_L} / ${v.e}) × ${v.alpha_acc}`,
  },
  'peak-torque': { inputs: { T_R: 'torque', T_a: 'torque' }, result: 'torque', substitute: (v) => `${v.T_R} + ${v.T_a}` },
  'motor-torque-through-gearbox': { inputs: { T: 'torque', i: 'ratio', eta_g: 'percent' }, result: 'torque', substitute: (v) => `${v.T} / (${v.i} × ${v.eta_g})` },
  'motor-holding-torque-through-gearbox': { inputs: { T: 'torque', i: 'ratio', eta_r: 'percent' }, result: 'torque', substitute: (v) => `${v.T} × ${v.eta_r} / ${v.i}` },
};

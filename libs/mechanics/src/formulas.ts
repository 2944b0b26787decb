/**
 * Every formula the engine uses, as data: an id that records store, the equation a report prints,
 * and where it comes from. One place, so that a test can prove none lacks a source.
 *
 * Equation numbers of Shigley 10th ed., Juvinall 5th ed. and Bhandari 3rd ed. are from memory;
 * Shigley Table 4-2 (9th ed.) was read (shared reference data), the formulas themselves are standard.
 */
export interface Formula {
  /** Stable id stored with each traced value, e.g. "thread-raise-torque" */
  readonly id: string;
  /** Symbol of the result, e.g. "T_R" */
  readonly symbol: string;
  /** The equation as printed in a report (plain text, source's symbols) */
  readonly equation: string;
  /** Book (edition, equation or table) or standard (clause) */
  readonly source: string;
}

const SHIGLEY = "Budynas & Nisbett, Shigley's Mechanical Engineering Design, 10th ed.";
const JUVINALL = 'Juvinall & Marshek, Fundamentals of Machine Component Design, 5th ed.';

const list: readonly Formula[] = [
  // geometry
  { id: 'lead', symbol: 'l', equation: 'l = n_s p', source: `${SHIGLEY}, Sec. 8-2 (lead of a multiple-start thread)` },
  { id: 'mean-diameter-half-pitch', symbol: 'd_m', equation: 'd_m = d - p/2', source: `${SHIGLEY}, Fig. 8-3 (square, Acme); ISO 2901 d2 = d - 0.5P (trapezoidal)` },
  { id: 'mean-diameter-stub-acme', symbol: 'd_m', equation: 'd_m = d - 0.3 p', source: 'ASME B1.8 basic pitch diameter (from memory)' },
  { id: 'mean-diameter-60deg', symbol: 'd_m', equation: 'd_m = d - 0.649519 p', source: 'ISO 68-1 / ASME B1.1 basic pitch diameter d2 = d - (3/4)H, H = 0.866025p' },
  { id: 'mean-diameter-buttress', symbol: 'd_m', equation: 'd_m = d - h', source: 'ASME B1.9 (7/45: h = 0.6p) and DIN 513 (3/30: H1 = 0.75P) basic pitch diameter (from memory)' },
  { id: 'minor-diameter-full-pitch', symbol: 'd_r', equation: 'd_r = d - p', source: `${SHIGLEY}, Fig. 8-3 (square); ASME B1.5 basic minor diameter (Acme)` },
  { id: 'minor-diameter-stub-acme', symbol: 'd_r', equation: 'd_r = d - 0.6 p', source: 'ASME B1.8 basic minor diameter (from memory)' },
  { id: 'minor-diameter-trapezoidal', symbol: 'd_3', equation: 'd_3 = d - P - 2 a_c', source: 'ISO 2901 basic profile, d3 = d - 2h3, h3 = 0.5P + ac' },
  { id: 'minor-diameter-60deg', symbol: 'd_3', equation: 'd_3 = d - 1.226869 p', source: 'ISO 724 / ISO 898-1: d3 = d1 - H/6' },
  { id: 'minor-diameter-buttress', symbol: 'd_3', equation: 'd_3 = d - 2 h_3', source: 'ASME B1.9 (7/45: h_s = 0.66271p) and DIN 513 (3/30: h3 = 0.86777P), from memory' },
  { id: 'lead-angle', symbol: 'lambda', equation: 'lambda = atan(l / (pi d_m))', source: `${SHIGLEY}, Eq. (8-1) derivation, Fig. 8-6` },
  { id: 'normal-flank-angle', symbol: 'alpha_n', equation: 'tan alpha_n = tan alpha cos lambda', source: `${JUVINALL}, Sec. 10.3, Eq. (10.3) (equation number from memory)` },
  { id: 'engaged-threads', symbol: 'n_t', equation: 'n_t = L_nut / p', source: `${SHIGLEY}, Sec. 8-2 (engaged threads)` },
  // torque
  { id: 'thread-raise-torque', symbol: 'T_R,thread', equation: 'T = F d_m/2 (f pi d_m + l cos alpha_n) / (pi d_m cos alpha_n - f l)', source: `${JUVINALL}, Eq. (10.4); reduces to ${SHIGLEY}, Eq. (8-1) for alpha = 0` },
  { id: 'thread-lower-torque', symbol: 'T_L,thread', equation: 'T = F d_m/2 (f pi d_m - l cos alpha_n) / (pi d_m cos alpha_n + f l)', source: `${JUVINALL}, Eq. (10.5); reduces to ${SHIGLEY}, Eq. (8-2) for alpha = 0` },
  { id: 'thread-raise-torque-sec-alpha', symbol: 'T_R,sec', equation: 'T = F d_m/2 (l + pi f d_m sec alpha) / (pi d_m - f l sec alpha)', source: `${SHIGLEY}, Eq. (8-5) (approximation: sec alpha for sec alpha_n)` },
  { id: 'collar-torque-plain', symbol: 'T_c', equation: 'T_c = F f_c d_c / 2', source: `${SHIGLEY}, Eq. (8-6)` },
  { id: 'collar-torque-rolling', symbol: 'T_c', equation: 'T_c = F f_c d_c / 2 (f_c: rolling friction coefficient of the bearing)', source: `${SHIGLEY}, Eq. (8-6) with the bearing's rolling coefficient` },
  { id: 'collar-torque-uniform-wear', symbol: 'T_c', equation: 'T_c = F f_c (D_o + D_i) / 4', source: `${SHIGLEY}, Sec. 16-4 uniform-wear model, Eq. (16-23) applied to a flat annular collar` },
  { id: 'collar-torque-uniform-pressure', symbol: 'T_c', equation: 'T_c = F f_c (D_o^3 - D_i^3) / (3 (D_o^2 - D_i^2))', source: `${SHIGLEY}, Sec. 16-4 uniform-pressure model, Eq. (16-26) applied to a flat annular collar` },
  { id: 'raise-torque-total', symbol: 'T_R', equation: 'T_R = T_R,thread + T_c', source: `${SHIGLEY}, Sec. 8-2 (thread and collar torques add)` },
  { id: 'lower-torque-total', symbol: 'T_L', equation: 'T_L = T_L,thread + T_c (negative: the load back-drives)', source: `${SHIGLEY}, Sec. 8-2, Ex. 8-1(b)` },
  { id: 'efficiency', symbol: 'e', equation: 'e = F l / (2 pi T_R)', source: `${SHIGLEY}, Eq. (8-4)` },
  { id: 'self-locking-margin', symbol: 'm_SL', equation: 'm_SL = f_min / (cos alpha_n tan lambda); locks when m_SL > 1', source: `${JUVINALL}, Eq. (10.6) condition f > tan lambda cos alpha_n; ${SHIGLEY}, Eq. (8-3) for alpha = 0` },
  { id: 'back-driving-torque', symbol: 'T_bd', equation: 'T_bd = -T_L,thread at f_min (torque the load exerts on an unlocked screw)', source: `${JUVINALL}, Eq. (10.5), sign convention of Sec. 10.3` },
  // body stresses
  { id: 'body-axial-stress', symbol: 'sigma', equation: 'sigma = -/+ 4F / (pi d_r^2)', source: `${SHIGLEY}, Eq. (8-8), Ex. 8-1(d)` },
  { id: 'body-torsion-stress', symbol: 'tau', equation: 'tau = 16 T / (pi d_r^3)', source: `${SHIGLEY}, Eq. (8-7)` },
  { id: 'von-mises-axial-torsion', symbol: "sigma'", equation: "sigma' = sqrt(sigma^2 + 3 tau^2)", source: `${SHIGLEY}, Eq. (5-15) (von Mises, plane stress)` },
  // thread stresses
  { id: 'thread-bearing-stress', symbol: 'sigma_B', equation: 'sigma_B = F_t / (pi d_m h)', source: `${SHIGLEY}, Eq. (8-9) with h = p/2 (first thread F_t = 0.38F, after Marshek)` },
  { id: 'thread-root-bending', symbol: 'sigma_b', equation: 'sigma_b = 6 F_t a / (pi d_r b^2); square: 6 F_t / (pi d_r p)', source: `${SHIGLEY}, Eq. (8-10), cantilever thread of root width b loaded at arm a = (d_m - d_r)/2` },
  { id: 'thread-root-shear', symbol: 'tau_r', equation: 'tau_r = 3 F_t / (2 pi d_r b); square: 3 F_t / (pi d_r p)', source: `${SHIGLEY}, Eq. (8-11), 3V/(2A) at the thread root` },
  { id: 'thread-root-von-mises', symbol: "sigma'_root", equation: "sigma' = sqrt(sigma_b^2 + sigma^2 + |sigma_b sigma| + 3 tau^2) (worse of the two root fillets, sigma_x = +/- sigma_b)", source: `${SHIGLEY}, Sec. 8-2 root stress element (Ex. 8-1(g)) taken with both signs of the bending stress, Eq. (5-14)` },
  { id: 'thread-load-share-first', symbol: 'F_t', equation: 'F_t = max(0.38 F, F / n_t) (first engaged thread, never below the mean share)', source: `${SHIGLEY}, Sec. 8-2, after Marshek (first thread carries 0.38F, from memory); F / n_t by statics for short nuts` },
  { id: 'thread-load-share-even', symbol: 'F_t', equation: 'F_t = F / n_t (even sharing)', source: `${SHIGLEY}, Eqs. (8-9) to (8-11) with n_t engaged threads` },
  { id: 'thread-stripping-screw', symbol: 'tau_s', equation: 'tau_s = F / (pi D_1 t_s n_t), t_s = screw thread thickness at the nut minor diameter D_1', source: "Machinery's Handbook, 29th ed. (edition from memory), 'Strength of screw threads': external threads shear at the internal minor diameter (A_s = pi n L_e D_n,max [1/(2n) + 0.57735 (E_s,min - D_n,max)] for 60 deg, from memory); FED-STD-H28/2 same plane" },
  { id: 'thread-stripping-nut', symbol: 'tau_n', equation: 'tau_n = F / (pi d t_n n_t), t_n = nut thread thickness at the screw major diameter d', source: "Machinery's Handbook, 29th ed. (edition from memory), 'Strength of screw threads': internal threads shear at the external major diameter (A_n = pi n L_e d_s,min [1/(2n) + 0.57735 (d_s,min - E_n,max)], from memory); FED-STD-H28/2 same plane" },
  { id: 'nut-thread-root-bending', symbol: 'sigma_b,n', equation: 'sigma_b,n = 6 F_t a_n / (pi D_4 b_n^2), a_n = (D_4 - d_m)/2', source: `${SHIGLEY}, Eq. (8-10) cantilever thread applied to the nut thread at its root (major) diameter D_4` },
  { id: 'nut-thread-root-shear', symbol: 'tau_r,n', equation: 'tau_r,n = 3 F_t / (2 pi D_4 b_n)', source: `${SHIGLEY}, Eq. (8-11), 3V/(2A) at the nut thread root` },
  { id: 'tensile-stress-area-iso', symbol: 'A_s', equation: 'A_s = (pi/4) ((d_2 + d_3)/2)^2 = (pi/4) (d - 0.938194 P)^2', source: 'ISO 898-1 nominal stress area A_s,nom (formula from memory)' },
  { id: 'tensile-stress-area-unified', symbol: 'A_s', equation: 'A_s = 0.7854 (d - 0.9743/n)^2', source: 'ASME B1.1 tensile stress area (formula from memory)' },
  // column
  { id: 'radius-of-gyration-round', symbol: 'k', equation: 'k = d_r / 4', source: `${SHIGLEY}, Sec. 4-12 (solid round: k = sqrt(I/A) = d/4)` },
  { id: 'slenderness', symbol: 'l/k', equation: 'l/k', source: `${SHIGLEY}, Sec. 4-12` },
  { id: 'transition-slenderness', symbol: '(l/k)_1', equation: '(l/k)_1 = sqrt(2 pi^2 C E / S_y)', source: `Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., Sec. 4-13, Eq. (4-45)` },
  { id: 'euler-critical-load', symbol: 'P_cr', equation: 'P_cr = C pi^2 E A / (l/k)^2', source: `Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., Eq. (4-43) (Euler; cited by Table 4-2)` },
  { id: 'johnson-critical-load', symbol: 'P_cr', equation: 'P_cr = A (S_y - (S_y l / (2 pi k))^2 / (C E))', source: `Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., Sec. 4-14, Eq. (4-46) (J. B. Johnson parabola)` },
  { id: 'buckling-safety-factor', symbol: 'n_b', equation: 'n_b = P_cr / F', source: `${SHIGLEY}, Sec. 4-12` },
  // whirl
  { id: 'critical-speed', symbol: 'n_c', equation: 'n_c = (beta_1 L)^2 / (2 pi L^2) sqrt(E I / (rho A)) x 60, I/A = d_r^2/16', source: 'Thomson, Theory of Vibration with Applications, Sec. 9.5 and Appendix D (Euler-Bernoulli beam, first mode)' },
  { id: 'critical-speed-ratio', symbol: 'n/n_c', equation: 'n / n_c', source: 'common practice: operate below 80 % of the first critical speed' },
  // wear and power
  { id: 'nut-bearing-pressure', symbol: 'p', equation: 'p = F / (pi d_m h n_t)', source: `${SHIGLEY}, Eq. (8-9) with all engaged threads; Bhandari, Design of Machine Elements, 3rd ed., Sec. 6.10 (unit bearing pressure)` },
  { id: 'sliding-velocity', symbol: 'v_s', equation: 'v_s = pi d_m n / cos lambda', source: 'Bhandari, Design of Machine Elements, 3rd ed., Sec. 6.13 (rubbing speed at the mean diameter, from memory)' },
  { id: 'pv', symbol: 'pV', equation: 'pV = p v_s', source: 'Mott, Machine Elements in Mechanical Design, Ch. 16, Table 16-1 (pV factor, boundary lubrication)' },
  { id: 'rotational-speed-from-linear', symbol: 'n', equation: 'n = v / l', source: `${SHIGLEY}, Sec. 8-2 (one turn advances one lead)` },
  { id: 'linear-speed', symbol: 'v', equation: 'v = l n', source: `${SHIGLEY}, Sec. 8-2 (one turn advances one lead)` },
  { id: 'input-power', symbol: 'P', equation: 'P = T_R omega, omega = 2 pi n', source: `${SHIGLEY}, Eq. (3-40) (power = torque x angular speed)` },
  { id: 'drive-margin', symbol: 'T_av/T_R', equation: 'T_av / T_R,max (T_R,max: peak torque at the motor when acceleration or a gearbox is given)', source: 'common practice: the drive must exceed the starting raise torque at maximum friction' },
  // brake and back-driving
  { id: 'brake-holding-torque-no-friction', symbol: 'T_0', equation: 'T_0 = F l / (2 pi)', source: `${SHIGLEY}, Eq. (8-4) with e = 1; the limit f -> 0 of -T_L, ${JUVINALL}, Eq. (10.5)` },
  { id: 'brake-holding-torque-min-friction', symbol: 'T_h', equation: 'T_h = max(0, -T_L,thread) at f_min, collar ignored', source: `${JUVINALL}, Eq. (10.5) (lowering torque; equation number from memory)` },
  { id: 'reverse-efficiency', symbol: "e'", equation: "e' = -2 pi T_L,thread / (F l) at f_min; square thread tan(lambda - phi) / tan lambda", source: `energy balance on ${JUVINALL}, Eq. (10.5), the inverse of ${SHIGLEY}, Eq. (8-4); square-thread form from memory` },
  { id: 'brake-torque-ratio', symbol: 'T_brake/T_0', equation: 'T_brake / T_0 at the brake shaft', source: 'common practice: the brake holds the load with thread friction lost (f -> 0), with a factor from the rule set' },
  // whirl with partly fixed ends
  { id: 'critical-speed-partly-fixed', symbol: "(beta_1 L)'", equation: "(beta_1 L)' = pi sqrt(C), C the recommended end-condition constant", source: `common practice: simply supported shaft over the column's effective length L / sqrt(C) (Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., Table 4-2 recommended C; Thomson, Theory of Vibration with Applications, Table 9.5-1)` },
  { id: 'critical-speed-partly-fixed-factor', symbol: "n_c'/n_c", equation: "n_c' / n_c = pi^2 C / (beta_1 L)^2", source: 'common practice: ratio of the partly fixed to the classical first-mode frequency factor squared (speed scales with (beta_1 L)^2, Thomson Sec. 9.5)' },
  // drive
  { id: 'load-mass-from-weight', symbol: 'm', equation: 'm = F / g_n, g_n = 9.80665 m/s^2', source: 'NIST SP 811 (2008), Sec. 8.2: standard acceleration of gravity (3rd CGPM, 1901)' },
  { id: 'screw-inertia', symbol: 'J_s', equation: 'J_s = (pi rho L / 32) (d_r^4 + d^4) / 2', source: 'solid cylinder J = pi rho L d^4 / 32 (Meriam & Kraige, Engineering Mechanics: Dynamics, 7th ed., Table D/4, from memory); thread ridges as half the annulus between d_r and d: common practice' },
  { id: 'load-inertia-reflected', symbol: 'J_L', equation: 'J_L = m (l / (2 pi))^2', source: `kinetic energy balance m v^2/2 = J_L omega^2/2 with v = omega l / (2 pi) (${SHIGLEY}, Sec. 8-2 kinematics)` },
  { id: 'angular-acceleration-from-time', symbol: 'alpha_acc', equation: 'alpha_acc = 2 pi n / t_a', source: 'uniform angular acceleration omega = alpha t (Meriam & Kraige, Engineering Mechanics: Dynamics, 7th ed., Sec. 5/2, from memory)' },
  { id: 'angular-acceleration-from-linear', symbol: 'alpha_acc', equation: 'alpha_acc = 2 pi a / l', source: `${SHIGLEY}, Sec. 8-2 (one turn advances one lead), differentiated in time` },
  { id: 'acceleration-torque', symbol: 'T_a', equation: 'T_a = (J_s + J_L / e) alpha_acc, e at maximum friction', source: 'T = J alpha (Meriam & Kraige, Engineering Mechanics: Dynamics, 7th ed., Eq. 6/1, from memory); load share through the screw efficiency: common practice' },
  { id: 'peak-torque', symbol: 'T_peak', equation: 'T_peak = T_R,max + T_a', source: 'common practice: the drive must supply the steady raise torque and the acceleration torque at once' },
  { id: 'motor-torque-through-gearbox', symbol: 'T_m', equation: 'T_m = T / (i eta_g)', source: `power balance through a gear train (${SHIGLEY}, Sec. 13-13, from memory)` },
  { id: 'motor-holding-torque-through-gearbox', symbol: 'T_h,m', equation: 'T_h,m = T_0 eta_r / i', source: `power balance with power flowing from the output, reverse efficiency eta_r (${SHIGLEY}, Sec. 13-13, from memory)` },
];

/** The formula registry, by id. */
export const FORMULAS: Readonly<Record<string, Formula>> = Object.freeze(
  Object.fromEntries(list.map((f) => [f.id, f])),
);

/** Looks up a formula; throws on an unknown id (a programming error, caught by the registry test). */
export function formula(id: string): Formula {
  const f = FORMULAS[id];
  if (!f) throw new Error(`no formula registered as "${id}"`);
  return f;
}

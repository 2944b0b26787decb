/**
 * Power-screw mechanics as pure functions. SI base units in and out (N, m, Pa, N*m, rad, s);
 * each function names its equation and source, and its formula id in ./formulas.ts.
 */

/**
 * Lead angle.
 * lambda = atan(l / (pi d_m))
 * @param l - lead [m]
 * @param dm - mean (pitch) diameter [m]
 * @returns lead angle [rad]
 * Source: Shigley 10th ed., Sec. 8-2, Fig. 8-6 (unrolled thread). Formula id: lead-angle.
 */
export function leadAngle(l: number, dm: number): number {
  return Math.atan(l / (Math.PI * dm));
}

/**
 * Flank angle measured in the plane normal to the thread.
 * tan alpha_n = tan alpha cos lambda
 * @param alpha - flank angle in the axial plane [rad]
 * @param lambda - lead angle [rad]
 * @returns alpha_n [rad]
 * Source: Juvinall & Marshek 5th ed., Eq. (10.3) (number from memory). Formula id: normal-flank-angle.
 */
export function normalFlankAngle(alpha: number, lambda: number): number {
  return Math.atan(Math.tan(alpha) * Math.cos(lambda));
}

/**
 * Thread torque to raise a load, exact normal-plane form.
 * T = F d_m/2 (f pi d_m + l cos alpha_n) / (pi d_m cos alpha_n - f l)
 * @param F - axial load magnitude [N]
 * @param dm - mean diameter [m]
 * @param l - lead [m]
 * @param f - thread friction coefficient [-]
 * @param alphaN - normal flank angle [rad]
 * @returns torque [N*m]; valid while pi d_m cos alpha_n > f l (always for real screws).
 * Source: Juvinall & Marshek 5th ed., Eq. (10.4); Shigley 10th ed., Eq. (8-1) for alpha = 0. Id: thread-raise-torque.
 */
export function raiseTorque(F: number, dm: number, l: number, f: number, alphaN: number): number {
  const c = Math.cos(alphaN);
  return ((F * dm) / 2) * ((f * Math.PI * dm + l * c) / (Math.PI * dm * c - f * l));
}

/**
 * Thread torque to lower a load, exact normal-plane form; negative when the load back-drives the screw.
 * T = F d_m/2 (f pi d_m - l cos alpha_n) / (pi d_m cos alpha_n + f l)
 * @returns torque [N*m] (arguments as raiseTorque)
 * Source: Juvinall & Marshek 5th ed., Eq. (10.5); Shigley 10th ed., Eq. (8-2) for alpha = 0. Id: thread-lower-torque.
 */
export function lowerTorque(F: number, dm: number, l: number, f: number, alphaN: number): number {
  const c = Math.cos(alphaN);
  return ((F * dm) / 2) * ((f * Math.PI * dm - l * c) / (Math.PI * dm * c + f * l));
}

/**
 * Raise torque with the common approximation sec(alpha) in place of sec(alpha_n), reported beside the exact value.
 * T = F d_m/2 (l + pi f d_m sec alpha) / (pi d_m - f l sec alpha)
 * @param alpha - flank angle in the axial plane [rad]
 * @returns torque [N*m]
 * Source: Shigley 10th ed., Eq. (8-5). Id: thread-raise-torque-sec-alpha.
 */
export function raiseTorqueSecAlpha(F: number, dm: number, l: number, f: number, alpha: number): number {
  const sec = 1 / Math.cos(alpha);
  return ((F * dm) / 2) * ((l + Math.PI * f * dm * sec) / (Math.PI * dm - f * l * sec));
}

/**
 * Collar torque of a thrust collar acting at one mean diameter (plain collar, or a rolling bearing with its rolling coefficient).
 * T_c = F f_c d_c / 2
 * @param fc - collar friction coefficient [-]
 * @param dc - collar mean diameter [m]
 * @returns torque [N*m]
 * Source: Shigley 10th ed., Eq. (8-6). Id: collar-torque-plain / collar-torque-rolling.
 */
export function collarTorqueMeanDiameter(F: number, fc: number, dc: number): number {
  return (F * fc * dc) / 2;
}

/**
 * Collar torque of a flat annular collar, uniform-wear model (p r = constant).
 * T_c = F f_c (D_o + D_i) / 4
 * @param Do - outer diameter [m]
 * @param Di - inner diameter [m]
 * @returns torque [N*m]; the lower of the two models, right for a run-in collar.
 * Source: Shigley 10th ed., Sec. 16-4, Eq. (16-23) (number from memory). Id: collar-torque-uniform-wear.
 */
export function collarTorqueUniformWear(F: number, fc: number, Do: number, Di: number): number {
  return (F * fc * (Do + Di)) / 4;
}

/**
 * Collar torque of a flat annular collar, uniform-pressure model (new collar).
 * T_c = F f_c (D_o^3 - D_i^3) / (3 (D_o^2 - D_i^2))
 * @returns torque [N*m]; the higher, conservative model.
 * Source: Shigley 10th ed., Sec. 16-4, Eq. (16-26) (number from memory). Id: collar-torque-uniform-pressure.
 */
export function collarTorqueUniformPressure(F: number, fc: number, Do: number, Di: number): number {
  return (F * fc * (Do ** 3 - Di ** 3)) / (3 * (Do ** 2 - Di ** 2));
}

/**
 * Efficiency of raising: work out over work in for one turn.
 * e = F l / (2 pi T)
 * @param T - raise torque [N*m] (thread alone, or thread plus collar)
 * @returns efficiency [-]
 * Source: Shigley 10th ed., Eq. (8-4). Id: efficiency.
 */
export function efficiency(F: number, l: number, T: number): number {
  return (F * l) / (2 * Math.PI * T);
}

/**
 * Self-locking margin of the thread alone: ratio of the friction present to the friction needed to hold.
 * m = f / (cos alpha_n tan lambda); the screw self-locks when m > 1.
 * @returns margin [-]
 * Source: Juvinall & Marshek 5th ed., Eq. (10.6) (f > tan lambda cos alpha_n); Shigley 10th ed., Eq. (8-3). Id: self-locking-margin.
 */
export function selfLockingMargin(f: number, lambda: number, alphaN: number): number {
  return f / (Math.cos(alphaN) * Math.tan(lambda));
}

/**
 * Nominal axial stress on the root (minor-diameter) area; signed, compression negative.
 * sigma = -/+ 4F / (pi d_r^2)
 * @param Fsigned - axial force, negative in compression [N]
 * @param dr - minor diameter [m]
 * @returns stress [Pa]
 * Source: Shigley 10th ed., Eq. (8-8). Id: body-axial-stress.
 */
export function bodyAxialStress(Fsigned: number, dr: number): number {
  return (4 * Fsigned) / (Math.PI * dr * dr);
}

/**
 * Torsional shear stress in the screw body on the root diameter.
 * tau = 16 T / (pi d_r^3)
 * @returns stress [Pa]
 * Source: Shigley 10th ed., Eq. (8-7). Id: body-torsion-stress.
 */
export function bodyTorsionStress(T: number, dr: number): number {
  return (16 * T) / (Math.PI * dr ** 3);
}

/**
 * von Mises stress for one normal and one shear stress.
 * sigma' = sqrt(sigma^2 + 3 tau^2)
 * @returns stress [Pa]
 * Source: Shigley 10th ed., Eq. (5-15) with sigma_y = 0 (von Mises). Id: von-mises-axial-torsion.
 */
export function vonMisesAxialTorsion(sigma: number, tau: number): number {
  return Math.sqrt(sigma * sigma + 3 * tau * tau);
}

/**
 * von Mises stress of the thread-root element: bending sigma_x, body axial sigma_y, torsion tau_yz.
 * sigma' = sqrt(sigma_x^2 + sigma_y^2 - sigma_x sigma_y + 3 tau^2)
 * @returns stress [Pa]
 * Source: Shigley 10th ed., Sec. 8-2, stress element of Ex. 8-1(g), Eq. (5-14). Id: thread-root-von-mises.
 */
export function rootVonMises(sigmaX: number, sigmaY: number, tau: number): number {
  return Math.sqrt(sigmaX * sigmaX + sigmaY * sigmaY - sigmaX * sigmaY + 3 * tau * tau);
}

/**
 * Bearing stress on the flanks of threads carrying a load F_t.
 * sigma_B = F_t / (pi d_m h)
 * @param Ft - load on the threads considered [N]
 * @param h - engaged flank height [m]
 * @returns bearing stress magnitude [Pa]
 * Source: Shigley 10th ed., Eq. (8-9) (with h = p/2: 2F/(pi d_m n_t p)). Id: thread-bearing-stress.
 */
export function threadBearingStress(Ft: number, dm: number, h: number): number {
  return Ft / (Math.PI * dm * h);
}

/**
 * Bending stress at the thread root: the thread is a cantilever of width pi d_r, root thickness b, arm a.
 * sigma_b = 6 F_t a / (pi d_r b^2); for a square thread (a = p/4, b = p/2) this is Shigley's 6F_t / (pi d_r p).
 * @param a - arm from the pitch line to the root [m]
 * @param b - thread thickness at the root [m]
 * @returns stress [Pa]
 * Source: Shigley 10th ed., Eq. (8-10) and its cantilever derivation. Id: thread-root-bending.
 */
export function threadRootBending(Ft: number, dr: number, a: number, b: number): number {
  return (6 * Ft * a) / (Math.PI * dr * b * b);
}

/**
 * Transverse shear stress at the thread root, 3V/(2A) on the root section.
 * tau = 3 F_t / (2 pi d_r b); for a square thread (b = p/2) this is Shigley's 3F_t / (pi d_r p).
 * @returns stress [Pa]
 * Source: Shigley 10th ed., Eq. (8-11). Id: thread-root-shear.
 */
export function threadRootShear(Ft: number, dr: number, b: number): number {
  return (3 * Ft) / (2 * Math.PI * dr * b);
}

/**
 * Mean shear stress over a cylinder of threads that would strip.
 * tau = F / (pi D b n_t)
 * @param D - shear diameter: the nut's minor diameter for the screw's threads, the screw's major diameter for the nut's [m]
 * @param b - thickness of the stripping thread at that diameter [m]
 * @param nt - engaged threads [-]
 * @returns stress [Pa]
 * Source: Bhandari, Design of Machine Elements, 3rd ed., Sec. 6.10 (from memory), on the shear planes of
 * Machinery's Handbook "Strength of screw threads" (see strippingArea). Id: thread-stripping-screw / -nut.
 */
export function strippingShear(F: number, D: number, b: number, nt: number): number {
  return F / (Math.PI * D * b * nt);
}

/** End conditions of a screw treated as a column or a rotating shaft. */
export const END_CONDITIONS = ['fixed-free', 'pinned-pinned', 'fixed-pinned', 'fixed-fixed'] as const;
export type EndCondition = (typeof END_CONDITIONS)[number];

/**
 * End-condition constants C for Euler columns.
 * Source: Shigley 9th ed., Table 4-2 (public source, read): theoretical 1/4, 1, 2, 4; recommended 1/4, 1, 1.2, 1.2.
 */
export const END_CONDITION_CONSTANT: Readonly<Record<'theoretical' | 'recommended', Record<EndCondition, number>>> = {
  theoretical: { 'fixed-free': 0.25, 'pinned-pinned': 1, 'fixed-pinned': 2, 'fixed-fixed': 4 },
  recommended: { 'fixed-free': 0.25, 'pinned-pinned': 1, 'fixed-pinned': 1.2, 'fixed-fixed': 1.2 },
};

/**
 * First-mode frequency factors beta_1 L of a uniform beam.
 * Source: Thomson, Theory of Vibration with Applications, Appendix D and Table 9.5-1 (public source via the
 * shared reference data): 1.8751 (clamped-free), pi (simply supported), 3.9266 (clamped-hinged), 4.7300 (clamped-clamped).
 */
export const WHIRL_FREQUENCY_FACTOR: Readonly<Record<EndCondition, number>> = {
  'fixed-free': 1.875104,
  'pinned-pinned': Math.PI,
  'fixed-pinned': 3.926602,
  'fixed-fixed': 4.730041,
};

/**
 * Transition slenderness where the Johnson parabola meets the Euler curve.
 * (l/k)_1 = sqrt(2 pi^2 C E / S_y)
 * @returns slenderness [-]
 * Source: Shigley 9th ed., Eq. (4-45) (number from memory). Id: transition-slenderness.
 */
export function transitionSlenderness(C: number, E: number, Sy: number): number {
  return Math.sqrt((2 * Math.PI ** 2 * C * E) / Sy);
}

/**
 * Euler critical load of a long column.
 * P_cr = C pi^2 E A / (l/k)^2
 * @param A - section area [m^2]
 * @param slenderness - l/k [-]
 * @returns load [N]
 * Source: Shigley 9th ed., Eq. (4-43) (Euler), cited by Table 4-2. Id: euler-critical-load.
 */
export function eulerCriticalLoad(C: number, E: number, A: number, slenderness: number): number {
  return (C * Math.PI ** 2 * E * A) / slenderness ** 2;
}

/**
 * J. B. Johnson critical load of an intermediate column (l/k below the transition).
 * P_cr = A (S_y - (S_y (l/k) / (2 pi))^2 / (C E))
 * @returns load [N]
 * Source: Shigley 9th ed., Eq. (4-46) (number from memory). Id: johnson-critical-load.
 */
export function johnsonCriticalLoad(C: number, E: number, Sy: number, A: number, slenderness: number): number {
  return A * (Sy - ((Sy * slenderness) / (2 * Math.PI)) ** 2 / (C * E));
}

/**
 * First critical (whirling) speed of a uniform solid round shaft between supports.
 * n_c = (beta_1 L)^2 (60 / (2 pi)) (k / L^2) sqrt(E / rho), k = d / 4
 * @param betaL - frequency factor beta_1 L [-]
 * @param d - section diameter (root diameter) [m]
 * @param L - length between supports [m]
 * @param E - elastic modulus [Pa]
 * @param rho - mass density [kg/m^3]
 * @returns speed [rev/min]; neglects gyroscopic and axial-load effects.
 * Source: Thomson, Theory of Vibration with Applications, Sec. 9.5 (Euler-Bernoulli beam). Id: critical-speed.
 */
export function criticalSpeedRpm(betaL: number, d: number, L: number, E: number, rho: number): number {
  const omega = (betaL ** 2 / L ** 2) * (d / 4) * Math.sqrt(E / rho);
  return (omega * 60) / (2 * Math.PI);
}

/**
 * Mean bearing pressure on the engaged flanks of the nut.
 * p = F / (pi d_m h n_t)
 * @returns pressure [Pa]
 * Source: Shigley 10th ed., Eq. (8-9) over all engaged threads; Bhandari 3rd ed., Sec. 6.10. Id: nut-bearing-pressure.
 */
export function nutBearingPressure(F: number, dm: number, h: number, nt: number): number {
  return F / (Math.PI * dm * h * nt);
}

/**
 * Sliding (rubbing) velocity along the thread helix at the mean diameter.
 * v_s = pi d_m n / cos lambda
 * @param n - rotational speed [rev/s]
 * @returns velocity [m/s]
 * Source: helix kinematics; Bhandari 3rd ed., Sec. 6.13 uses pi d_m n (from memory). Id: sliding-velocity.
 */
export function slidingVelocity(dm: number, n: number, lambda: number): number {
  return (Math.PI * dm * n) / Math.cos(lambda);
}

/**
 * von Mises stress at the worse of the two thread-root fillets. The root bending stress acts with opposite signs
 * on the two fillets; with the signed body axial stress, the fillet where they combine worse governs.
 * sigma' = max over s = +1, -1 of sqrt((s sigma_b)^2 + sigma^2 - s sigma_b sigma + 3 tau^2)
 *        = sqrt(sigma_b^2 + sigma^2 + |sigma_b sigma| + 3 tau^2)
 * @param sigmaB - root bending stress magnitude [Pa]
 * @param sigma - body axial stress, signed (tension positive) [Pa]
 * @param tau - body torsional shear stress [Pa]
 * @returns stress [Pa]; equals rootVonMises(sigma_b, sigma, tau) in compression, larger in tension.
 * Source: Shigley 10th ed., Sec. 8-2, stress element of Ex. 8-1(g) taken with both signs of sigma_x, Eq. (5-14). Id: thread-root-von-mises.
 */
export function rootVonMisesWorseFillet(sigmaB: number, sigma: number, tau: number): number {
  return Math.max(rootVonMises(sigmaB, sigma, tau), rootVonMises(-sigmaB, sigma, tau));
}

/** Share of the axial load on the first engaged thread, after Marshek (from memory): 0.38. */
export const FIRST_THREAD_SHARE = 0.38;

/**
 * Load on the first engaged thread, never below the mean load per thread.
 * F_1 = max(0.38 F, F / n_t)
 * @param F - axial load [N]
 * @param nt - engaged threads [-]
 * @returns load [N]; below about 2.6 engaged threads F / n_t governs.
 * Source: Shigley 10th ed., Sec. 8-2 after Marshek (0.38 F on the first thread, from memory); the first thread cannot
 * carry less than the mean share (statics). Id: thread-load-share-first.
 */
export function firstThreadLoad(F: number, nt: number): number {
  return Math.max(FIRST_THREAD_SHARE * F, F / nt);
}

/**
 * Shear area of threads stripping on a cylinder, per the standard shear planes.
 * A = pi D t n_t, with t the thread thickness at the diameter D
 * @param D - shear diameter: the nut's minor diameter for the screw's threads, the screw's major diameter for the nut's [m]
 * @param t - thickness, at D, of the thread that strips [m]
 * @param nt - engaged threads [-]
 * @returns area [m^2]
 * Source: Machinery's Handbook, "Strength of screw threads" (A_s = pi n L_e D_n [1/(2n) + 0.57735 (E_s - D_n)] for
 * 60 deg threads, from memory); FED-STD-H28/2 uses the same planes. Id: thread-stripping-screw / -nut.
 */
export function strippingArea(D: number, t: number, nt: number): number {
  return Math.PI * D * t * nt;
}

/**
 * Tensile stress area of a 60 deg thread, for reference beside the minor-diameter section.
 * ISO: A_s = (pi/4) ((d_2 + d_3)/2)^2 = (pi/4) (d - 0.938194 P)^2; unified: A_s = 0.7854 (d - 0.9743/n)^2
 * @param d - major diameter [m]
 * @param p - pitch [m]
 * @param form - 'iso-metric' or 'unified'
 * @returns area [m^2]
 * Source: ISO 898-1 (stress area A_s,nom) and ASME B1.1 (tensile stress area), formulas as in
 * recalled (from memory). Id: tensile-stress-area-iso / -unified.
 */
export function tensileStressArea60(d: number, p: number, form: 'iso-metric' | 'unified'): number {
  const k = form === 'iso-metric' ? (0.649519 + 1.226869) / 2 : 0.9743;
  return (Math.PI / 4) * (d - k * p) ** 2;
}

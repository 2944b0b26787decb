/**
 * Sizing the drive: inertia of the screw and the load, the torque to accelerate them, and torques referred to the
 * motor through a gearbox. Pure functions, SI in and out; each names its equation, source and formula id.
 */

/** Standard acceleration of gravity [m/s^2]: 3rd CGPM (1901), as NIST SP 811, Sec. 8.2 (exact by definition). */
export const STANDARD_GRAVITY = 9.80665;

/**
 * Mass of a lifted load from its weight, when no mass is given.
 * m = F / g_n
 * @param F - axial load (the weight lifted) [N]
 * @returns mass [kg]
 * Source: NIST SP 811 (2008), Sec. 8.2 (g_n = 9.80665 m/s^2, weight = m g_n). Id: load-mass-from-weight.
 */
export function loadMassFromWeight(F: number): number {
  return F / STANDARD_GRAVITY;
}

/**
 * Polar mass moment of inertia of the screw about its axis, as a solid round whose thread ridges fill half of the
 * annulus between the root and the major diameter (a symmetric profile fills half of it at the pitch line).
 * J_s = (pi rho L / 32) (d_r^4 + d^4) / 2
 * @param rho - mass density [kg/m^3]
 * @param L - rotating length [m]
 * @param dr - root (minor) diameter [m]
 * @param d - major diameter [m]
 * @returns inertia [kg*m^2]; lies between the solid rounds at d_r and at d.
 * Source: solid cylinder J = pi rho L d^4 / 32 = m d^2 / 8 (Meriam & Kraige, Engineering Mechanics: Dynamics, 7th ed.,
 * Table D/4, from memory); half-filled thread annulus: common practice. Id: screw-inertia.
 */
export function screwInertia(rho: number, L: number, dr: number, d: number): number {
  return ((Math.PI * rho * L) / 32) * ((dr ** 4 + d ** 4) / 2);
}

/**
 * Inertia of the translating load referred to the screw: the nut moves l / (2 pi) per radian.
 * J_L = m (l / (2 pi))^2
 * @param m - load mass [kg]
 * @param l - lead [m]
 * @returns inertia at the screw [kg*m^2]
 * Source: kinetic energy m v^2 / 2 = J_L omega^2 / 2 with v = omega l / (2 pi) (Shigley 10th ed., Sec. 8-2 kinematics). Id: load-inertia-reflected.
 */
export function reflectedLoadInertia(m: number, l: number): number {
  return m * (l / (2 * Math.PI)) ** 2;
}

/**
 * Angular acceleration of the screw from the time to reach the operating speed at constant acceleration.
 * alpha = 2 pi n / t_a
 * @param n - operating speed [rev/s]
 * @param ta - time to speed [s]
 * @returns angular acceleration [rad/s^2]
 * Source: uniform angular acceleration, omega = alpha t (Meriam & Kraige, Dynamics, 7th ed., Sec. 5/2, from memory). Id: angular-acceleration-from-time.
 */
export function angularAccelerationFromTime(n: number, ta: number): number {
  return (2 * Math.PI * n) / ta;
}

/**
 * Angular acceleration of the screw from the nut's linear acceleration.
 * alpha = 2 pi a / l
 * @param a - linear acceleration of the nut [m/s^2]
 * @param l - lead [m]
 * @returns angular acceleration [rad/s^2]
 * Source: one turn advances one lead (Shigley 10th ed., Sec. 8-2), differentiated in time. Id: angular-acceleration-from-linear.
 */
export function angularAccelerationFromLinear(a: number, l: number): number {
  return (2 * Math.PI * a) / l;
}

/**
 * Torque to accelerate the screw and the load at the screw. The load's inertia force passes through the thread and
 * the collar like the load itself, so its share is divided by the efficiency at maximum friction (the safe side).
 * T_a = (J_s + J_L / e) alpha
 * @param Js - screw inertia [kg*m^2]
 * @param JL - load inertia referred to the screw [kg*m^2]
 * @param e - screw efficiency, collar included, at maximum friction [-]
 * @param alpha - angular acceleration [rad/s^2]
 * @returns torque [N*m]
 * Source: Newton's second law for rotation, T = J alpha (Meriam & Kraige, Dynamics, 7th ed., Eq. 6/1, from memory); load share
 * through the efficiency: common practice in drive sizing. Id: acceleration-torque.
 */
export function accelerationTorque(Js: number, JL: number, e: number, alpha: number): number {
  return (Js + JL / e) * alpha;
}

/**
 * Torque at the motor that drives the screw through a gearbox.
 * T_m = T_screw / (i eta_g)
 * @param T - torque at the screw [N*m]
 * @param i - gear ratio, motor speed over screw speed [-]
 * @param eta - forward efficiency of the gearbox [-]
 * @returns torque at the motor [N*m]
 * Source: power balance through a gear train, T_in omega_in eta = T_out omega_out (Shigley 10th ed., Sec. 13-13, from memory). Id: motor-torque-through-gearbox.
 */
export function motorTorqueThroughGearbox(T: number, i: number, eta: number): number {
  return T / (i * eta);
}

/**
 * Torque that reaches the motor when the load drives the gearbox backwards (what a motor brake must hold).
 * T_h,m = T_h,screw eta_r / i
 * @param T - holding torque at the screw [N*m]
 * @param i - gear ratio, motor speed over screw speed [-]
 * @param etaR - reverse (back-driving) efficiency of the gearbox [-]
 * @returns torque at the motor [N*m]
 * Source: power balance with power flowing from the output, T_out omega_out eta_r = T_in omega_in (Shigley 10th ed., Sec. 13-13,
 * from memory). Id: motor-holding-torque-through-gearbox.
 */
export function motorHoldingTorqueThroughGearbox(T: number, i: number, etaR: number): number {
  return (T * etaR) / i;
}

/**
 * Torque that reaches a motor-side brake from the load with thread friction lost: whatever removes the thread's
 * friction (vibration) removes the gearbox's too, so the gearbox's reverse efficiency is not credited (eta_r = 1).
 * T_h,m = T_0 / i
 * @param T0 - zero-friction holding torque at the screw, F l / (2 pi) [N*m]
 * @param i - gear ratio, motor speed over screw speed [-]
 * @returns torque at the motor [N*m]; never below T_0 eta_r / i for any eta_r <= 1
 * Source: power balance through a gear train with eta_r = 1 (Shigley 10th ed., Sec. 13-13, from memory); friction lost on the
 * whole train: common practice, consistent with the zero-friction holding torque. Id: motor-holding-torque-no-friction.
 */
export function motorHoldingTorqueNoFriction(T0: number, i: number): number {
  return T0 / i;
}

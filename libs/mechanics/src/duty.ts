/**
 * Duty: heat of friction per cycle and on average, the nut's temperature rise by a stated heat balance, and a wear
 * life from a stated wear coefficient. Pure functions, SI in and out; each names its equation, source and formula id.
 */

/**
 * Heat of friction in one cycle (raise the stroke, lower it again): the work put in beyond the load's change of
 * potential energy. Over N = s / l turns raising loses 2 pi N T_R - F s and lowering 2 pi N T_L + F s; the sum is
 * Q = 2 pi (s / l) (T_R + T_L)
 * @param s - stroke [m]
 * @param l - lead [m]
 * @param TR - raise torque, collar included [N*m]
 * @param TL - lowering torque, collar included (negative when the load drives) [N*m]
 * @returns heat per cycle [J]
 * Source: energy balance of the screw, work in = T 2 pi n_turns (Shigley 10th ed., Eq. (8-4) work per turn). Id: friction-heat-per-cycle.
 */
export function frictionHeatPerCycle(s: number, l: number, TR: number, TL: number): number {
  return 2 * Math.PI * (s / l) * (TR + TL);
}

/**
 * Friction power while running: the mean of raising and lowering losses at the operating speed.
 * P_run = omega (T_R + T_L) / 2, omega = 2 pi n
 * @param n - screw speed [rev/s]
 * @returns power loss [W]
 * Source: as frictionHeatPerCycle, per unit time (Shigley 10th ed., Eq. (3-40) power = T omega). Id: friction-power-running.
 */
export function frictionPowerRunning(n: number, TR: number, TL: number): number {
  return Math.PI * n * (TR + TL);
}

/**
 * Combined convection and radiation heat-transfer coefficient of a nut in still air (the default of the heat balance).
 * Free convection in gases 2-25 W/(m^2 K) (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table 1.1,
 * from memory) plus radiation h_r = 4 eps sigma T^3 = about 5 W/(m^2 K) at 300 K and eps 0.8: 10 W/(m^2 K) total,
 * the lower part of the range (common practice).
 */
export const NUT_HEAT_TRANSFER_COEFFICIENT = 10;

/**
 * Steady temperature rise of a nut that sheds all the friction heat through its outside surface (the screw's
 * conduction is left out: the safe side).
 * dT = P / (h A), A = pi D_o L + 2 (pi / 4) (D_o^2 - d^2)
 * @param P - mean heat input [W]
 * @param h - heat-transfer coefficient [W/(m^2 K)]
 * @param A - outside surface of the nut [m^2]
 * @returns temperature rise [K]
 * Source: Newton's law of cooling, steady state (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Eq. (1.3a), from memory). Id: nut-temperature-rise.
 */
export function steadyTemperatureRise(P: number, h: number, A: number): number {
  return P / (h * A);
}

/**
 * Outside surface of a plain cylindrical nut: mantle plus both end faces.
 * A = pi D_o L + 2 (pi / 4) (D_o^2 - d^2)
 * @param Do - outside diameter [m]
 * @param L - nut length [m]
 * @param d - screw major diameter (the bore) [m]
 * @returns area [m^2]
 * Source: geometry. Id: nut-outside-surface.
 */
export function nutOutsideSurface(Do: number, L: number, d: number): number {
  return Math.PI * Do * L + (Math.PI / 2) * (Do * Do - d * d);
}

/**
 * Wear depth per unit sliding distance by Archard's law: h' = k p (specific wear rate k times contact pressure).
 * Life in sliding distance until a flank wear depth h_n (normal to the flank) is reached, h_n = w cos(alpha) for an
 * axial wear w:
 * s_life = w cos(alpha) / (k p)
 * @param w - axial wear allowed (play) [m]
 * @param alpha - flank angle [rad]
 * @param k - specific wear rate [m^2/N] (= m^3 / (N m))
 * @param p - mean flank pressure [Pa]
 * @returns sliding distance at the mean diameter [m]
 * Source: Archard, J. Appl. Phys. 24 (1953) 981, V = k F s / H in the dimensional form V = k F s (Hutchings, Tribology, Sec. 5.2, from memory). Id: wear-life-archard.
 */
export function wearSlidingDistance(w: number, alpha: number, k: number, p: number): number {
  return (w * Math.cos(alpha)) / (k * p);
}

/**
 * Sliding distance at the mean diameter per unit of nut travel: one lead of travel slides pi d_m / cos(lambda).
 * s_slide / s = pi d_m / (l cos lambda)
 * @returns ratio [-]
 * Source: helix kinematics, as the sliding velocity (Bhandari 3rd ed., Sec. 6.13, from memory). Id: sliding-per-travel.
 */
export function slidingPerTravel(dm: number, l: number, lambda: number): number {
  return (Math.PI * dm) / (l * Math.cos(lambda));
}

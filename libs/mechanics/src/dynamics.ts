/**
 * Lifting dynamics: the dynamic factor on the lifted load, and stopping a descending load with the brake.
 * Pure functions, SI in and out; each names its equation, source and formula id in ./formulas.ts.
 */

export const HOISTING_CLASSES = ['HC1', 'HC2', 'HC3', 'HC4'] as const;
export type HoistingClass = (typeof HOISTING_CLASSES)[number];

/**
 * phi_2,min and beta_2 of the hoisting classes: EN 13001-2, Table 2 (from memory): HC1 1.05 / 0.17, HC2 1.10 / 0.34,
 * HC3 1.15 / 0.51, HC4 1.20 / 0.68 (beta_2 in s/m).
 */
export const HOISTING_CLASS_FACTORS: Readonly<Record<HoistingClass, { readonly phi2Min: number; readonly beta2: number }>> = {
  HC1: { phi2Min: 1.05, beta2: 0.17 },
  HC2: { phi2Min: 1.1, beta2: 0.34 },
  HC3: { phi2Min: 1.15, beta2: 0.51 },
  HC4: { phi2Min: 1.2, beta2: 0.68 },
};

/** Hoisting class taken on lifting duty when none is named: HC2, the usual class of general hoists (common practice). */
export const DEFAULT_HOISTING_CLASS: HoistingClass = 'HC2';

/**
 * Dynamic factor for hoisting a load off the ground.
 * phi_2 = phi_2,min + beta_2 v_h
 * @param hc - hoisting class
 * @param vh - steady hoisting speed [m/s]
 * @returns dynamic factor [-]
 * Source: EN 13001-2, Sec. 4.2.2.2 and Table 2 (from memory). Id: dynamic-factor-hoisting.
 */
export function hoistingDynamicFactor(hc: HoistingClass, vh: number): number {
  const { phi2Min, beta2 } = HOISTING_CLASS_FACTORS[hc];
  return phi2Min + beta2 * vh;
}

/**
 * Angle turned by the screw from the brake's command to standstill while a descending load drives it: during the
 * response time the load accelerates the train freely (thread friction lost), then the brake decelerates it.
 * omega_1 = omega_0 + alpha_f t_r, alpha_f = T_0 / J; theta = omega_0 t_r + alpha_f t_r^2 / 2 + omega_1^2 / (2 alpha_b),
 * alpha_b = (T_b - T_0) / J
 * @param omega0 - screw speed at the command [rad/s]
 * @param tr - brake response time [s]
 * @param T0 - load torque at the screw with thread friction lost [N*m]
 * @param Tb - brake torque referred to the screw [N*m]
 * @param J - inertia of screw, load and motor referred to the screw [kg*m^2]
 * @returns { theta [rad], time [s], omegaAtBrake [rad/s], deceleration [rad/s^2] }, or null when T_b <= T_0 (the brake cannot stop the load)
 * Source: constant angular acceleration, theta = omega t + alpha t^2 / 2 and omega^2 = omega_0^2 + 2 alpha theta (Meriam & Kraige, Engineering Mechanics: Dynamics, 7th ed., Sec. 5/2, from memory); T = J alpha (Eq. 6/1). Id: stopping-angle.
 */
export function stoppingAngle(
  omega0: number,
  tr: number,
  T0: number,
  Tb: number,
  J: number,
): { theta: number; time: number; omegaAtBrake: number; deceleration: number } | null {
  if (!(Tb > T0)) return null;
  const alphaFree = T0 / J;
  const omega1 = omega0 + alphaFree * tr;
  const alphaBrake = (Tb - T0) / J;
  return {
    theta: omega0 * tr + (alphaFree * tr * tr) / 2 + (omega1 * omega1) / (2 * alphaBrake),
    time: tr + omega1 / alphaBrake,
    omegaAtBrake: omega1,
    deceleration: alphaBrake,
  };
}

/**
 * Energy the brake absorbs while it slips: brake torque times the angle turned while braking.
 * E_b = T_b omega_1^2 / (2 alpha_b)
 * @param Tb - brake torque at the screw [N*m]
 * @param omega1 - speed when the brake engages [rad/s]
 * @param alphaB - deceleration [rad/s^2]
 * @returns energy [J]
 * Source: work of a constant torque, W = T theta (Meriam & Kraige, Dynamics, 7th ed., Sec. 6/6, from memory). Id: brake-energy.
 */
export function brakeEnergy(Tb: number, omega1: number, alphaB: number): number {
  return (Tb * omega1 * omega1) / (2 * alphaB);
}

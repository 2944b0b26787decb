/**
 * Holding the load: the torque a brake must supply and how easily the load drives the screw backwards.
 * Pure functions, SI in and out; each names its equation, source and formula id in ./formulas.ts.
 */
import { lowerTorque } from './mechanics';

/**
 * Torque the load exerts on the screw when thread friction is lost (f -> 0, e.g. under vibration): the whole
 * potential work of the load per turn, F l, appears as torque over one turn, 2 pi.
 * T_0 = F l / (2 pi)
 * @param F - axial load magnitude [N]
 * @param l - lead [m]
 * @returns torque [N*m]; the limit f -> 0 of -T_L in Juvinall & Marshek 5th ed., Eq. (10.5) (equation number from memory).
 * Source: Shigley 10th ed., Eq. (8-4) with e = 1 (ideal screw: T = F l / (2 pi)). Id: brake-holding-torque-no-friction.
 */
export function holdingTorqueNoFriction(F: number, l: number): number {
  return (F * l) / (2 * Math.PI);
}

/**
 * Torque a brake must supply to hold the load at a thread friction f: the back-driving torque -T_L, or zero when
 * the thread holds by itself (T_L >= 0). Collar friction is left out (the safe side, as for self-locking).
 * T_h = max(0, -T_L,thread(f))
 * @param F - axial load magnitude [N]
 * @param dm - mean diameter [m]
 * @param l - lead [m]
 * @param f - thread friction coefficient [-]
 * @param alphaN - normal flank angle [rad]
 * @returns torque [N*m]
 * Source: Juvinall & Marshek 5th ed., Eq. (10.5) (lowering torque; number from memory). Id: brake-holding-torque-min-friction.
 */
export function holdingTorqueAtFriction(F: number, dm: number, l: number, f: number, alphaN: number): number {
  return Math.max(0, -lowerTorque(F, dm, l, f, alphaN));
}

/**
 * Reverse (back-driving) efficiency of the thread: work delivered at the screw over the work the descending load
 * gives up, per turn. Zero or negative means the load cannot drive the screw (self-locking).
 * e' = -2 pi T_L,thread / (F l); square thread: e' = tan(lambda - phi) / tan(lambda), tan phi = f
 * @param F - axial load magnitude [N]
 * @param dm - mean diameter [m]
 * @param l - lead [m]
 * @param f - thread friction coefficient [-]
 * @param alphaN - normal flank angle [rad]
 * @returns efficiency [-], at most 1 (reached at f = 0)
 * Source: energy balance on Juvinall & Marshek 5th ed., Eq. (10.5), the inverse of Shigley 10th ed., Eq. (8-4); the square-thread
 * form tan(lambda - phi)/tan(lambda) is the usual textbook result (from memory). Id: reverse-efficiency.
 */
export function reverseEfficiency(F: number, dm: number, l: number, f: number, alphaN: number): number {
  return (-2 * Math.PI * lowerTorque(F, dm, l, f, alphaN)) / (F * l);
}

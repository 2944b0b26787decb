/**
 * The nut's body and flange, the safety (follower) nut and a worn thread. Pure functions, SI in and out; each names
 * its equation, source and formula id in ./formulas.ts.
 */

/**
 * Radial (bursting) force of loaded flanks: the flank's normal force has a radial component F tan(alpha) for each F
 * carried axially; friction on the flank is left out (it lowers the radial push on raising: the larger value).
 * F_r = F tan(alpha)
 * @param F - axial load on the threads considered [N]
 * @param alpha - flank angle in the axial plane (half the included angle; the load flank of a buttress) [rad]
 * @returns radial force [N]
 * Source: statics of the flank normal force (Shigley 10th ed., Fig. 8-7 force system, from memory); friction neglected: common practice. Id: nut-radial-flank-force.
 */
export function radialFlankForce(F: number, alpha: number): number {
  return F * Math.tan(alpha);
}

/**
 * Hoop stress at the bore of a thick-walled cylinder under internal pressure (Lame), closed ends not assumed.
 * sigma_t = p_i (D_o^2 + D_i^2) / (D_o^2 - D_i^2)
 * @param pi - internal pressure [Pa]
 * @param Do - outside diameter [m]
 * @param Di - bore diameter [m]
 * @returns hoop stress at the bore [Pa]
 * Source: Shigley 10th ed., Sec. 3-16, Eq. (3-50) with p_o = 0 at r = r_i (equation number from memory). Id: nut-body-hoop-stress.
 */
export function lameHoopStressAtBore(pi: number, Do: number, Di: number): number {
  return (pi * (Do * Do + Di * Di)) / (Do * Do - Di * Di);
}

/**
 * von Mises stress of three principal stresses.
 * sigma' = sqrt(((s1 - s2)^2 + (s2 - s3)^2 + (s3 - s1)^2) / 2)
 * @returns stress [Pa]
 * Source: Shigley 10th ed., Eq. (5-12). Id: nut-body-von-mises.
 */
export function vonMisesPrincipal(s1: number, s2: number, s3: number): number {
  return Math.sqrt(((s1 - s2) ** 2 + (s2 - s3) ** 2 + (s3 - s1) ** 2) / 2);
}

/**
 * Shear of a nut flange at its root (the nut body's outside diameter) through the flange thickness.
 * tau_f = F / (pi D_o t_f)
 * @param F - axial load [N]
 * @param Do - nut body outside diameter, the flange root [m]
 * @param tf - flange thickness [m]
 * @returns mean shear stress [Pa]
 * Source: direct shear on the cylinder pi D_o t_f, as the thread-stripping planes (Machinery's Handbook, "Strength of screw threads", from memory). Id: nut-flange-shear.
 */
export function flangeShear(F: number, Do: number, tf: number): number {
  return F / (Math.PI * Do * tf);
}

/**
 * Bending of a nut flange at its root: a cantilever ring of width pi D_o and thickness t_f, the load at mid-flange.
 * sigma_f = 6 F a / (pi D_o t_f^2), a = (D_f - D_o) / 4
 * @param F - axial load [N]
 * @param Df - flange outside diameter [m]
 * @param Do - nut body outside diameter, the flange root [m]
 * @param tf - flange thickness [m]
 * @returns bending stress at the root [Pa]
 * Source: the cantilever of Shigley 10th ed., Eq. (8-10) (thread root bending) applied to the flange; load at mid-width: common practice. Id: nut-flange-bending.
 */
export function flangeBending(F: number, Df: number, Do: number, tf: number): number {
  const a = (Df - Do) / 4;
  return (6 * F * a) / (Math.PI * Do * tf * tf);
}

/**
 * Thickness left of a thread after axial wear w on its loaded flank (the wear taken wholly by the thread considered).
 * t_w = max(0, t - w)
 * @param t - thickness at the shear plane, unworn [m]
 * @param w - axial wear (increase of axial play) [m]
 * @returns worn thickness [m]
 * Source: axial play equals the loss of axial thread thickness (geometry of the flank contact; common practice for nut-wear gauging). Id: worn-thread-thickness.
 */
export function wornThickness(t: number, w: number): number {
  return Math.max(0, t - w);
}

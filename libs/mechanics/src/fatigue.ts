/**
 * Fatigue of the screw's thread root and the nut's threads under repeated lifting (stress 0 -> max each cycle).
 * Pure functions, SI in and out; each names its equation, source and formula id in ./formulas.ts.
 */

/**
 * Fatigue stress-concentration factor of a cut thread root, used for the screw and the nut: 2.8, Shigley 10th ed.,
 * Table 8-16, cut threads of SAE grades 0-2 / ISO classes 3.6-5.8 (from memory); rolled threads take 2.2, so 2.8
 * is the safe side for a power screw whose thread is cut or whirled.
 */
export const THREAD_FATIGUE_CONCENTRATION = 2.8;

/**
 * Rotating-beam endurance limit of a steel from its tensile strength.
 * S_e' = 0.5 S_ut (S_ut <= 1400 MPa), 700 MPa above
 * @param Sut - tensile strength [Pa]
 * @returns endurance limit of the polished specimen [Pa]
 * Source: Shigley 10th ed., Eq. (6-8). Id: endurance-limit-specimen.
 */
export function specimenEnduranceLimit(Sut: number): number {
  return Sut <= 1400e6 ? 0.5 * Sut : 700e6;
}

/**
 * Surface factor of a machined or cold-drawn surface.
 * k_a = 4.51 S_ut^-0.265 (S_ut in MPa)
 * @param Sut - tensile strength [Pa]
 * @returns factor [-]
 * Source: Shigley 10th ed., Eq. (6-19) and Table 6-2 (machined or cold-drawn: a = 4.51 MPa, b = -0.265). Id: fatigue-surface-factor.
 */
export function surfaceFactorMachined(Sut: number): number {
  return 4.51 * (Sut / 1e6) ** -0.265;
}

/**
 * Size factor of a round in bending or torsion.
 * k_b = 1.24 d^-0.107 (2.79 <= d <= 51 mm), 1.51 d^-0.157 (51 < d <= 254 mm), 1 below 2.79 mm; d in mm
 * @param d - diameter [m]
 * @returns factor [-]
 * Source: Shigley 10th ed., Eq. (6-20). Id: fatigue-size-factor.
 */
export function sizeFactor(d: number): number {
  const mm = d * 1000;
  if (mm < 2.79) return 1;
  return mm <= 51 ? 1.24 * mm ** -0.107 : 1.51 * mm ** -0.157;
}

/** Load factor for axial loading, taken for the combined root stress (the safe side of 1 for bending): Shigley 10th ed., Eq. (6-26). */
export const AXIAL_LOAD_FACTOR = 0.85;

/**
 * Modified Goodman factor of safety for a fluctuating stress.
 * n_f = 1 / (sigma_a / S_e + sigma_m / S_ut)
 * @param sigmaA - stress amplitude [Pa]
 * @param sigmaM - mean stress [Pa]
 * @param Se - endurance limit (or fatigue strength at the cycles) of the part [Pa]
 * @param Sut - tensile strength [Pa]
 * @returns factor of safety [-]
 * Source: Shigley 10th ed., Eq. (6-41) (modified Goodman). Id: goodman-safety-factor.
 */
export function goodmanSafetyFactor(sigmaA: number, sigmaM: number, Se: number, Sut: number): number {
  return 1 / (sigmaA / Se + sigmaM / Sut);
}

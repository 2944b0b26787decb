/**
 * Whirl with end supports that fix the screw less than the theoretical "fixed" end assumes.
 * Pure functions, SI in and out; each names its equation, source and formula id in ./formulas.ts.
 */

/**
 * Frequency factor of a shaft whose fixed ends are taken as only partly fixed, with the same partial fixity the
 * column check's recommended end-condition constant assumes: a simply supported shaft over the effective length
 * L_e = L / sqrt(C), so (beta_1 L)' = pi sqrt(C). For pinned-pinned ends (C = 1) it equals the classical pi.
 * (beta_1 L)' = pi sqrt(C_recommended)
 * @param C - recommended end-condition constant of the ends [-] (Shigley 9th ed., Table 4-2: 1/4, 1, 1.2, 1.2)
 * @returns frequency factor [-]; use with criticalSpeedRpm.
 * Source: common practice: effective length of Shigley 9th ed., Sec. 4-12, Eq. (4-43) and Table 4-2 (recommended C) applied to the
 * simply supported first mode of Thomson, Theory of Vibration with Applications, Table 9.5-1. Id: critical-speed-partly-fixed.
 */
export function partlyFixedFrequencyFactor(C: number): number {
  return Math.PI * Math.sqrt(C);
}

/**
 * Ratio of the partly fixed to the classical critical speed (speed scales with (beta_1 L)^2).
 * k = pi^2 C / (beta_1 L)^2
 * @param C - recommended end-condition constant [-]
 * @param betaL - classical first-mode frequency factor of the ends [-]
 * @returns factor [-], below 1 wherever an end is fixed
 * Source: as partlyFixedFrequencyFactor (common practice). Id: critical-speed-partly-fixed-factor.
 */
export function partlyFixedSpeedFactor(C: number, betaL: number): number {
  return (Math.PI ** 2 * C) / betaL ** 2;
}

/**
 * The thrust collar as a bearing: mean pressure of a plain annular collar, and the rating life and static safety of
 * a rolling thrust bearing from its catalogue ratings. Pure functions, SI in and out; each names its source and id.
 */

/**
 * Mean bearing pressure on a flat annular thrust collar.
 * p_c = 4 F / (pi (D_o^2 - D_i^2))
 * @param F - axial load [N]
 * @param Do - outer diameter [m]
 * @param Di - inner diameter [m]
 * @returns pressure [Pa]
 * Source: Bhandari, Design of Machine Elements, 3rd ed., Sec. 6.8 (collar friction, unit bearing pressure, from memory). Id: collar-bearing-pressure.
 */
export function collarBearingPressure(F: number, Do: number, Di: number): number {
  return (4 * F) / (Math.PI * (Do * Do - Di * Di));
}

/** Life exponent of ISO 281: 3 for ball bearings, 10/3 for roller bearings. */
export const LIFE_EXPONENT: Readonly<Record<'ball' | 'roller', number>> = { ball: 3, roller: 10 / 3 };

/**
 * Basic rating life of a rolling bearing in millions of revolutions; for a thrust bearing under pure axial load the
 * equivalent load is the axial load.
 * L_10 = (C_a / P_a)^p, P_a = F_a
 * @param Ca - basic dynamic axial load rating [N]
 * @param Pa - equivalent dynamic axial load [N]
 * @param p - life exponent (3 ball, 10/3 roller)
 * @returns life [10^6 rev]
 * Source: ISO 281:2007, Eq. (1) (from memory); Shigley 10th ed., Eq. (11-1). Id: bearing-rating-life.
 */
export function ratingLife(Ca: number, Pa: number, p: number): number {
  return (Ca / Pa) ** p;
}

/**
 * Rating life in operating hours at a constant speed.
 * L_10h = 10^6 L_10 / (60 n)
 * @param L10 - life [10^6 rev]
 * @param rpm - speed [rev/min]
 * @returns hours [h]
 * Source: ISO 281:2007, Sec. 6 (from memory). Id: bearing-rating-life-hours.
 */
export function ratingLifeHours(L10: number, rpm: number): number {
  return (1e6 * L10) / (60 * rpm);
}

/**
 * Static safety factor of a thrust bearing.
 * s_0 = C_0a / P_0a, P_0a = F_a
 * @returns factor [-]
 * Source: ISO 76:2006 (static load rating, from memory); Shigley 10th ed., Sec. 11-6. Id: bearing-static-safety.
 */
export function staticSafetyFactor(C0a: number, P0a: number): number {
  return C0a / P0a;
}

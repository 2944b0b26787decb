/**
 * Number formatting for finding messages: engineering significant figures, SI display units
 * (MPa for stress, N·m for torque). Locale-independent, so a message is the same on every server.
 */

/** Default number of significant figures in messages. */
export const SIGNIFICANT_FIGURES = 3;

/**
 * Formats a value to `digits` significant figures without exponent notation in the usual range.
 * Non-finite values are spelled out, so a message never shows "NaN".
 */
export function sig(x: number, digits = SIGNIFICANT_FIGURES): string {
  if (Number.isNaN(x)) return 'not computable';
  if (!Number.isFinite(x)) return x > 0 ? 'unbounded' : '-unbounded';
  if (x === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(x)));
  if (magnitude >= digits - 1) {
    const step = 10 ** (magnitude - digits + 1);
    return String(Math.round(x / step) * step);
  }
  if (magnitude < -6) return x.toExponential(digits - 1);
  return x.toFixed(digits - 1 - magnitude);
}

/**
 * Formats a measured value and its limit with enough significant figures that they read differently
 * whenever they differ (2.9996 against 3 prints "2.9996" and "3.0000", not "3.00" twice).
 */
export function sigPair(measured: number, limit: number, digits = SIGNIFICANT_FIGURES): [string, string] {
  let n = digits;
  while (n < 8 && measured !== limit && sig(measured, n) === sig(limit, n)) n++;
  return [sig(measured, n), sig(limit, n)];
}

const MPA = 1e6;

/** Stress or pressure [Pa] as "123 MPa". */
export function mpa(pa: number, digits?: number): string {
  return `${sig(pa / MPA, digits)} MPa`;
}

/** Torque [N*m] as "12.3 N·m". */
export function newtonMetres(torque: number, digits?: number): string {
  return `${sig(torque, digits)} N·m`;
}

/** Rotational speed [rev/min] as "1230 rev/min". */
export function revPerMin(rpm: number, digits?: number): string {
  return `${sig(rpm, digits)} rev/min`;
}

/** pV [Pa*m/s] as "0.716 MPa·m/s". */
export function mpaMetresPerSecond(pv: number, digits?: number): string {
  return `${sig(pv / MPA, digits)} MPa·m/s`;
}

/** A fraction as a percentage, "78.0 %". */
export function percent(fraction: number, digits?: number): string {
  return `${sig(fraction * 100, digits)} %`;
}

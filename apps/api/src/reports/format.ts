/**
 * Number and unit presentation for reports: engineering significant figures, and the display unit of each
 * kind of quantity in the unit system a design was entered in. Engine values are SI; conversion goes
 * through the engine's own units library (fromSi) so the report and the input parser share one set of factors.
 */
import { fromSi } from '@leadline/mechanics';

export type UnitSystem = 'SI' | 'US';

/** The kinds of quantity a report prints; each has one display unit per system. */
export type QuantityKind =
  | 'length'
  | 'area'
  | 'force'
  | 'stress'
  | 'pressure'
  | 'modulus'
  | 'torque'
  | 'power'
  | 'rpm'
  | 'revPerSecond'
  | 'travelSpeed'
  | 'slidingSpeed'
  | 'pv'
  | 'density'
  | 'angle'
  | 'coefficient'
  | 'ratio'
  | 'percent'
  | 'count'
  | 'mass'
  | 'inertia'
  | 'angularAcceleration'
  | 'linearAcceleration'
  | 'time';

interface DisplayUnit {
  /** Unit as printed */
  readonly symbol: string;
  /** SI value -> display value */
  readonly convert: (si: number) => number;
}

const identity = (x: number): number => x;
const via = (unitText: string, dimension: Parameters<typeof fromSi>[2]) => (si: number) => fromSi(si, unitText, dimension);
/** 1 in = 0.0254 m exactly (NIST SP 811, B.8), so 1 in^2 = 6.4516e-4 m^2 */
const IN2 = 0.0254 * 0.0254;
/** Mechanical horsepower, 550 ft*lbf/s = 745.69987158227022 W (NIST SP 811, B.8) */
const HP = 745.69987158227022;
/** 1 lb = 0.45359237 kg exactly (NIST SP 811, B.8), so 1 lb*in^2 = 0.45359237 x 6.4516e-4 kg*m^2 */
const LB = 0.45359237;

const UNITS: Readonly<Record<UnitSystem, Readonly<Record<QuantityKind, DisplayUnit>>>> = {
  SI: {
    length: { symbol: 'mm', convert: via('mm', 'length') },
    area: { symbol: 'mm²', convert: (si) => si * 1e6 },
    force: { symbol: 'kN', convert: via('kN', 'force') },
    stress: { symbol: 'MPa', convert: via('MPa', 'stress') },
    pressure: { symbol: 'MPa', convert: via('MPa', 'stress') },
    modulus: { symbol: 'GPa', convert: via('GPa', 'stress') },
    torque: { symbol: 'N·m', convert: via('N*m', 'torque') },
    power: { symbol: 'W', convert: identity },
    rpm: { symbol: 'rpm', convert: identity },
    revPerSecond: { symbol: 'rev/s', convert: identity },
    travelSpeed: { symbol: 'm/min', convert: via('m/min', 'linearSpeed') },
    slidingSpeed: { symbol: 'm/s', convert: identity },
    pv: { symbol: 'MPa·m/s', convert: via('MPa*m/s', 'pv') },
    density: { symbol: 'kg/m³', convert: identity },
    angle: { symbol: '°', convert: identity },
    coefficient: { symbol: '', convert: identity },
    ratio: { symbol: '', convert: identity },
    percent: { symbol: '%', convert: (x) => x * 100 },
    count: { symbol: '', convert: identity },
    mass: { symbol: 'kg', convert: identity },
    inertia: { symbol: 'kg·cm²', convert: (si) => si * 1e4 },
    angularAcceleration: { symbol: 'rad/s²', convert: identity },
    linearAcceleration: { symbol: 'm/s²', convert: identity },
    time: { symbol: 's', convert: identity },
  },
  US: {
    length: { symbol: 'in', convert: via('in', 'length') },
    area: { symbol: 'in²', convert: (si) => si / IN2 },
    force: { symbol: 'lbf', convert: via('lbf', 'force') },
    stress: { symbol: 'ksi', convert: via('ksi', 'stress') },
    pressure: { symbol: 'psi', convert: via('psi', 'stress') },
    modulus: { symbol: 'Mpsi', convert: via('Mpsi', 'stress') },
    torque: { symbol: 'lbf·in', convert: via('lbf*in', 'torque') },
    power: { symbol: 'hp', convert: (si) => si / HP },
    rpm: { symbol: 'rpm', convert: identity },
    revPerSecond: { symbol: 'rev/s', convert: identity },
    travelSpeed: { symbol: 'in/min', convert: via('in/min', 'linearSpeed') },
    slidingSpeed: { symbol: 'ft/min', convert: via('ft/min', 'linearSpeed') },
    pv: { symbol: 'psi·ft/min', convert: via('psi*ft/min', 'pv') },
    density: { symbol: 'lb/in³', convert: via('lb/in^3', 'density') },
    angle: { symbol: '°', convert: identity },
    coefficient: { symbol: '', convert: identity },
    ratio: { symbol: '', convert: identity },
    percent: { symbol: '%', convert: (x) => x * 100 },
    count: { symbol: '', convert: identity },
    mass: { symbol: 'lb', convert: (si) => si / LB },
    inertia: { symbol: 'lb·in²', convert: (si) => si / (LB * IN2) },
    angularAcceleration: { symbol: 'rad/s²', convert: identity },
    linearAcceleration: { symbol: 'in/s²', convert: (si) => si / 0.0254 },
    time: { symbol: 's', convert: identity },
  },
};

/** The minus sign printed in reports (U+2212), not a hyphen. */
export const MINUS = '\u2212';
const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };
const superscript = (n: number): string => String(n).replace(/[-0-9]/g, (c) => SUPERSCRIPT[c]);

/** Plain decimal text of a number already rounded by toPrecision (no exponent below 1e7). */
function plain(rounded: string): string {
  if (!/e/i.test(rounded)) return rounded;
  const n = Number(rounded);
  return Math.abs(n) >= 1 ? n.toFixed(0) : rounded;
}

/**
 * Engineering significant figures: 3, or 4 when the leading digit is 1 (so 1.234 and 9.87 carry the same
 * relative precision). Trailing zeros are kept ("30.0"). Very large or small magnitudes use "× 10ⁿ".
 */
export function sig(x: number): string {
  if (!Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const sign = x < 0 ? MINUS : '';
  const a = Math.abs(x);
  const three = a.toPrecision(3);
  const digits = three.replace(/^[0.]+/, '').startsWith('1') ? 4 : 3;
  const exponent = Math.floor(Math.log10(Number(a.toPrecision(digits))));
  if (exponent >= 7 || exponent <= -5) {
    const mantissa = (a / 10 ** exponent).toPrecision(digits);
    return `${sign}${mantissa} × 10${superscript(exponent)}`;
  }
  return sign + plain(a.toPrecision(digits));
}

/** A friction coefficient as an engineer writes it: two decimals, three when the third is significant. */
export function coefficient(x: number): string {
  if (!Number.isFinite(x)) return '—';
  const three = x.toFixed(3);
  return three.endsWith('0') ? x.toFixed(2) : three;
}

/**
 * An SI value as stored in the record: up to 6 significant figures, trailing zeros dropped,
 * "× 10ⁿ" from 10⁶ up and below 10⁻³, so the engine-units table stays readable and exact enough to audit.
 */
export function siRecord(x: number): string {
  if (!Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const sign = x < 0 ? MINUS : '';
  const a = Math.abs(x);
  const exponent = Math.floor(Math.log10(Number(a.toPrecision(6))));
  const trim = (s: string): string => (s.includes('.') ? s.replace(/0+$/, '').replace(/\.$/, '') : s);
  if (exponent >= 6 || exponent < -3) {
    return `${sign}${trim((a / 10 ** exponent).toPrecision(6))} × 10${superscript(exponent)}`;
  }
  return sign + trim(plain(a.toPrecision(6)));
}

/** Display unit symbol of a kind in a system ('' for dimensionless kinds). */
export function unitSymbol(kind: QuantityKind, system: UnitSystem): string {
  return UNITS[system][kind].symbol;
}

/** Converts an SI value to the display unit of its kind. */
export function toDisplay(si: number, kind: QuantityKind, system: UnitSystem): number {
  return UNITS[system][kind].convert(si);
}

/** The number alone, converted and rounded as the report prints it. */
export function formatNumber(si: number, kind: QuantityKind, system: UnitSystem): string {
  const value = toDisplay(si, kind, system);
  if (kind === 'coefficient') return coefficient(value);
  if (kind === 'count' && Number.isInteger(value)) return String(value);
  return sig(value);
}

/** Number and unit as the report prints them, e.g. "26.2 N·m", "14.97°", "0.15". */
export function formatQuantity(si: number, kind: QuantityKind, system: UnitSystem): string {
  const number = formatNumber(si, kind, system);
  const symbol = unitSymbol(kind, system);
  if (!symbol) return number;
  return symbol === '°' ? `${number}°` : `${number} ${symbol}`;
}

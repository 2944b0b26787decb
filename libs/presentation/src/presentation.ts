/**
 * How Leadline says things, in one place: engineering significant figures, display units of SI values in SI or US
 * customary units, the words for review states, verdicts, severities, check statuses and events, and dates. The
 * report, the rules' messages and the pages all use it; the pages receive this very module as
 * /review/assets/lib-presentation.js (browser-module.ts), so nothing here may import anything.
 *
 * Style this file keeps (the browser copy is made from the compiled functions): every export is a function
 * declaration or a plain data constant; functions use only their arguments, other exports and the built-ins.
 */

/** The minus sign printed in reports and pages (U+2212), not a hyphen. */
export const MINUS = '\u2212';

/** Superscript digits for "× 10ⁿ". */
export const SUPERSCRIPT: Readonly<Record<string, string>> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** An integer in superscript digits. */
export function superscript(n: number): string {
  return String(n).replace(/[-0-9]/g, (c) => SUPERSCRIPT[c]);
}

/** Plain decimal text of a number already rounded by toPrecision (no exponent below 1e7). */
export function plainDecimal(rounded: string): string {
  if (!/e/i.test(rounded)) return rounded;
  const n = Number(rounded);
  return Math.abs(n) >= 1 ? n.toFixed(0) : rounded;
}

/**
 * Engineering significant figures: 3, or 4 when the leading digit is 1 (so 1.234 and 9.87 carry the same relative
 * precision). Trailing zeros are kept ("30.0"). Very large or small magnitudes use "× 10ⁿ"; no number is "—".
 */
export function sig(x: number | null | undefined): string {
  if (typeof x !== 'number' || !Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const sign = x < 0 ? MINUS : '';
  const a = Math.abs(x);
  const digits = a.toPrecision(3).replace(/^[0.]+/, '').startsWith('1') ? 4 : 3;
  const exponent = Math.floor(Math.log10(Number(a.toPrecision(digits))));
  if (exponent >= 7 || exponent <= -5) return `${sign}${(a / 10 ** exponent).toPrecision(digits)} × 10${superscript(exponent)}`;
  return sign + plainDecimal(a.toPrecision(digits));
}

/** Significant figures of the rules' messages unless a message asks for more. */
export const MESSAGE_FIGURES = 3;

/**
 * A number in a rule's message: `digits` significant figures without exponent in the usual range; not-a-number and
 * infinities spelled out, so a stored message never shows "NaN".
 */
export function messageNumber(x: number, digits = MESSAGE_FIGURES): string {
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
 * A measured value and its limit with enough figures that they read differently whenever they differ
 * (2.9996 against 3 prints "2.9996" and "3.0000", not "3.00" twice).
 */
export function messagePair(measured: number, limit: number, digits = MESSAGE_FIGURES): [string, string] {
  let n = digits;
  while (n < 8 && measured !== limit && messageNumber(measured, n) === messageNumber(limit, n)) n++;
  return [messageNumber(measured, n), messageNumber(limit, n)];
}

/** A friction coefficient as an engineer writes it: two decimals, three when the third is significant. */
export function coefficient(x: number): string {
  if (!Number.isFinite(x)) return '—';
  const three = x.toFixed(3);
  return three.endsWith('0') ? x.toFixed(2) : three;
}

/**
 * An SI value as stored in the record: up to 6 significant figures, trailing zeros dropped, "× 10ⁿ" from 10⁶ up and
 * below 10⁻³, so the engine-units table stays readable and exact enough to audit.
 */
export function siRecord(x: number): string {
  if (!Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const sign = x < 0 ? MINUS : '';
  const a = Math.abs(x);
  const exponent = Math.floor(Math.log10(Number(a.toPrecision(6))));
  const trim = (s: string): string => (s.includes('.') ? s.replace(/0+$/, '').replace(/\.$/, '') : s);
  if (exponent >= 6 || exponent < -3) return `${sign}${trim((a / 10 ** exponent).toPrecision(6))} × 10${superscript(exponent)}`;
  return sign + trim(plainDecimal(a.toPrecision(6)));
}

export type UnitSystem = 'SI' | 'US';

/** The kinds of quantity Leadline prints; each has one display unit per system. */
export type QuantityKind =
  | 'length' | 'area' | 'force' | 'stress' | 'pressure' | 'modulus' | 'torque' | 'power' | 'rpm' | 'revPerSecond'
  | 'travelSpeed' | 'slidingSpeed' | 'pv' | 'density' | 'angle' | 'coefficient' | 'ratio' | 'percent' | 'count' | 'mass'
  | 'inertia' | 'angularAcceleration' | 'linearAcceleration' | 'time' | 'serviceTime' | 'temperature' | 'specificWearRate';

/**
 * Display unit of each kind: its symbol and the factor from the SI value (display = SI × factor). US factors are
 * exact by definition (NIST SP 811, 2008, appendix B.8): 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 lbf = 4.4482216152605 N,
 * 1 lb = 0.45359237 kg, 1 psi = 1 lbf/in², 1 hp = 550 ft·lbf/s = 745.69987158227022 W. A unit test holds every
 * factor to the engine's own units library (libs/mechanics units.ts), which parses the same units on input.
 */
export const DISPLAY_UNITS: Readonly<Record<UnitSystem, Readonly<Record<QuantityKind, readonly [string, number]>>>> = {
  SI: {
    length: ['mm', 1e3], area: ['mm²', 1e6], force: ['kN', 1e-3], stress: ['MPa', 1e-6], pressure: ['MPa', 1e-6], modulus: ['GPa', 1e-9],
    torque: ['N·m', 1], power: ['W', 1], rpm: ['rpm', 1], revPerSecond: ['rev/s', 1], travelSpeed: ['m/min', 60], slidingSpeed: ['m/s', 1],
    pv: ['MPa·m/s', 1e-6], density: ['kg/m³', 1], angle: ['°', 1], coefficient: ['', 1], ratio: ['', 1], percent: ['%', 100], count: ['', 1],
    mass: ['kg', 1], inertia: ['kg·cm²', 1e4], angularAcceleration: ['rad/s²', 1], linearAcceleration: ['m/s²', 1], time: ['s', 1],
    serviceTime: ['h', 1 / 3600], temperature: ['°C', 1], specificWearRate: ['mm³/(N·m)', 1e9],
  },
  US: {
    length: ['in', 1 / 0.0254], area: ['in²', 1 / (0.0254 * 0.0254)], force: ['lbf', 1 / 4.4482216152605],
    stress: ['ksi', (0.0254 * 0.0254) / (1000 * 4.4482216152605)], pressure: ['psi', (0.0254 * 0.0254) / 4.4482216152605],
    modulus: ['Mpsi', (0.0254 * 0.0254) / (1e6 * 4.4482216152605)], torque: ['lbf·in', 1 / (4.4482216152605 * 0.0254)],
    power: ['hp', 1 / 745.69987158227022], rpm: ['rpm', 1], revPerSecond: ['rev/s', 1], travelSpeed: ['in/min', 60 / 0.0254],
    slidingSpeed: ['ft/min', 60 / 0.3048], pv: ['psi·ft/min', ((0.0254 * 0.0254) / 4.4482216152605) * (60 / 0.3048)],
    density: ['lb/in³', (0.0254 * 0.0254 * 0.0254) / 0.45359237], angle: ['°', 1], coefficient: ['', 1], ratio: ['', 1], percent: ['%', 100],
    count: ['', 1], mass: ['lb', 1 / 0.45359237], inertia: ['lb·in²', 1 / (0.45359237 * 0.0254 * 0.0254)], angularAcceleration: ['rad/s²', 1],
    linearAcceleration: ['in/s²', 1 / 0.0254], time: ['s', 1], serviceTime: ['h', 1 / 3600], temperature: ['°F', 1.8],
    specificWearRate: ['in³/(lbf·in)', 4.4482216152605 / (0.0254 * 0.0254)],
  },
};

/**
 * The offset a kind's display unit adds after its factor (display = SI × factor + offset): only temperatures, from
 * kelvin, have one (°C = K − 273.15; °F = 1.8 K − 459.67, NIST SP 811, 2008, B.8).
 */
export const DISPLAY_OFFSETS: Readonly<Record<UnitSystem, Readonly<Partial<Record<QuantityKind, number>>>>> = {
  SI: { temperature: -273.15 },
  US: { temperature: -459.67 },
};

/** Display unit symbol of a kind in a system ('' for dimensionless kinds). */
export function unitSymbol(kind: QuantityKind, system: UnitSystem): string {
  return (DISPLAY_UNITS[system] ?? DISPLAY_UNITS.SI)[kind][0];
}

/** Converts an SI value to the display unit of its kind. */
export function toDisplay(si: number, kind: QuantityKind, system: UnitSystem): number {
  return si * (DISPLAY_UNITS[system] ?? DISPLAY_UNITS.SI)[kind][1] + ((DISPLAY_OFFSETS[system] ?? DISPLAY_OFFSETS.SI)[kind] ?? 0);
}

/** The number alone, converted and rounded as Leadline prints it; "—" when there is none. */
export function formatNumber(si: number | null | undefined, kind: QuantityKind, system: UnitSystem): string {
  if (typeof si !== 'number' || !Number.isFinite(si)) return '—';
  const value = toDisplay(si, kind, system);
  if (kind === 'coefficient') return coefficient(value);
  if (kind === 'count' && Number.isInteger(value)) return String(value);
  return sig(value);
}

/** Number and unit, e.g. "26.2 N·m", "14.97°", "0.15"; "—" when there is no number. */
export function formatQuantity(si: number | null | undefined, kind: QuantityKind, system: UnitSystem): string {
  const number = formatNumber(si, kind, system);
  if (number === '—') return number;
  const symbol = unitSymbol(kind, system);
  if (!symbol) return number;
  return symbol === '°' ? `${number}°` : `${number} ${symbol}`;
}

/** A fraction as a percentage, "78.0 %"; "—" when there is none. */
export function percent(fraction: number | null | undefined): string {
  return formatQuantity(fraction, 'percent', 'SI');
}

/** Review states, in a few words (pages) and in full (the report). */
export const STATES: Readonly<Record<string, string>> = {
  submitted: 'Awaiting review', approved: 'Approved', rejected: 'Rejected', withdrawn: 'Withdrawn', superseded: 'Superseded',
};
export const STATES_IN_FULL: Readonly<Record<string, string>> = {
  submitted: 'Submitted, awaiting review', approved: 'Approved', rejected: 'Rejected', superseded: 'Superseded by a later revision', withdrawn: 'Withdrawn',
};

/** Verdicts of the rules: short (pages) and in full (the report). A verdict is the rules', never the review's state. */
export const VERDICTS: Readonly<Record<string, string>> = { clear: 'Clear', 'needs-acknowledgement': 'Needs acknowledgement', blocked: 'Blocked' };
export const VERDICTS_IN_FULL: Readonly<Record<string, string>> = {
  blocked: 'Blocked: at least one blocking finding',
  'needs-acknowledgement': 'Needs acknowledgement of warnings',
  clear: 'Clear: no blocking findings or warnings',
};

/**
 * The verdict of the rules beside a review state: once a revision is approved, its warnings were acknowledged by the
 * reviewer, so "needs acknowledgement" would read as if it were still its state.
 */
export function verdictWord(verdict: string, state?: string | null): string {
  return state === 'approved' && verdict === 'needs-acknowledgement' ? 'Warnings acknowledged' : wordFor(VERDICTS, verdict);
}

export const SEVERITIES: Readonly<Record<string, string>> = { blocking: 'Blocking', warning: 'Warning', info: 'Information' };
export const SEVERITY_ORDER: Readonly<Record<string, number>> = { blocking: 0, warning: 1, info: 2 };

/** The status of a check against its limit, in words. */
export const CHECK_STATUSES: Readonly<Record<string, string>> = {
  pass: 'meets the limit', warning: 'within the limit, past the warning level', fail: 'past the limit', 'not-computed': 'not computed',
};

/** Events of a product's chain, in words. */
export const EVENTS: Readonly<Record<string, string>> = {
  'product-registered': 'Product registered', 'calculation-opened': 'Calculation opened', 'revision-submitted': 'Revision submitted',
  comment: 'Comment', approved: 'Approved', rejected: 'Rejected', withdrawn: 'Withdrawn', 'calculation-reassigned': 'Calculation reassigned',
};

/** A word from a table, or the value itself when the table does not know it. */
export function wordFor(table: Readonly<Record<string, string>>, value: string): string {
  return Object.prototype.hasOwnProperty.call(table, value) ? table[value] : String(value);
}

/** "1 warning", "2 warnings": a count and its noun, singular or plural. */
export function countOf(n: number, noun: string): string {
  return `${n} ${noun}${n === 1 ? '' : 's'}`;
}

/** An instant as the report prints it, in UTC to the minute: "2026-03-01 09:12 UTC"; "—" for none, the text itself if unreadable. */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}

/** An ISO timestamp in a table whose heading says UTC: "2026-03-01 09:12:44"; '' for none. */
export function formatTime(iso: string | null | undefined): string {
  return iso ? String(iso).replace('T', ' ').replace(/(\.\d+)?(Z|[+-]00(:?00)?)$/, '') : '';
}

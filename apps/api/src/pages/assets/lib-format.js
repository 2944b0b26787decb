/*
 * Words, numbers and units as the pages print them: review states and verdicts in words (never by colour
 * alone), times, hashes, engineering significant figures, and SI or US customary display of SI values.
 */
import { el } from './lib-dom.js';

export const VERDICTS = { clear: 'Clear', 'needs-acknowledgement': 'Needs acknowledgement', blocked: 'Blocked' };
export const STATES = { submitted: 'Awaiting review', approved: 'Approved', rejected: 'Rejected', withdrawn: 'Withdrawn', superseded: 'Superseded' };
export const SEVERITIES = { blocking: 'Blocking', warning: 'Warning', info: 'Information' };
export const SEVERITY_ORDER = { blocking: 0, warning: 1, info: 2 };

export function badge(kind, value, labels) {
  const known = Object.prototype.hasOwnProperty.call(labels, value);
  return el('span', { class: 'badge ' + kind + '-' + (known ? value : 'other') }, known ? labels[value] : String(value));
}

/** "2026-03-01T09:12:44.123456Z" -> "2026-03-01 09:12:44" (the column headings say UTC). */
export function time(iso) {
  return iso ? String(iso).replace('T', ' ').replace(/(\.\d+)?Z$/, '') : '';
}

export function shortHash(hash) {
  return el('code', { class: 'hash', title: hash }, hash ? hash.slice(0, 10) + '…' : '–');
}

/** Counts per severity; compact shows only the non-zero ones. */
export function findingCounts(counts, compact) {
  if (!counts) return el('span', { class: 'muted' }, '–');
  const box = el('span', { class: 'counts' });
  ['blocking', 'warning', 'info'].forEach(function (severity) {
    const n = counts[severity] || 0;
    if (compact && n === 0) return;
    box.append(el('span', { class: 'count' + (n > 0 ? ' severity-' + severity : ''), title: SEVERITIES[severity] }, n + ' ' + severity));
  });
  if (!box.childElementCount) box.append(el('span', { class: 'muted' }, 'none'));
  return box;
}

export function countFindings(findings) {
  const n = { blocking: 0, warning: 0, info: 0 };
  (findings || []).forEach(function (f) {
    if (n[f.severity] !== undefined) n[f.severity]++;
  });
  return n;
}

const MINUS = '\u2212';

/**
 * Engineering significant figures, as the report prints them: 3, or 4 when the leading digit is 1.
 * Plain decimals between 1e-4 and 1e7, else mantissa × 10^n.
 */
export function sig(x) {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  if (x === 0) return '0';
  const sign = x < 0 ? MINUS : '';
  const a = Math.abs(x);
  const digits = a.toPrecision(3).replace(/^[0.]+/, '').startsWith('1') ? 4 : 3;
  const exponent = Math.floor(Math.log10(Number(a.toPrecision(digits))));
  if (exponent >= 7 || exponent <= -5) return sign + (a / 10 ** exponent).toPrecision(digits) + ' × 10^' + exponent;
  const text = a.toPrecision(digits);
  return sign + (/e/i.test(text) ? (a >= 1 ? a.toFixed(0) : text) : text);
}

/*
 * Display units per kind of quantity. Factors are exact by definition (NIST SP 811, appendix B.8):
 * 1 in = 0.0254 m, 1 lbf = 4.4482216152605 N, 1 psi = 1 lbf/in², 1 ft = 0.3048 m.
 */
const IN = 0.0254;
const LBF = 4.4482216152605;
const PSI = LBF / (IN * IN);
const FT_PER_MIN = 0.3048 / 60;
const UNITS = {
  SI: {
    length: ['mm', 1e3], force: ['kN', 1e-3], torque: ['N·m', 1], stress: ['MPa', 1e-6], pressure: ['MPa', 1e-6],
    pv: ['MPa·m/s', 1e-6], slidingSpeed: ['m/s', 1], travelSpeed: ['m/min', 60], power: ['W', 1], rpm: ['rpm', 1],
  },
  US: {
    length: ['in', 1 / IN], force: ['lbf', 1 / LBF], torque: ['lbf·in', 1 / (LBF * IN)], stress: ['ksi', 1 / (1000 * PSI)], pressure: ['psi', 1 / PSI],
    pv: ['psi·ft/min', 1 / (PSI * FT_PER_MIN)], slidingSpeed: ['ft/min', 1 / FT_PER_MIN], travelSpeed: ['in/min', 60 / IN], power: ['hp', 1 / 745.69987158227022], rpm: ['rpm', 1],
  },
};

/** The display unit of a kind in a system ('SI' or 'US'). */
export function unitOf(kind, system) {
  return (UNITS[system] || UNITS.SI)[kind][0];
}

/** An SI value in the display unit of its kind. */
export function toDisplay(si, kind, system) {
  return si * (UNITS[system] || UNITS.SI)[kind][1];
}

/** "12.3 N·m": an SI value in significant figures and its display unit; "—" when there is none. */
export function quantity(si, kind, system) {
  if (si === null || si === undefined || !Number.isFinite(si)) return '—';
  return sig(toDisplay(si, kind, system)) + ' ' + unitOf(kind, system);
}

export function percent(fraction) {
  return fraction === null || fraction === undefined ? '—' : sig(fraction * 100) + ' %';
}

/*
 * Words, numbers and units as the pages print them. Significant figures, display units, the words for states,
 * verdicts and severities and the times all come from the server's presentation module (lib-presentation.js,
 * generated from libs/presentation); this file only adds the page elements built from them.
 */
import { el } from './lib-dom.js';
import { countOf, formatQuantity, formatTime, percent, SEVERITIES, SEVERITY_ORDER, sig, STATES, VERDICTS, verdictWord, wordFor } from './lib-presentation.js';

export { percent, SEVERITIES, SEVERITY_ORDER, sig, STATES, VERDICTS };

export function badge(kind, value, labels) {
  const known = Object.prototype.hasOwnProperty.call(labels, value);
  return el('span', { class: 'badge ' + kind + '-' + (known ? value : 'other') }, wordFor(labels, value));
}

/** The verdict of the rules of a revision in its review state (an approved revision's warnings were acknowledged). */
export function verdictBadge(verdict, state) {
  const known = Object.prototype.hasOwnProperty.call(VERDICTS, verdict);
  return el('span', { class: 'badge verdict-' + (known ? verdict : 'other') }, verdictWord(verdict, state));
}

/** "2026-03-01T09:12:44.123456Z" -> "2026-03-01 09:12:44" (the column headings say UTC). */
export const time = formatTime;

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
    const words = severity === 'warning' ? countOf(n, 'warning') : n + (severity === 'info' ? ' for information' : ' blocking');
    box.append(el('span', { class: 'count' + (n > 0 ? ' severity-' + severity : ''), title: SEVERITIES[severity] }, words));
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

/** "12.3 N·m": an SI value in significant figures and its display unit ('SI' or 'US'); "—" when there is none. */
export function quantity(si, kind, system) {
  return formatQuantity(si, kind, system);
}

/* Findings as a list, by severity (words first, colour only as a second cue), each with its basis. */
import { el } from './lib-dom.js';
import { badge, SEVERITIES, SEVERITY_ORDER } from './lib-format.js';

export function sortedFindings(findings) {
  return findings.slice().sort(function (a, b) {
    return (SEVERITY_ORDER[a.severity] ?? 9) - (SEVERITY_ORDER[b.severity] ?? 9);
  });
}

export function renderFindings(list, findings) {
  list.replaceChildren();
  if (findings.length === 0) list.append(el('li', { class: 'muted' }, 'No findings.'));
  sortedFindings(findings).forEach(function (f) {
    list.append(
      el(
        'li',
        { class: 'finding finding-' + (SEVERITIES[f.severity] ? f.severity : 'other'), 'data-rule': f.ruleId },
        el('div', { class: 'finding-head' }, badge('severity', f.severity, SEVERITIES), ' ', el('code', {}, f.ruleId), f.subject ? el('span', { class: 'muted' }, ' · ' + f.subject) : null),
        el('p', {}, f.message),
        f.basis ? el('p', { class: 'muted small' }, 'Basis: ' + f.basis) : null,
      ),
    );
  });
}

/*
 * What changed between two design inputs, in the form's own words: each input field whose value differs, named by
 * the label of its control (and the group it sits in), with the values as entered (a quantity carries its unit).
 * Used by the design form's submit confirmation; the compare page and GET /revisions/:id/diff hold the full list.
 */
import { el } from './lib-dom.js';
import { percent, sig } from './lib-format.js';
import { fieldFor } from './design-fields.js';

/** Every leaf of a design input by dotted path ("nut.length" -> "60 mm"). */
export function leaves(value, prefix, out) {
  out = out || {};
  if (value !== null && typeof value === 'object') {
    Object.keys(value).forEach(function (key) {
      leaves(value[key], prefix ? prefix + '.' + key : key, out);
    });
  } else if (prefix) {
    out[prefix] = value;
  }
  return out;
}

/** The input fields whose values differ, in the order of the form (then the rest by path). */
export function changedFields(before, after) {
  const a = leaves(before, '');
  const b = leaves(after, '');
  const paths = Object.keys(a).concat(Object.keys(b).filter(function (p) {
    return !Object.prototype.hasOwnProperty.call(a, p);
  }));
  const order = Array.from(document.querySelectorAll('[data-path]')).map(function (node) {
    return node.getAttribute('data-path');
  });
  const rank = function (p) {
    const i = order.indexOf(p);
    return i < 0 ? order.length : i;
  };
  return paths
    .filter(function (p) {
      return String(a[p]) !== String(b[p]) || (p in a) !== (p in b);
    })
    .sort(function (x, y) {
      return rank(x) - rank(y) || (x < y ? -1 : 1);
    })
    .map(function (p) {
      return { path: p, label: labelOf(p), before: a[p], after: b[p] };
    });
}

/** "Thread friction — Minimum coefficient": the control's label with its group's legend, or the path itself. */
export function labelOf(path) {
  const input = fieldFor(path);
  if (!input || input.getAttribute('data-path') !== path) return path;
  const label = input.id ? document.querySelector('label[for="' + input.id + '"]') : null;
  const own = (label ? label.textContent : input.getAttribute('aria-label') || path).trim();
  const group = input.closest('fieldset');
  const legend = group && group.querySelector('legend');
  return legend && legend.textContent.trim() !== own ? legend.textContent.trim() + ' — ' + own : own;
}

/** A value as entered, in words where it is not a quantity. */
export function shown(value) {
  if (value === undefined || value === null || value === '') return '(not given)';
  if (value === true) return 'yes';
  if (value === false) return 'no';
  return String(value);
}

/** A check's figure: a factor in significant figures, a share of an allowable in per cent. */
export function checkFigure(check) {
  if (!check || check.value === null || check.value === undefined) return 'not computed';
  return check.quantity === 'fraction' ? percent(check.value) : sig(check.value);
}

/** One row of the changes table. */
export function changeRow(change) {
  return el('tr', { 'data-path': change.path }, el('th', { scope: 'row' }, change.label), el('td', {}, shown(change.before)), el('td', {}, shown(change.after)));
}

/*
 * problem+json display: a summary (title, status, each field path with its message) and, where a form maps
 * paths to its inputs, the message at the field itself (aria-invalid + aria-describedby), scrolling to the first.
 */
import { ApiError } from './lib-api.js';
import { el } from './lib-dom.js';

/**
 * Shows a refusal in `slot`: title and status, then each field path with its message (or the detail).
 * options.label(path): the field's name in words (or null to show the path); with it, the title is the refusal's
 * detail when there are no field errors, and the HTTP status is left out (the words say what to do).
 */
export function showProblem(slot, err, options) {
  const label = options && options.label;
  const problem = err instanceof ApiError ? err.problem : { title: 'Something went wrong', detail: String(err && err.message) };
  const box = el('div', { class: 'problem' });
  box.append(el('p', { class: 'problem-title' }, problem.title || 'Request refused', err && err.status && !label ? el('span', { class: 'status' }, ' HTTP ' + err.status) : null));
  const errors = Array.isArray(problem.errors) ? problem.errors : [];
  if (errors.length) {
    const list = el('ul', { class: 'field-errors' });
    errors.forEach(function (issue) {
      const words = label ? label(String(issue.path)) : null;
      list.append(el('li', {}, words ? el('strong', {}, words + ':') : el('code', {}, String(issue.path)), ' ', String(issue.message)));
    });
    box.append(list);
  } else if (problem.detail) {
    box.append(el('p', {}, String(problem.detail)));
  }
  slot.replaceChildren(box);
}

export function clearProblem(slot) {
  slot.replaceChildren();
}

/** The field errors of a refusal ([] for anything else). */
export function fieldErrors(err) {
  return err instanceof ApiError && Array.isArray(err.problem.errors) ? err.problem.errors : [];
}

/** Removes every message placed at a field inside `root`. */
export function clearFieldErrors(root) {
  root.querySelectorAll('.field-error').forEach(function (node) {
    node.remove();
  });
  root.querySelectorAll('[aria-invalid="true"]').forEach(function (input) {
    input.removeAttribute('aria-invalid');
    const described = (input.getAttribute('aria-describedby') || '').split(' ').filter(function (id) {
      return id && !id.endsWith('-error');
    });
    if (described.length) input.setAttribute('aria-describedby', described.join(' '));
    else input.removeAttribute('aria-describedby');
  });
}

/**
 * Puts each field error at the input that `locate(path)` returns (an element, or null when no field matches)
 * and returns the errors no field took. The first marked input is scrolled into view (and focused if asked).
 */
export function showFieldErrors(root, errors, locate, options) {
  clearFieldErrors(root);
  const unplaced = [];
  let first = null;
  errors.forEach(function (issue, i) {
    const input = locate(String(issue.path));
    if (!input) {
      unplaced.push(issue);
      return;
    }
    const id = (input.id || 'field-' + i) + '-error';
    if (document.getElementById(id)) {
      document.getElementById(id).append(' ' + String(issue.message));
    } else {
      const message = el('p', { class: 'field-error', id: id }, el('strong', {}, 'Error: '), String(issue.message));
      (input.closest('.field') || input.parentElement).append(message);
      input.setAttribute('aria-invalid', 'true');
      input.setAttribute('aria-describedby', ((input.getAttribute('aria-describedby') || '') + ' ' + id).trim());
    }
    if (!first) first = input;
  });
  if (first) {
    first.scrollIntoView({ block: 'center' });
    if (options && options.focus) first.focus({ preventScroll: true });
  }
  return unplaced;
}

/*
 * What was said on a revision under review, beside what it is on (review-revision.js's comment panels): the list of
 * remarks, the comments on each finding, each changed input and each result (the revision's checks, with their value,
 * limit and status), and the comment form whose labelled list chooses the target (the revision, an input (changed ones first), a
 * finding or a result; the button beside a result chooses it too).
 */
import { api, ApiError } from './lib-api.js';
import { $, el } from './lib-dom.js';
import { time } from './lib-format.js';
import { sortedFindings } from './lib-findings.js';
import { clearFieldErrors, clearProblem, showFieldErrors, showProblem } from './lib-problem.js';
import { CHECK_STATUSES, formatQuantity, wordFor } from './lib-presentation.js';

/** What a remark is on, in the service's words (its `on`: reviews/remarks.ts), or nothing for the revision as a whole. */
function remarkOn(on) {
  return on ? ' on ' + on : '';
}

const REMARK_KINDS = { comment: 'Comment', decision: 'Decision comment', acknowledgement: 'Acknowledgement', withdrawal: 'Withdrawal' };

/** One remark as a list item: who, what kind, on what, when, and the text. */
export function remarkItem(r) {
  return el('li', { class: 'remark remark-' + r.kind },
    el('strong', {}, REMARK_KINDS[r.kind] || r.kind), remarkOn(r.on), ' — ', r.by ? r.by.name : 'unknown', ', ', time(r.at), ' UTC: ',
    el('span', { class: 'remark-text' }, r.text));
}

/** Changed input field paths in words, from the comparison (GET /revisions/:id/diff names each changed input). */
const fieldLabels = {};

/** What was said on this revision, and each comment beside what it is on: a finding, a result or a changed input. */
export function renderRemarks(rev) {
  const remarks = rev.remarks || [];
  $('remarks').replaceChildren(...remarks.map(remarkItem));
  $('remarks-section').hidden = remarks.length === 0;
  renderResults(rev);
  renderInputRemarks(rev);
  document.querySelectorAll('#findings li[data-rule]').forEach(function (li) {
    const on = remarks.filter(function (r) { return r.target && r.target.finding === li.dataset.rule; });
    const old = li.querySelector('.finding-remarks');
    if (old) old.remove();
    if (on.length) li.append(el('ul', { class: 'finding-remarks remarks', 'aria-label': 'Comments on ' + li.dataset.rule }, ...on.map(remarkItem)));
  });
}

/** The changed inputs' names, from the comparison (GET /revisions/:id/diff), for the remarks and the comment form. */
export function rememberFieldLabels(inputs) {
  inputs.forEach(function (c) { fieldLabels[c.path] = c.label; });
}

/** The remarks of the previous revision, kept for the changed inputs' comments. */
let previousRemarks = [];
export function rememberPreviousRemarks(remarks) {
  previousRemarks = remarks;
}

/** A check's value or limit as the report prints it (libs/presentation): a factor, or a share of an allowable in %. */
function checkNumber(c, value, system) {
  return formatQuantity(value, c.quantity === 'fraction' ? 'percent' : 'ratio', system);
}

/** Whether this user may comment here (authors and reviewers; the comment form and the buttons beside the results). */
let commenting = false;

/** The revision's results (its checks), each with the comments on it and a button that starts a comment on it. */
function renderResults(rev) {
  const checks = rev.checks || [];
  const remarks = rev.remarks || [];
  const system = rev.normalized && rev.normalized.unitSystem === 'US' ? 'US' : 'SI';
  $('results').tBodies[0].replaceChildren(...checks.map(function (c, i) {
    const on = remarks.filter(function (r) { return r.target && r.target.result === c.id; });
    const governing = rev.governing && rev.governing.id === c.id;
    const missing = c.value === null || c.value === undefined;
    return el('tr', { 'data-result': c.id },
      el('th', { scope: 'row' },
        el('span', { id: 'result-label-' + i }, c.label), governing ? el('strong', {}, ' (governing)') : null,
        on.length ? el('ul', { class: 'remarks small', 'aria-label': 'Comments on ' + c.label }, ...on.map(remarkItem)) : null),
      el('td', { class: 'num' }, missing ? 'not computed' : checkNumber(c, c.value, system)),
      el('td', { class: 'num' }, (c.limitKind === 'minimum' ? '≥ ' : '≤ ') + checkNumber(c, c.limit, system)),
      el('td', {}, wordFor(CHECK_STATUSES, c.status) + (c.note ? ': ' + c.note : '')),
      el('td', {}, commenting ? el('button', { type: 'button', class: 'comment-on', 'data-result': c.id, 'aria-describedby': 'result-label-' + i }, 'Comment on this result') : null));
  }));
  $('results-section').hidden = checks.length === 0;
}

/** Each changed input's comments (on this revision and the previous one) beside it in the changes table. */
export function renderInputRemarks(rev) {
  document.querySelectorAll('#changes-inputs tr[data-path]').forEach(function (tr) {
    const path = tr.dataset.path;
    const said = previousRemarks.concat(rev.remarks || []).filter(function (r) { return r.target && r.target.field && r.target.field.replace(/^design\./, '') === path; });
    const th = tr.querySelector('th');
    const old = th.querySelector('.input-remarks');
    if (old) old.remove();
    if (said.length) th.append(el('ul', { class: 'input-remarks remarks small', 'aria-label': 'Comments on ' + (fieldLabels[path] || path) }, ...said.map(remarkItem)));
  });
}

/** The comment form: on the revision as a whole, a changed input, a finding or a result, chosen in one labelled list. */
export function setUpComment(rev, reload) {
  commenting = true;
  renderResults(rev);
  const select = $('comment-target');
  const group = function (label, options) {
    return options.length ? el('optgroup', { label: label }, ...options) : null;
  };
  select.replaceChildren(
    el('option', { value: '' }, 'This revision as a whole'),
    group('Inputs changed since the previous revision', Object.keys(fieldLabels).map(function (path) {
      return el('option', { value: 'field:' + path }, 'Input: ' + fieldLabels[path]);
    })),
    group(Object.keys(fieldLabels).length ? 'Other inputs' : 'Inputs', (rev.inputFields || []).filter(function (f) {
      return !(f.path in fieldLabels);
    }).map(function (f) {
      return el('option', { value: 'field:' + f.path }, 'Input: ' + f.label + ' (' + f.value + ')');
    })),
    group('Findings', sortedFindings(rev.findings).map(function (f) {
      return el('option', { value: 'finding:' + f.ruleId }, 'Finding: ' + f.ruleId);
    })),
    group('Results', (rev.checks || []).map(function (c) {
      return el('option', { value: 'result:' + c.id }, 'Result: ' + c.label);
    })),
  );
  // the button beside a result chooses it and moves to the comment's text
  $('results').addEventListener('click', function (event) {
    const button = event.target.closest('button.comment-on');
    if (!button) return;
    select.value = 'result:' + button.dataset.result;
    $('comment-text').focus();
  });
  const form = $('comment-form');
  const slot = $('comment-problem');
  const locate = function (path) {
    return path === 'text' ? $('comment-text') : /^target/.test(path) ? select : null;
  };
  const words = function (path) {
    return path === 'text' ? 'Comment' : /^target/.test(path) ? 'On' : null;
  };
  form.addEventListener('submit', async function (event) {
    event.preventDefault();
    clearProblem(slot);
    clearFieldErrors(form);
    $('comment-status').textContent = '';
    const text = $('comment-text').value.trim();
    const refuse = function (err) {
      showProblem(slot, err, { label: words });
      const unplaced = showFieldErrors(form, (err.problem && err.problem.errors) || [], locate, { focus: true });
      if (unplaced.length) {
        slot.setAttribute('tabindex', '-1');
        slot.focus();
      }
    };
    if (!text) {
      refuse(new ApiError(0, { title: 'Not added: the comment has no text', errors: [{ path: 'text', message: 'write the comment first' }] }));
      return;
    }
    const body = { text: text };
    const chosen = select.value;
    if (chosen) {
      const k = chosen.indexOf(':');
      body.target = {};
      body.target[chosen.slice(0, k)] = chosen.slice(k + 1);
    }
    const button = $('comment-submit');
    button.disabled = true;
    try {
      const added = await api('/api/v1/revisions/' + encodeURIComponent(rev.id) + '/comments', { method: 'POST', body: body });
      $('comment-text').value = '';
      $('comment-status').textContent = 'Comment added' + (added.on ? remarkOn(added.on) : ' on the revision') + '.';
      reload();
    } catch (err) {
      refuse(err);
    } finally {
      button.disabled = false;
    }
  });
  $('comment').hidden = false;
}

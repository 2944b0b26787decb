/*
 * One calculation (/design/calculations/:id): every revision with state, verdict, author, note and date; any
 * two side by side from GET /revisions/:id/diff, changed rows marked in words ("Changed") as well as by style.
 */
import { api } from './lib-api.js';
import { $, el, pathId } from './lib-dom.js';
import { badge, countFindings, findingCounts, quantity, sig, STATES, time, verdictBadge } from './lib-format.js';
import { clearProblem, showProblem } from './lib-problem.js';
import { currentUser, startPage } from './lib-session.js';

/** Dotted paths of the leaves of a JSON value (as the diff names them). */
function flatten(value, prefix, out) {
  out = out || {};
  if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) flatten(v, prefix ? prefix + '.' + k : k, out);
  } else out[prefix] = value;
  return out;
}

function show(value) {
  if (value === null || value === undefined) return el('span', { class: 'muted' }, '(not given)');
  if (typeof value === 'number') return Number.isInteger(value) ? String(value) : sig(value);
  return String(value);
}

/**
 * A result of one revision as the report prints it: with its unit in the design's system (efficiencies in per cent),
 * or "not computed by engine X" where that revision's engine did not compute it.
 */
function showResult(value, kind, revision, system, missing) {
  if (missing) return el('span', { class: 'muted' }, 'not computed by engine ' + revision.engineVersion);
  if (typeof value === 'number' && kind) return quantity(value, kind, system);
  return show(value);
}

function changedMark(changed) {
  return changed ? el('span', { class: 'changed-mark' }, 'Changed') : el('span', { class: 'muted small' }, 'same');
}

function head(table, labels) {
  table.tHead.replaceChildren(el('tr', {}, labels.map(function (l) {
    return el('th', { scope: 'col' }, l);
  })));
}

function renderComparison(diff, from, to) {
  const a = 'Revision ' + from.revision;
  const b = 'Revision ' + to.revision;
  $('compare-summary').textContent = a + ' against ' + b + ': ' + diff.inputs.length + ' input' + (diff.inputs.length === 1 ? '' : 's') + ' and ' + diff.results.length + ' result' + (diff.results.length === 1 ? '' : 's') + ' changed.';

  const verdict = $('compare-verdict');
  head(verdict, ['', a, b, 'Change']);
  const findingText = function (r) {
    return r.findings.map(function (f) {
      return f.severity + ' ' + f.ruleId;
    }).join(', ') || 'none';
  };
  // Every row compares its two values: a row is "Changed" exactly when they differ
  const vRows = [
    ['Verdict of the rules', verdictBadge(from.verdict, from.review.state), verdictBadge(to.verdict, to.review.state), from.verdict !== to.verdict],
    ['Review state', badge('state', from.review.state, STATES), badge('state', to.review.state, STATES), from.review.state !== to.review.state],
    ['Findings', findingCounts(countFindings(from.findings)), findingCounts(countFindings(to.findings)), diff.findings.added.length + diff.findings.removed.length + diff.findings.changed.length > 0],
    ['Findings by rule', findingText(from), findingText(to), findingText(from) !== findingText(to)],
    ['Engine and rule set', from.engineVersion + ' · ' + from.ruleSetVersion, to.engineVersion + ' · ' + to.ruleSetVersion, from.engineVersion !== to.engineVersion || from.ruleSetVersion !== to.ruleSetVersion],
    ['Added findings', '', diff.findings.added.map(function (f) { return f.severity + ' ' + f.ruleId + ': ' + f.message; }).join('; ') || 'none', diff.findings.added.length > 0],
    ['Removed findings', diff.findings.removed.map(function (f) { return f.severity + ' ' + f.ruleId + ': ' + f.message; }).join('; ') || 'none', '', diff.findings.removed.length > 0],
  ];
  verdict.tBodies[0].replaceChildren(...vRows.map(function (r) {
    return el('tr', { class: r[3] ? 'changed' : '' }, el('th', { scope: 'row' }, r[0]), el('td', {}, r[1]), el('td', {}, r[2]), el('td', {}, changedMark(r[3])));
  }));

  const inputs = $('compare-inputs');
  head(inputs, ['Field', a, b, 'Change']);
  const fa = flatten(from.input, '');
  const fb = flatten(to.input, '');
  const changed = new Set(diff.inputs.map(function (c) { return c.path; }));
  const paths = Array.from(new Set(Object.keys(fa).concat(Object.keys(fb)))).sort();
  inputs.tBodies[0].replaceChildren(...paths.map(function (p) {
    const c = changed.has(p);
    return el('tr', { class: c ? 'changed' : '', 'data-path': p }, el('th', { scope: 'row' }, el('code', {}, p)), el('td', {}, show(fa[p])), el('td', {}, show(fb[p])), el('td', {}, changedMark(c)));
  }));

  const results = $('compare-results');
  const system = to.normalized && to.normalized.unitSystem === 'US' ? 'US' : 'SI';
  head(results, ['Result (' + (system === 'US' ? 'US customary' : 'SI') + ' units)', a, b, 'Relative change']);
  results.tBodies[0].replaceChildren(...(diff.results.length ? diff.results.map(function (c) {
    return el('tr', { class: 'changed', 'data-path': c.path },
      el('th', { scope: 'row' }, c.label || c.path, el('br'), el('code', { class: 'muted small' }, c.path)),
      el('td', {}, showResult(c.from, c.quantity, from, system, c.notComputed === 'from')), el('td', {}, showResult(c.to, c.quantity, to, system, c.notComputed === 'to')),
      el('td', {}, el('span', { class: 'changed-mark' }, 'Changed'), c.relativeChange === undefined ? '' : ' ' + (c.relativeChange > 0 ? '+' : '') + sig(c.relativeChange * 100) + ' %'));
  }) : [el('tr', {}, el('td', { colspan: 4 }, 'No result changed.'))]));
  $('comparison').hidden = false;
}

async function calculationPage() {
  const id = pathId(/^\/design\/calculations\/([^/]+)$/);
  const slot = $('calculation-problem');
  let revisions;
  async function loadRevisions() {
    revisions = (await api('/api/v1/calculations/' + encodeURIComponent(id) + '/revisions')).items;
    const me = currentUser();
    $('revisions').tBodies[0].replaceChildren(...revisions.map(function (r) {
      const actions = el('span', { class: 'row-actions' }, el('a', { href: '/design/calculations/' + encodeURIComponent(id) + '/revise?from=' + encodeURIComponent(r.id) }, 'New revision from ' + r.revision), ' ', el('a', { href: '/review/revisions/' + encodeURIComponent(r.id) }, 'Report'));
      if (r.review.state === 'submitted' && me && r.author && r.author.id === me.id) {
        const button = el('button', { type: 'button', class: 'withdraw' }, 'Withdraw ' + r.revision);
        button.addEventListener('click', async function () {
          button.disabled = true;
          try {
            await api('/api/v1/revisions/' + encodeURIComponent(r.id) + '/withdraw', { method: 'POST', body: {} });
            $('action-status').textContent = 'Revision ' + r.revision + ' withdrawn.';
            await loadRevisions();
          } catch (err) {
            showProblem(slot, err);
            button.disabled = false;
          }
        });
        actions.append(' ', button);
      }
      return el(
        'tr',
        { 'data-revision': r.id },
        el('td', { class: 'num' }, r.revision),
        el('td', {}, badge('state', r.review.state, STATES)),
        el('td', {}, verdictBadge(r.verdict, r.review.state)),
        el('td', {}, findingCounts(countFindings(r.findings), true)),
        el('td', {}, r.author ? r.author.name : '–'),
        el('td', { class: 'note' }, r.note || ''),
        el('td', { class: 'nowrap' }, time(r.createdAt)),
        el('td', {}, actions),
      );
    }));
    const options = function (selected) {
      return revisions.map(function (r) {
        return el('option', { value: r.id, selected: r.id === selected }, 'Revision ' + r.revision + ' (' + (STATES[r.review.state] || r.review.state).toLowerCase() + ')');
      });
    };
    const n = revisions.length;
    $('compare-from').replaceChildren(...options(n > 1 ? revisions[n - 2].id : revisions[0].id));
    $('compare-to').replaceChildren(...options(revisions[n - 1].id));
  }
  try {
    const calc = await api('/api/v1/calculations/' + encodeURIComponent(id));
    const product = await api('/api/v1/products/' + encodeURIComponent(calc.productId));
    document.title = product.code + ' · ' + calc.title + ' · Leadline';
    $('calculation-heading').textContent = product.code + ' · ' + calc.title;
    $('product-link').textContent = 'Product ' + product.code + ' — ' + product.name;
    $('product-link').setAttribute('href', '/design/products/' + encodeURIComponent(product.id));
    $('revise-latest').setAttribute('href', '/design/calculations/' + encodeURIComponent(id) + '/revise');
    await loadRevisions();
    $('calculation').hidden = false;
  } catch (err) {
    showProblem(slot, err);
    return;
  }
  $('compare-form').addEventListener('submit', async function (event) {
    event.preventDefault();
    const problem = $('compare-problem');
    clearProblem(problem);
    const from = revisions.find(function (r) { return r.id === $('compare-from').value; });
    const to = revisions.find(function (r) { return r.id === $('compare-to').value; });
    try {
      const diff = await api('/api/v1/revisions/' + encodeURIComponent(to.id) + '/diff?against=' + encodeURIComponent(from.id));
      renderComparison(diff, from, to);
      $('compare-summary').focus && $('compare-heading').scrollIntoView({ block: 'start' });
    } catch (err) {
      showProblem(problem, err);
    }
  });
}

startPage(calculationPage);

/*
 * Find a screw for a duty (/design/sizing): the requirements form, POST /api/v1/sizing, the ranked screws with the
 * governing check of each, the headroom of the best three, what stopped the rest, and "open as a new calculation",
 * which hands the chosen screw's design input to the design form of a product (lib-draft.js: sessionStorage).
 */
import { api, ApiError } from './lib-api.js';
import { $, el, fillTable } from './lib-dom.js';
import { badge, percent, quantity, sig, VERDICTS } from './lib-format.js';
import { clearFieldErrors, clearProblem, fieldErrors, showFieldErrors, showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';
import { putDraft } from './lib-draft.js';

function option(value, label) {
  return el('option', { value: value }, label);
}

/** Fills the library selects (friction pairs, materials) and explains the chosen friction range beside it. */
async function loadLibrary() {
  const [friction, materials] = await Promise.all([api('/api/v1/friction-sources'), api('/api/v1/materials')]);
  const entries = {};
  friction.items.forEach(function (e) {
    entries[e.id] = e;
  });
  const fill = function (select, items, preferred) {
    select.replaceChildren.apply(select, items);
    if (preferred && select.querySelector('option[value="' + preferred + '"]')) select.value = preferred;
  };
  const pairs = function (surface) {
    return friction.items.filter(function (e) {
      return e.surface === surface;
    }).map(function (e) {
      return option(e.id, e.pair + ', ' + e.lubrication + ' (f ' + e.min + ' to ' + e.max + ')');
    });
  };
  fill($('s-thread-friction'), pairs('thread'), 'thread/steel-bronze/oil');
  fill($('s-collar-friction'), pairs('collar'), 'collar/hard-steel-bronze');
  fill($('s-nut-material'), materials.nuts.map(function (m) {
    return option(m.id, m.name);
  }), 'bronze');
  fill($('s-screw-material'), materials.screws.map(function (m) {
    return option(m.id, m.name + ' (yield ' + sig(m.yieldStrength / 1e6) + ' MPa)');
  }), 'steel-1045-cd');
  ['thread', 'collar'].forEach(function (surface) {
    const select = $('s-' + surface + '-friction');
    const help = $('s-' + surface + '-friction-help');
    const base = help.textContent;
    const describe = function () {
      const e = entries[select.value];
      help.textContent = e ? base + ' Range ' + e.min + ' to ' + e.max + '; source: ' + e.source.reference + '.' : base;
    };
    select.addEventListener('change', describe);
    describe();
  });
}

const text = function (id) {
  return $(id).value.trim();
};

/** The request body from the form; empty optional fields are left out. */
function readRequest() {
  const collarKind = $('s-collar-kind').value;
  const requirements = {
    load: { axial: text('s-load'), sense: $('s-sense').value },
    duty: { kind: $('s-duty').value, brake: $('s-brake').checked, vibration: $('s-vibration').checked },
    friction: { thread: { entry: $('s-thread-friction').value } },
    collar: collarKind === 'none' ? { kind: 'none' } : { kind: collarKind, meanDiameterRatio: Number($('s-collar-ratio').value) },
    nut: { material: $('s-nut-material').value },
    screw: { material: $('s-screw-material').value, unsupportedLength: text('s-length'), ends: $('s-ends').value },
  };
  if (text('s-speed')) requirements.duty.speed = text('s-speed');
  if (collarKind !== 'none') requirements.friction.collar = { entry: $('s-collar-friction').value };
  if (text('s-nut-pressure')) requirements.nut.allowablePressure = text('s-nut-pressure');
  if (text('s-torque')) requirements.drive = { availableTorque: text('s-torque') };
  const checked = function (name) {
    return Array.from(document.querySelectorAll('input[name="' + name + '"]:checked')).map(function (i) {
      return i.value;
    });
  };
  const search = {
    forms: checked('form'),
    starts: checked('starts').map(Number),
    objective: $('s-objective').value,
    limit: Number($('s-limit').value),
  };
  const majorDiameter = {};
  if (text('s-dmin')) majorDiameter.min = text('s-dmin');
  if (text('s-dmax')) majorDiameter.max = text('s-dmax');
  if (majorDiameter.min || majorDiameter.max) search.majorDiameter = majorDiameter;
  const ratios = text('s-ratios');
  if (ratios) {
    search.nutLength = {
      ratios: ratios.split(/[,\s;]+/).filter(Boolean).map(function (r) {
        return Number(r);
      }),
    };
  }
  return { requirements: requirements, search: search };
}

/** The input (or group) a field error's path names, e.g. "requirements.load.axial" or "search.starts.0". */
function fieldFor(path) {
  const form = $('sizing-form');
  const parts = String(path).split('.');
  for (let n = parts.length; n > 0; n--) {
    const candidate = parts.slice(0, n).join('.');
    const found = form.querySelector('[data-path="' + candidate.replace(/"/g, '') + '"]');
    if (found) return found.tagName === 'FIELDSET' ? found.querySelector('input') : found;
  }
  return null;
}

const RULE_TITLES = {};

/** "1.31 against ≥ 1" / "0.62 against ≤ 1": a check's value and its blocking limit, in words. */
function governingText(g, checks) {
  if (!g) return el('span', { class: 'muted' }, 'no numeric check applies');
  const against = (g.limitKind === 'minimum' ? 'at least ' : 'at most ') + sig(g.limit);
  // Checks past their warning level are named beside the governing one: the row's warning comes from them
  const warned = (checks || []).filter(function (c) { return c.status === 'warning' && c.id !== g.id; });
  const warnings = warned.length === 0 ? [] : [el('span', { class: 'muted' }, ' · warning: ' + warned.map(function (c) {
    return c.shortLabel + (c.value === null ? ' not computed' : ' ' + sig(c.value) + ' (warning level ' + sig(c.warnLimit) + ')');
  }).join('; '))];
  return el.apply(null, ['span', {}, el('strong', {}, g.label), ' ', sig(g.value), ' (limit ' + against + ')', el('span', { class: 'muted' }, ' · ' + g.ruleId)].concat(warnings));
}

function renderAnswer(answer, onOpen) {
  const n = answer.candidates.length;
  $('answer-status').textContent =
    answer.passed + ' of ' + answer.searched + ' candidates pass (' + answer.evaluations + ' evaluated, ' + answer.pruned + ' decided without an evaluation of their own); ' +
    n + (n === 1 ? ' screw is' : ' screws are') + ' listed, ranked by ' + answer.objective.replace(/-/g, ' ') + '. Rule set ' + answer.ruleSetVersion + ', engine ' + answer.engineVersion + '.';
  fillTable(
    $('candidates'),
    answer.candidates.map(function (c) {
      const f = c.figures;
      const open = el('button', { type: 'button', class: 'quiet', 'data-rank': c.rank }, 'Open as a new calculation');
      open.setAttribute('aria-label', 'Open as a new calculation: ' + c.size + ', ' + c.starts + ' start' + (c.starts > 1 ? 's' : '') + ', nut ' + c.nutLength);
      open.addEventListener('click', function () {
        onOpen(c, open);
      });
      return el(
        'tr',
        { 'data-rank': c.rank },
        el('td', { class: 'num' }, c.rank),
        el('th', { scope: 'row' }, c.size),
        el('td', { class: 'num' }, c.starts),
        el('td', { class: 'nowrap' }, c.nutLength),
        el('td', {}, badge('verdict', c.verdict, VERDICTS)),
        el('td', { class: 'governing' }, governingText(c.governing, c.checks)),
        el('td', { class: 'num nowrap' }, quantity(f.raiseTorque, 'torque', 'SI')),
        el('td', { class: 'num' }, percent(f.efficiency)),
        el('td', { class: 'num' }, sig(f.lowestStrengthSafetyFactor), el('span', { class: 'muted' }, ' ' + f.lowestStrengthCheck)),
        el('td', { class: 'num nowrap' }, sig(f.massPerMetre) + ' kg/m'),
        el('td', {}, open),
      );
    }),
    $('candidates-empty'),
  );
  $('headroom').replaceChildren.apply(
    $('headroom'),
    answer.headroom.length
      ? answer.headroom.map(function (h) {
          return el('li', { 'data-rank': h.rank }, 'Rank ' + h.rank + ', ' + h.size + ' (' + h.starts + ' start' + (h.starts > 1 ? 's' : '') + ', nut ' + h.nutLength + '): passes up to ',
            el('strong', {}, h.axialLoad === null ? 'no blocking load found' : quantity(parseFloat(h.axialLoad), 'force', 'SI')),
            h.factor === null ? '' : ' (' + sig(h.factor) + ' × the stated load); above it ' + (RULE_TITLES[h.blockedBy] || h.blockedBy) + ' blocks.');
        })
      : [el('li', { class: 'muted' }, 'No screw passes, so there is no headroom to report.')],
  );
  const rejected = Object.entries(answer.rejected).sort(function (a, b) {
    return b[1] - a[1];
  });
  fillTable(
    $('rejected'),
    rejected.map(function (entry) {
      return el('tr', { 'data-rule': entry[0] }, el('td', {}, RULE_TITLES[entry[0]] ? RULE_TITLES[entry[0]] + ' ' : '', el('code', {}, entry[0])), el('td', { class: 'num' }, entry[1]));
    }),
  );
  $('answer').hidden = false;
}

async function sizingPage() {
  try {
    await loadLibrary();
    const rules = await api('/api/v1/rule-sets');
    (rules.rules || []).forEach(function (r) {
      RULE_TITLES[r.id] = r.title;
    });
  } catch (err) {
    showProblem($('sizing-problem'), err);
    return;
  }
  const syncCollar = function () {
    const none = $('s-collar-kind').value === 'none';
    $('s-collar-ratio-field').hidden = none;
  };
  $('s-collar-kind').addEventListener('change', syncCollar);
  syncCollar();

  let chosen = null;
  let returnFocus = null;
  const openPanel = $('open');
  async function onOpen(candidate, button) {
    chosen = candidate;
    returnFocus = button;
    clearProblem($('open-problem'));
    $('open-what').textContent = 'Rank ' + candidate.rank + ': ' + candidate.size + ', ' + candidate.starts + ' start' + (candidate.starts > 1 ? 's' : '') + ', nut ' + candidate.nutLength + ' (' + VERDICTS[candidate.verdict] + ').';
    openPanel.hidden = false;
    try {
      const products = await api('/api/v1/products?limit=200');
      $('open-product').replaceChildren.apply($('open-product'), products.items.map(function (p) {
        return option(p.id, p.code + ' — ' + p.name);
      }));
      $('open-submit').disabled = products.items.length === 0;
      if (products.items.length === 0) showProblem($('open-problem'), new ApiError(0, { title: 'No product is registered yet', detail: 'Register one on the Products page first.' }));
    } catch (err) {
      showProblem($('open-problem'), err);
    }
    $('open-product').focus();
  }
  $('open-cancel').addEventListener('click', function () {
    openPanel.hidden = true;
    if (returnFocus) returnFocus.focus();
  });
  $('open-form').addEventListener('submit', function (event) {
    event.preventDefault();
    const product = $('open-product').value;
    if (!chosen || !product) return;
    putDraft(chosen.design, 'screw selection: rank ' + chosen.rank + ', ' + chosen.size + ', ' + chosen.starts + ' start' + (chosen.starts > 1 ? 's' : '') + ', nut ' + chosen.nutLength);
    location.assign('/design/products/' + encodeURIComponent(product) + '/new');
  });

  const form = $('sizing-form');
  let asked = 0;
  form.addEventListener('submit', async function (event) {
    event.preventDefault();
    const mine = ++asked;
    const slot = $('sizing-problem');
    const button = $('sizing-submit');
    clearProblem(slot);
    clearFieldErrors(form);
    button.disabled = true;
    $('answer-status').textContent = 'Searching…';
    try {
      const answer = await api('/api/v1/sizing', { method: 'POST', body: readRequest() });
      if (mine !== asked) return;
      openPanel.hidden = true;
      renderAnswer(answer, onOpen);
      $('answer-heading').focus();
    } catch (err) {
      if (mine !== asked) return;
      $('answer').hidden = true;
      showProblem(slot, err);
      showFieldErrors(form, fieldErrors(err), fieldFor, { focus: true });
    } finally {
      button.disabled = false;
    }
  });
}

startPage(sizingPage);

/*
 * Find a screw for a duty (/design/sizing): the requirements form, POST /api/v1/sizing, the ranked screws with the
 * governing check and the warning checks of each (the candidate's own `governing` and `checks`), sortable, the
 * headroom of the best three, what stopped the rest, and "open as a new calculation", which hands the chosen screw's
 * design input to the design form of a product, chosen or registered on the spot (lib-draft.js: sessionStorage).
 * The form's state is kept for the tab (lib-recent.js), so going to another page and back finds the duty as it was.
 */
import { api } from './lib-api.js';
import { $, el, fillTable } from './lib-dom.js';
import { badge, percent, quantity, sig, VERDICTS } from './lib-format.js';
import { clearFieldErrors, clearProblem, fieldErrors, showFieldErrors, showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';
import { putDraft } from './lib-draft.js';
import { lastProduct, rememberProduct, savedDuty, saveDuty } from './lib-recent.js';

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
  // numbers stay text when they do not read as one, so the service names the field that is wrong
  const number = function (id) {
    const n = Number(text(id));
    return text(id) !== '' && Number.isFinite(n) ? n : text(id);
  };
  if (text('s-nut-od-ratio')) requirements.nut.outsideDiameterRatio = number('s-nut-od-ratio');
  if (text('s-nut-wear')) requirements.nut.allowableWear = text('s-nut-wear');
  if (text('s-nut-fatigue')) requirements.nut.fatigueStrength = text('s-nut-fatigue');
  if (text('s-cycles')) requirements.duty.cycles = number('s-cycles');
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
  if ($('s-only-clear').checked) search.verdicts = ['clear'];
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

/** The governing check of a row: its label, value and blocking limit, and the rule that makes it. */
function governingText(g) {
  if (!g) return el('span', { class: 'muted' }, 'no numeric check applies');
  const against = (g.limitKind === 'minimum' ? 'at least ' : 'at most ') + sig(g.limit);
  return el('span', {}, el('strong', {}, g.label), ' ', sig(g.value), ' (limit ' + against + ')', el('span', { class: 'muted' }, ' · ' + g.ruleId));
}

/** The checks past their warning level (status "warning" in the candidate's checks): why a row needs acknowledgement. */
function warningText(checks) {
  const warned = (checks || []).filter(function (c) { return c.status === 'warning'; });
  if (warned.length === 0) return el('span', { class: 'muted' }, 'none');
  return el.apply(null, ['span', {}].concat(warned.map(function (c, i) {
    return el('span', { class: 'warned', 'data-check': c.id }, i > 0 ? '; ' : '', el('strong', {}, c.label), ' ',
      c.value === null ? 'not computed' : sig(c.value) + (c.warnLimit === null ? '' : ' (warning level ' + sig(c.warnLimit) + ')'));
  })));
}

/** The candidates in the order the sort buttons ask for (a copy; the answer's rank order is kept). */
function sorted(candidates, sort) {
  const key = function (c) {
    return sort.by === 'rank' ? c.rank : c.figures[sort.by];
  };
  return candidates.slice().sort(function (a, b) {
    return (sort.descending ? key(b) - key(a) : key(a) - key(b)) || a.rank - b.rank;
  });
}

function renderRows(candidates, sort, onOpen) {
  document.querySelectorAll('#candidates th[data-sort]').forEach(function (th) {
    const by = th.getAttribute('data-sort');
    if (by === sort.by) th.setAttribute('aria-sort', sort.descending ? 'descending' : 'ascending');
    else th.removeAttribute('aria-sort');
  });
  fillTable(
    $('candidates'),
    sorted(candidates, sort).map(function (c) {
      const f = c.figures;
      const open = el('button', { type: 'button', class: 'quiet', 'data-rank': c.rank }, 'Open');
      open.setAttribute('aria-label', 'Open as a new calculation: ' + c.size + ', ' + c.starts + ' start' + (c.starts > 1 ? 's' : '') + ', nut ' + c.nutLength);
      open.addEventListener('click', function () {
        onOpen(c, open);
      });
      return el(
        'tr',
        { 'data-rank': c.rank },
        el('td', { class: 'num' }, c.rank),
        el('th', { scope: 'row' }, el('span', { class: 'nowrap' }, c.size), el('br'),
          el('span', { class: 'muted small' }, c.starts + ' start' + (c.starts > 1 ? 's' : '') + ', nut ' + c.nutLength)),
        el('td', { class: 'verdict' }, badge('verdict', c.verdict, VERDICTS)),
        el('td', { class: 'governing' }, governingText(c.governing)),
        el('td', { class: 'warns' }, warningText(c.checks)),
        el('td', { class: 'num' }, quantity(f.raiseTorque, 'torque', 'SI')),
        el('td', { class: 'num' }, percent(f.efficiency)),
        el('td', { class: 'num' }, sig(f.lowestStrengthSafetyFactor), el('br'), el('span', { class: 'muted small' }, f.lowestStrengthCheck)),
        el('td', { class: 'num' }, sig(f.massPerMetre) + ' kg/m'),
        el('td', {}, open),
      );
    }),
    $('candidates-empty'),
  );
}

function renderAnswer(answer, onlyClear, sort, onOpen) {
  const n = answer.candidates.length;
  $('answer-status').textContent =
    answer.passed + ' of ' + answer.searched + ' candidates pass (' + answer.evaluations + ' evaluated, ' + answer.pruned + ' decided without an evaluation of their own); ' +
    n + (n === 1 ? ' screw is' : ' screws are') + ' listed' + (onlyClear ? ' (only clear ones)' : '') + ', ranked by ' + answer.objective.replace(/-/g, ' ') + '. Rule set ' + answer.ruleSetVersion + ', engine ' + answer.engineVersion + '.';
  renderRows(answer.candidates, sort, onOpen);
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

/** Every control of the form by a stable key: its id, or its name and value for the checkbox groups. */
function controls() {
  return Array.from($('sizing-form').querySelectorAll('input, select')).map(function (c) {
    return { key: c.id || c.name + ':' + c.value, control: c };
  });
}

function keepDuty(searched) {
  const state = {};
  controls().forEach(function (x) {
    state[x.key] = x.control.type === 'checkbox' ? x.control.checked : x.control.value;
  });
  saveDuty({ controls: state, searched: searched });
}

/** Puts back the form as this tab left it; true when a search had been run then. */
function restoreDuty() {
  const saved = savedDuty();
  if (!saved) return false;
  controls().forEach(function (x) {
    if (!Object.prototype.hasOwnProperty.call(saved.controls, x.key)) return;
    const value = saved.controls[x.key];
    if (x.control.type === 'checkbox') x.control.checked = value === true;
    else if (x.control.tagName !== 'SELECT' || x.control.querySelector('option[value="' + String(value).replace(/"/g, '') + '"]')) x.control.value = String(value);
  });
  return saved.searched === true;
}

const NEW_PRODUCT = '(new)';

/** The product chooser: the products listed, the one used last chosen (else the newest), and "register a new one". */
async function fillProducts() {
  const select = $('open-product');
  const products = await api('/api/v1/products?limit=200');
  const items = products.items.slice();
  const last = lastProduct();
  if (last && !items.some(function (p) { return p.id === last; })) {
    try {
      items.push(await api('/api/v1/products/' + encodeURIComponent(last)));
    } catch (err) {
      // the product remembered is not readable here any more: offer the others
    }
  }
  select.replaceChildren.apply(select, items.map(function (p) {
    return option(p.id, p.code + ' — ' + p.name);
  }).concat([option(NEW_PRODUCT, 'Register a new product…')]));
  const chosen = last && items.some(function (p) { return p.id === last; }) ? last : items.length ? items[items.length - 1].id : NEW_PRODUCT;
  select.value = chosen;
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
  const searchedBefore = restoreDuty();
  const syncCollar = function () {
    const none = $('s-collar-kind').value === 'none';
    $('s-collar-ratio-field').hidden = none;
  };
  $('s-collar-kind').addEventListener('change', syncCollar);
  syncCollar();

  let answer = null;
  let onlyClear = false;
  const sort = { by: 'rank', descending: false };
  let chosen = null;
  let returnFocus = null;
  const openPanel = $('open');
  const openForm = $('open-form');
  const syncNew = function () {
    $('open-new').hidden = $('open-product').value !== NEW_PRODUCT;
  };
  $('open-product').addEventListener('change', syncNew);

  async function onOpen(candidate, button) {
    chosen = candidate;
    returnFocus = button;
    clearProblem($('open-problem'));
    clearFieldErrors(openForm);
    $('open-what').textContent = 'Rank ' + candidate.rank + ': ' + candidate.size + ', ' + candidate.starts + ' start' + (candidate.starts > 1 ? 's' : '') + ', nut ' + candidate.nutLength + ' (' + VERDICTS[candidate.verdict] + ').';
    openPanel.hidden = false;
    try {
      await fillProducts();
    } catch (err) {
      showProblem($('open-problem'), err);
    }
    syncNew();
    openPanel.scrollIntoView({ block: 'center' });
    $('open-product').focus({ preventScroll: true });
  }
  $('open-cancel').addEventListener('click', function () {
    openPanel.hidden = true;
    if (returnFocus) returnFocus.focus();
  });
  openForm.addEventListener('submit', async function (event) {
    event.preventDefault();
    if (!chosen) return;
    const slot = $('open-problem');
    clearProblem(slot);
    clearFieldErrors(openForm);
    let product = $('open-product').value;
    const submit = $('open-submit');
    submit.disabled = true;
    try {
      if (product === NEW_PRODUCT) {
        const registered = await api('/api/v1/products', { method: 'POST', body: { code: $('open-code').value.trim(), name: $('open-name').value.trim() } });
        product = registered.id;
      }
    } catch (err) {
      showProblem(slot, err);
      showFieldErrors(openForm, fieldErrors(err), function (path) {
        return openForm.querySelector('[data-path="' + String(path).replace(/"/g, '') + '"]');
      }, { focus: true });
      submit.disabled = false;
      return;
    }
    rememberProduct(product);
    putDraft(chosen.design, 'screw selection: rank ' + chosen.rank + ', ' + chosen.size + ', ' + chosen.starts + ' start' + (chosen.starts > 1 ? 's' : '') + ', nut ' + chosen.nutLength);
    location.assign('/design/products/' + encodeURIComponent(product) + '/new');
  });

  document.querySelectorAll('#candidates th[data-sort] button').forEach(function (button) {
    button.addEventListener('click', function () {
      const by = button.parentElement.getAttribute('data-sort');
      // the first press sorts by the column, best first (the larger efficiency and factor, the smaller torque and mass)
      if (sort.by === by) sort.descending = !sort.descending;
      else {
        sort.by = by;
        sort.descending = by === 'efficiency' || by === 'lowestStrengthSafetyFactor';
      }
      if (answer) renderRows(answer.candidates, sort, onOpen);
    });
  });

  const form = $('sizing-form');
  form.addEventListener('input', function () {
    keepDuty(false);
  });
  form.addEventListener('change', function () {
    keepDuty(false);
  });
  let asked = 0;
  async function search(focusAnswer) {
    const mine = ++asked;
    const slot = $('sizing-problem');
    const button = $('sizing-submit');
    clearProblem(slot);
    clearFieldErrors(form);
    button.disabled = true;
    $('answer-status').textContent = 'Searching…';
    try {
      const request = readRequest();
      const found = await api('/api/v1/sizing', { method: 'POST', body: request });
      if (mine !== asked) return;
      answer = found;
      onlyClear = Boolean(request.search.verdicts);
      sort.by = 'rank';
      sort.descending = false;
      openPanel.hidden = true;
      renderAnswer(answer, onlyClear, sort, onOpen);
      keepDuty(true);
      if (focusAnswer) $('answer-heading').focus();
    } catch (err) {
      if (mine !== asked) return;
      $('answer').hidden = true;
      showProblem(slot, err);
      showFieldErrors(form, fieldErrors(err), fieldFor, { focus: true });
    } finally {
      button.disabled = false;
    }
  }
  form.addEventListener('submit', function (event) {
    event.preventDefault();
    search(true);
  });
  // Back on the page after a search: the same duty's answer again
  if (searchedBefore) await search(false);
}

startPage(sizingPage);

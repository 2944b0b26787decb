/*
 * The design form (/design/products/:id/new, /design/calculations/:id/revise[?from=<revision id>]): the design
 * in the trade's words, evaluated live while typing (POST /evaluations, debounced ~150 ms, stale answers
 * discarded), the report's charts for the unsaved design (POST /evaluations/charts), field errors at the field,
 * save as a new calculation or a new revision with an Idempotency-Key, and JSON import/export of the design input.
 */
import { api, download, newIdempotencyKey, saveBlob } from './lib-api.js';
import { $, el } from './lib-dom.js';
import { badge, VERDICTS } from './lib-format.js';
import { clearFieldErrors, clearProblem, fieldErrors, showFieldErrors, showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';
import { fieldFor, fillDesign, keptInWords, readDesign, syncVisibility, useLibrary } from './design-fields.js';
import { renderResults, showChart } from './design-results.js';
import { takeDraft } from './lib-draft.js';

const DEBOUNCE_MS = 150;

let sizes = [];

function fillSizes() {
  const form = $('f-form').value;
  $('f-size-list').replaceChildren(...sizes.filter(function (s) {
    return s.form === form;
  }).map(function (s) {
    return el('option', { value: s.designation }, s.standard);
  }));
}

async function loadLibrary() {
  const [threadSizes, friction, materials] = await Promise.all([api('/api/v1/thread-sizes'), api('/api/v1/friction-sources'), api('/api/v1/materials')]);
  sizes = threadSizes.items;
  fillSizes();
  ['thread', 'collar'].forEach(function (surface) {
    const entries = friction.items.filter(function (f) {
      return f.surface === surface;
    });
    const select = $('f-' + surface + '-entry');
    select.replaceChildren(...entries.map(function (f) {
      return el('option', { value: f.id }, f.pair + ', ' + f.lubrication + ' (f ' + f.min + '–' + f.max + ')');
    }));
    const about = $('f-' + surface + '-entry-about');
    const describe = function () {
      const f = entries.find(function (x) {
        return x.id === select.value;
      });
      about.textContent = f ? 'Range f = ' + f.min + ' to ' + f.max + ' · source (' + f.source.kind + '): ' + f.source.reference : '';
    };
    select.addEventListener('change', describe);
    select.describe = describe;
  });
  $('f-nut-list').replaceChildren(...materials.nuts.map(function (m) {
    return el('option', { value: m.id }, m.name);
  }));
  $('f-screw-list').replaceChildren(...materials.screws.map(function (m) {
    return el('option', { value: m.id }, m.name);
  }));
  useLibrary(materials);
}

/** Where the form stands: a new calculation of a product, or the next revision of a calculation. */
async function loadContext() {
  const open = /^\/design\/products\/([^/]+)\/new$/.exec(location.pathname);
  if (open) {
    const product = await api('/api/v1/products/' + encodeURIComponent(decodeURIComponent(open[1])));
    return { mode: 'open', product: product, calculation: null, from: null };
  }
  const revise = /^\/design\/calculations\/([^/]+)\/revise$/.exec(location.pathname);
  const calculation = await api('/api/v1/calculations/' + encodeURIComponent(decodeURIComponent(revise[1])));
  const [product, revisions] = await Promise.all([api('/api/v1/products/' + encodeURIComponent(calculation.productId)), api('/api/v1/calculations/' + encodeURIComponent(calculation.id) + '/revisions')]);
  const wanted = new URLSearchParams(location.search).get('from');
  const from = (wanted && revisions.items.find(function (r) {
    return r.id === wanted;
  })) || revisions.items[revisions.items.length - 1];
  return { mode: 'revise', product: product, calculation: calculation, from: from, latest: revisions.items[revisions.items.length - 1] };
}

function showContext(ctx) {
  $('back-link').textContent = ctx.calculation ? 'Calculation ' + ctx.product.code + ' · ' + ctx.calculation.title : 'Product ' + ctx.product.code + ' — ' + ctx.product.name;
  $('back-link').setAttribute('href', ctx.calculation ? '/design/calculations/' + encodeURIComponent(ctx.calculation.id) : '/design/products/' + encodeURIComponent(ctx.product.id));
  if (ctx.mode === 'open') {
    $('design-heading').textContent = 'New calculation for ' + ctx.product.code;
    $('design-context').textContent = 'Enter the design; the results follow as you type. Saving opens the calculation with revision 1 and submits it for review.';
    $('title-field').hidden = false;
    $('note-field').hidden = true;
    $('save-submit').textContent = 'Save as a new calculation and submit for review';
  } else {
    $('design-heading').textContent = ctx.product.code + ' · ' + ctx.calculation.title + ' · revision ' + (ctx.latest.revision + 1);
    $('design-context').textContent = 'Prefilled from revision ' + ctx.from.revision + '. Saving stores revision ' + (ctx.latest.revision + 1) + ' and submits it for review; revision ' + ctx.latest.revision + ' is then superseded.';
    $('title-field').hidden = true;
    $('note-field').hidden = false;
    $('save-submit').textContent = 'Save as revision ' + (ctx.latest.revision + 1) + ' and submit for review';
  }
}

/** Names, in words, the loaded fields the form has no control for: they are saved and exported unchanged. */
function showKept() {
  const words = keptInWords();
  const slot = $('kept-fields');
  slot.textContent = words.length ? 'Kept as imported: ' + words.join(', ') + '. The form has no field for ' + (words.length === 1 ? 'it' : 'them') + '; saving and exporting send ' + (words.length === 1 ? 'it' : 'them') + ' unchanged.' : '';
  slot.hidden = words.length === 0;
}

async function designPage() {
  const form = $('design-form');
  const panel = { verdict: $('verdict'), figures: $('figures'), findings: $('results-findings') };
  const statusLine = $('results-status');
  let ctx;
  try {
    [ctx] = await Promise.all([loadContext(), loadLibrary()]);
  } catch (err) {
    showProblem($('form-problem'), err);
    return;
  }
  showContext(ctx);
  const draft = ctx.mode === 'open' ? takeDraft() : null; // a design handed over by another page (screw selection)
  if (draft) $('design-context').textContent = 'Filled from ' + draft.origin + '. ' + $('design-context').textContent;
  if (ctx.from) fillDesign(ctx.from.input);
  else if (draft) fillDesign(draft.design);
  else fillDesign({ thread: { form: 'trapezoidal', starts: 1 }, friction: { thread: { entry: $('f-thread-entry').value }, collar: { entry: $('f-collar-entry').value } }, collar: { kind: 'annular', model: 'uniform-wear' }, screw: { ends: 'fixed-free' }, duty: { kind: 'lifting', brake: false } });
  showKept();
  $('f-thread-entry').describe();
  $('f-collar-entry').describe();
  $('design').hidden = false;

  // ---- live evaluation ----
  let asked = 0;
  let shown = 0;
  let timer = null;
  let inFlight = null;
  let last = null; // the last evaluation shown
  const touched = new Set();
  const system = function () {
    return document.querySelector('input[name="units"]:checked').value;
  };

  async function evaluateNow() {
    const mine = ++asked;
    const design = readDesign();
    if (inFlight) inFlight.abort();
    const controller = new AbortController();
    inFlight = controller;
    statusLine.textContent = 'Evaluating…';
    try {
      const result = await api('/api/v1/evaluations', { method: 'POST', body: design, signal: controller.signal });
      if (mine < shown || mine !== asked) return; // a later edit has been sent: this answer is stale
      shown = mine;
      last = result;
      clearFieldErrors(form);
      clearProblem($('results-problem'));
      renderResults(panel, result, system());
      $('results-body').hidden = false;
      statusLine.textContent = 'Results of the design as entered (evaluation ' + mine + ').';
      statusLine.dataset.evaluation = String(mine);
      if (timer === null) statusLine.dataset.current = 'true';
      charts(design, mine);
    } catch (err) {
      if (err && err.name === 'AbortError') return;
      if (mine !== asked) return;
      shown = mine;
      const errors = fieldErrors(err);
      if (errors.length) {
        const atTouched = errors.filter(function (e) {
          const input = fieldFor(e.path);
          return input && touched.has(input.id);
        });
        showFieldErrors(form, atTouched, fieldFor);
        const waiting = errors.length - atTouched.length;
        statusLine.textContent = 'Not evaluated: ' + errors.length + ' field' + (errors.length === 1 ? '' : 's') + ' to correct' + (waiting ? ' (' + waiting + ' not yet filled in)' : '') + '. The results below are of the last complete design.';
      } else {
        showProblem($('results-problem'), err);
        statusLine.textContent = 'Not evaluated.';
      }
      statusLine.dataset.evaluation = String(mine);
      if (timer === null) statusLine.dataset.current = 'true';
    }
  }

  let chartsAsked = 0;
  async function charts(design, mine) {
    const ticket = ++chartsAsked;
    try {
      const c = await api('/api/v1/evaluations/charts?units=' + system(), { method: 'POST', body: design });
      if (ticket !== chartsAsked || mine !== shown) return;
      showChart($('chart-torque'), c.torqueFriction);
      showChart($('chart-column'), c.column);
    } catch (err) {
      /* the evaluation above already reports what is wrong */
    }
  }

  function schedule() {
    clearTimeout(timer);
    statusLine.dataset.current = 'false'; // the panel no longer shows what the form holds
    timer = setTimeout(function () {
      timer = null;
      evaluateNow();
    }, DEBOUNCE_MS);
  }

  form.addEventListener('input', function (event) {
    if (event.target.id) touched.add(event.target.id);
    if (event.target.id === 'f-form') fillSizes();
    syncVisibility();
    schedule();
  });
  form.addEventListener('change', function (event) {
    if (event.target.id === 'import-json') return;
    if (event.target.id) touched.add(event.target.id);
    if (event.target.id === 'f-form') fillSizes();
    syncVisibility();
    schedule();
  });
  form.addEventListener('submit', function (event) {
    event.preventDefault();
  });
  document.querySelectorAll('input[name="units"]').forEach(function (r) {
    r.addEventListener('change', function () {
      if (last) {
        renderResults(panel, last, system());
        charts(readDesign(), shown);
      }
    });
  });

  // ---- import / export ----
  $('export-json').addEventListener('click', function () {
    const name = (ctx.product.code + (ctx.calculation ? '-' + ctx.calculation.title : '') + '-design').replace(/[^A-Za-z0-9._-]+/g, '-') + '.json';
    saveBlob(new Blob([JSON.stringify(readDesign(), null, 2) + '\n'], { type: 'application/json' }), name);
    $('file-status').textContent = 'Exported ' + name + '.';
  });
  $('import-json').addEventListener('change', async function (event) {
    const file = event.target.files[0];
    if (!file) return;
    try {
      const design = JSON.parse(await file.text());
      fillDesign(design);
      showKept();
      form.querySelectorAll('[data-path]').forEach(function (input) {
        touched.add(input.id);
      });
      $('file-status').textContent = 'Imported ' + file.name + '.';
      evaluateNow();
    } catch (err) {
      $('file-status').textContent = file.name + ' is not a design input in JSON: ' + err.message;
    }
    event.target.value = '';
  });

  // ---- save ----
  let key = null;
  let keyFor = null;
  const saveForm = $('save-form');
  saveForm.addEventListener('submit', async function (event) {
    event.preventDefault();
    const button = $('save-submit');
    if (button.disabled) return;
    button.disabled = true; // a second click while this one is on its way does nothing
    const slot = $('save-problem');
    clearProblem(slot);
    clearFieldErrors(document.getElementById('design'));
    const body = ctx.mode === 'open' ? { title: $('f-title').value.trim(), design: readDesign() } : { design: readDesign() };
    if (ctx.mode === 'revise' && $('f-note').value.trim()) body.note = $('f-note').value.trim();
    const text = JSON.stringify(body);
    if (text !== keyFor) {
      key = newIdempotencyKey(); // the same content keeps its key, so a retry stores nothing new
      keyFor = text;
    }
    const path = ctx.mode === 'open' ? '/api/v1/products/' + encodeURIComponent(ctx.product.id) + '/calculations' : '/api/v1/calculations/' + encodeURIComponent(ctx.calculation.id) + '/revisions';
    try {
      const stored = await api(path, { method: 'POST', body: body, headers: { 'idempotency-key': key } });
      showSaved(stored);
    } catch (err) {
      showProblem(slot, err);
      const unplaced = showFieldErrors(document.getElementById('design'), fieldErrors(err), function (p) {
        if (p === 'title') return $('f-title');
        if (p === 'note') return $('f-note');
        return fieldFor(p);
      }, { focus: true });
      if (unplaced.length === fieldErrors(err).length) slot.scrollIntoView({ block: 'center' });
    } finally {
      button.disabled = false;
    }
  });

  function showSaved(stored) {
    const done = $('saved');
    const report = '/review/revisions/' + encodeURIComponent(stored.revisionId);
    const pdf = el('button', { type: 'button', id: 'saved-pdf' }, 'Download its PDF report');
    const status = el('span', { class: 'muted', role: 'status' });
    pdf.addEventListener('click', function () {
      download('/api/v1/revisions/' + encodeURIComponent(stored.revisionId) + '/report.pdf', ctx.product.code + '-rev' + stored.revision + '.pdf', status);
    });
    done.replaceChildren(
      el('p', {}, el('strong', {}, 'Stored as revision ' + stored.revision + '. '), 'Verdict of the rules: ', badge('verdict', stored.verdict, VERDICTS), '. It awaits review. Record hash ', el('code', { class: 'hash wrap', id: 'saved-hash' }, stored.hash), '.'),
      el('p', { class: 'actions' }, el('a', { href: report, id: 'saved-report' }, 'Read its report'), el('a', { href: '/design/calculations/' + encodeURIComponent(stored.calculationId), id: 'saved-calculation' }, 'Open the calculation'), pdf, status),
    );
    done.dataset.revision = stored.revisionId;
    done.hidden = false;
    done.scrollIntoView({ block: 'nearest' });
    if (ctx.mode === 'open') {
      // the calculation exists now: a further save is its next revision
      ctx = { mode: 'revise', product: ctx.product, calculation: { id: stored.calculationId, title: body_title() }, from: null, latest: { revision: stored.revision } };
      $('title-field').hidden = true;
      $('note-field').hidden = false;
      $('save-submit').textContent = 'Save as revision ' + (stored.revision + 1) + ' and submit for review';
    } else {
      ctx.latest = { revision: stored.revision };
      $('save-submit').textContent = 'Save as revision ' + (stored.revision + 1) + ' and submit for review';
    }
  }
  function body_title() {
    return $('f-title').value.trim();
  }

  if (ctx.from || draft) {
    form.querySelectorAll('[data-path]').forEach(function (input) {
      touched.add(input.id);
    });
  }
  evaluateNow();
}

startPage(designPage);

/*
 * The design form (/design/products/:id/new, /design/calculations/:id/revise[?from=<revision id>]): the design
 * in the trade's words, evaluated live while typing (POST /evaluations, debounced ~150 ms, stale answers
 * discarded), the report's charts for the unsaved design (POST /evaluations/charts), field errors at the field,
 * save as a new calculation, drafts of the next revision (PUT/GET /calculations/:id/draft, restored on opening),
 * submission as a separate step whose confirmation names what changed since the latest revision and asks for a note
 * (with an Idempotency-Key), and JSON import/export of the design input.
 */
import { api, download, newIdempotencyKey, saveBlob } from './lib-api.js';
import { $, el } from './lib-dom.js';
import { badge, time, VERDICTS } from './lib-format.js';
import { clearFieldErrors, clearProblem, fieldErrors, showFieldErrors, showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';
import { fieldFor, fillDesign, keptInWords, readDesign, syncVisibility, useLibrary } from './design-fields.js';
import { renderResults, showChart } from './design-results.js';
import { takeDraft } from './lib-draft.js';
import { changedFields, changeRow, checkFigure, labelOf } from './design-changes.js';

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
  // the author's own draft of the next revision, unless a revision was asked for by ?from=
  let saved = null;
  if (!wanted) {
    try {
      saved = await api('/api/v1/calculations/' + encodeURIComponent(calculation.id) + '/draft');
    } catch (err) {
      if (!err || err.status !== 404) throw err;
    }
  }
  const latest = revisions.items[revisions.items.length - 1];
  // a draft saved before the latest revision was submitted has been overtaken by it (timestamps: the same exact format)
  if (saved && latest && saved.savedAt < latest.createdAt) saved = null;
  return { mode: 'revise', product: product, calculation: calculation, from: from, latest: latest, saved: saved };
}

function showContext(ctx) {
  $('back-link').textContent = ctx.calculation ? 'Calculation ' + ctx.product.code + ' · ' + ctx.calculation.title : 'Product ' + ctx.product.code + ' — ' + ctx.product.name;
  $('back-link').setAttribute('href', ctx.calculation ? '/design/calculations/' + encodeURIComponent(ctx.calculation.id) : '/design/products/' + encodeURIComponent(ctx.product.id));
  if (ctx.mode === 'open') {
    $('design-heading').textContent = 'New calculation for ' + ctx.product.code;
    $('design-context').textContent = 'Enter the design; the results follow as you type. Saving opens the calculation with revision 1 and submits it for review.';
    $('title-field').hidden = false;
    $('save-draft').hidden = true;
    $('draft-help').hidden = true;
    $('save-submit').textContent = 'Save as a new calculation and submit for review';
  } else {
    $('design-heading').textContent = ctx.product.code + ' · ' + ctx.calculation.title + ' · revision ' + (ctx.latest.revision + 1);
    $('design-context').textContent = ctx.saved
      ? 'Restored your draft saved ' + time(ctx.saved.savedAt) + ' UTC (not submitted). Submitting stores revision ' + (ctx.latest.revision + 1) + ' for review; revision ' + ctx.latest.revision + ' is then superseded.'
      : 'Prefilled from revision ' + ctx.from.revision + '. Submitting stores revision ' + (ctx.latest.revision + 1) + ' for review; revision ' + ctx.latest.revision + ' is then superseded.';
    showReviseControls(ctx);
  }
}

/** The save panel of a calculation that exists: drafts, and submission of the next revision as a separate step. */
function showReviseControls(ctx) {
  $('title-field').hidden = true;
  $('save-draft').hidden = false;
  $('draft-help').hidden = false;
  $('save-submit').textContent = 'Review and submit revision ' + (ctx.latest.revision + 1) + '…';
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
  // what the latest revision reads as through this form (fields the form fills in by default included): the
  // baseline the submit confirmation compares with, so only the author's own changes are listed
  let baseline = null;
  if (ctx.latest) {
    fillDesign(ctx.latest.input);
    syncVisibility();
    baseline = readDesign();
  }
  if (ctx.saved) {
    fillDesign(ctx.saved.design);
    $('f-note').value = ctx.saved.note || '';
  } else if (ctx.from) fillDesign(ctx.from.input);
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
  let submitted = null; // the design just submitted: the form offers no submission until it changes
  const saveForm = $('save-form');
  const locate = function (p) {
    if (p === 'title') return $('f-title');
    if (p === 'note') return $('f-note');
    return fieldFor(p);
  };

  function showRefusal(slot, err) {
    showProblem(slot, err, {
      label: function (p) {
        if (p === 'design') return 'Design';
        if (p === 'title') return 'Calculation title';
        if (p === 'note') return 'Revision note';
        return labelOf(p);
      },
    });
    const errors = fieldErrors(err);
    const unplaced = showFieldErrors(document.getElementById('design'), errors, locate, { focus: true });
    if (unplaced.length === errors.length) {
      slot.scrollIntoView({ block: 'center' });
      slot.setAttribute('tabindex', '-1');
      slot.focus({ preventScroll: true });
    }
  }

  /** Stores the body (a new calculation, or the next revision) once per content: a retry reuses its key. */
  async function store(body, button, slot) {
    if (button.disabled) return;
    button.disabled = true; // a second press while this one is on its way does nothing
    clearProblem(slot);
    clearFieldErrors(document.getElementById('design'));
    const text = JSON.stringify(body);
    if (text !== keyFor) {
      key = newIdempotencyKey(); // the same content keeps its key, so a retry stores nothing new
      keyFor = text;
    }
    const path = ctx.mode === 'open' ? '/api/v1/products/' + encodeURIComponent(ctx.product.id) + '/calculations' : '/api/v1/calculations/' + encodeURIComponent(ctx.calculation.id) + '/revisions';
    try {
      const stored = await api(path, { method: 'POST', body: body, headers: { 'idempotency-key': key } });
      showSaved(stored, body.design);
    } catch (err) {
      showRefusal(slot, err);
    } finally {
      button.disabled = false;
      markSubmittable();
    }
  }

  saveForm.addEventListener('submit', function (event) {
    event.preventDefault();
    if (ctx.mode === 'open') {
      store({ title: $('f-title').value.trim(), design: readDesign() }, $('save-submit'), $('save-problem'));
    } else {
      openConfirm();
    }
  });

  // drafts: PUT /calculations/:id/draft, for the author alone; never reviewed
  $('save-draft').addEventListener('click', async function () {
    const button = $('save-draft');
    if (button.disabled || ctx.mode !== 'revise') return;
    button.disabled = true;
    const slot = $('save-problem');
    clearProblem(slot);
    clearFieldErrors(document.getElementById('design'));
    const body = { design: readDesign() };
    if ($('f-note').value.trim()) body.note = $('f-note').value.trim();
    try {
      const saved = await api('/api/v1/calculations/' + encodeURIComponent(ctx.calculation.id) + '/draft', { method: 'PUT', body: body });
      $('draft-status').textContent = 'Draft saved ' + time(saved.savedAt) + ' UTC. It is not submitted' + (saved.latestRevision && saved.latestRevision.sameDesign ? '; its design equals revision ' + saved.latestRevision.revision + '.' : '.');
      $('draft-status').dataset.draft = saved.id;
    } catch (err) {
      $('draft-status').textContent = 'Draft not saved.';
      showRefusal(slot, err);
    } finally {
      button.disabled = false;
    }
  });

  // ---- the submission: a separate step that names what changed and asks for a note ----
  const confirmPanel = $('confirm');
  function openConfirm() {
    const next = ctx.latest.revision + 1;
    const design = readDesign();
    const changes = changedFields(baseline || ctx.latest.input, design);
    clearProblem($('confirm-problem'));
    $('confirm-heading').textContent = 'Submit revision ' + next + ' for review';
    $('confirm-before-heading').textContent = 'Revision ' + ctx.latest.revision;
    $('confirm-changes-caption').textContent = 'Inputs changed since revision ' + ctx.latest.revision;
    $('confirm-changes').tBodies[0].replaceChildren(...changes.map(changeRow));
    $('confirm-changes').hidden = changes.length === 0;
    $('confirm-summary').textContent = changes.length
      ? countWords(changes.length, 'input') + ' changed since revision ' + ctx.latest.revision + '. Submitting stores revision ' + next + ' and sends it to a checking engineer; revision ' + ctx.latest.revision + ' is then superseded.'
      : 'Nothing has changed since revision ' + ctx.latest.revision + ': there is nothing to submit. Change the design, or keep editing.';
    const before = ctx.latest.governing;
    const now = last && last.governing;
    $('confirm-governing').replaceChildren(
      el('strong', {}, 'Governing check: '),
      now ? now.label + ' ' + checkFigure(now) : 'not evaluated yet',
      before ? ' (revision ' + ctx.latest.revision + ': ' + before.label + ' ' + checkFigure(before) + ')' : '',
      last ? el('span', {}, '. Verdict of the rules: ', badge('verdict', last.verdict, VERDICTS)) : '',
      ctx.latest.verdict ? el('span', {}, ' (revision ' + ctx.latest.revision + ': ', badge('verdict', ctx.latest.verdict, VERDICTS), ').') : '',
    );
    $('note-field').hidden = changes.length === 0;
    $('confirm-submit').hidden = changes.length === 0;
    $('confirm-submit').textContent = 'Submit revision ' + next;
    confirmPanel.hidden = false;
    $('confirm-heading').focus();
  }
  $('confirm-cancel').addEventListener('click', function () {
    confirmPanel.hidden = true;
    $('save-submit').focus();
  });
  $('confirm-submit').addEventListener('click', function () {
    const note = $('f-note').value.trim();
    if (!note) {
      showFieldErrors(confirmPanel, [{ path: 'note', message: 'Say what changed and why: the checking engineer reads the note first.' }], locate, { focus: true });
      return;
    }
    store({ design: readDesign(), note: note }, $('confirm-submit'), $('confirm-problem'));
  });

  /** After a submission the form offers the next one only once the design has changed. */
  function markSubmittable() {
    const button = $('save-submit');
    const same = submitted !== null && JSON.stringify(readDesign()) === submitted;
    button.disabled = same;
    if (same) $('draft-status').textContent = 'Revision ' + ctx.latest.revision + ' is submitted. Change the design to prepare revision ' + (ctx.latest.revision + 1) + '.';
  }
  form.addEventListener('input', markSubmittable);
  form.addEventListener('change', markSubmittable);

  function showSaved(stored, design) {
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
    const latest = { id: stored.revisionId, revision: stored.revision, input: design, verdict: stored.verdict, governing: last ? last.governing : null };
    if (ctx.mode === 'open') {
      // the calculation exists now: a further save is a draft or its next revision
      ctx = { mode: 'revise', product: ctx.product, calculation: { id: stored.calculationId, title: body_title() }, from: null, latest: latest };
    } else {
      ctx.latest = latest;
    }
    showReviseControls(ctx);
    baseline = design;
    // the note belonged to the revision just stored; the form offers no submission until the design changes
    $('f-note').value = '';
    confirmPanel.hidden = true;
    submitted = JSON.stringify(design);
    markSubmittable();
    done.scrollIntoView({ block: 'nearest' });
    done.setAttribute('tabindex', '-1');
    done.focus({ preventScroll: true });
  }
  function body_title() {
    return $('f-title').value.trim();
  }

  if (ctx.from || draft || ctx.saved) {
    form.querySelectorAll('[data-path]').forEach(function (input) {
      touched.add(input.id);
    });
  }
  evaluateNow();
}

function countWords(n, noun) {
  return n + ' ' + noun + (n === 1 ? '' : 's');
}

startPage(designPage);

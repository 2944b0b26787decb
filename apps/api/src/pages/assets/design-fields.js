/*
 * The design form's fields and the API's design input: readDesign builds exactly the body POST /evaluations
 * takes (empty optional fields left out), fillDesign puts a design input back into the fields, and fieldFor
 * finds the input a problem+json path names. A loaded field the form has no control for is kept and sent as it
 * came (keptPaths names them), so that saving or exporting never drops part of an engineering record. Which fields show follows the choices made (size or diameter
 * and pitch, library entry or typed range, kind of collar, buttress).
 */
import { $ } from './lib-dom.js';
import { quantity } from './lib-format.js';

const SURFACES = ['thread', 'collar'];

/**
 * The design input's fields the form has a control for (true: the whole subtree). Anything else in a loaded
 * design (a field of a later engine, or one the form does not offer yet) is kept as loaded and sent unchanged.
 */
const CONTROLLED = {
  thread: { form: true, size: true, majorDiameter: true, pitch: true, starts: true, loadFlankAngle: true, toleranceClass: true },
  load: { axial: true, sense: true },
  friction: { thread: true, collar: true },
  collar: true,
  nut: { length: true, material: true, allowablePressure: true, allowablePressureBySpeed: stepsFit, allowablePv: true, yieldStrength: true, outsideDiameter: true, allowableWear: true, fatigueStrength: true },
  screw: { material: true, yieldStrength: true, elasticModulus: true, density: true, unsupportedLength: true, ends: true, endConditionBasis: true, whirlSpan: true, whirlEnds: true },
  duty: { kind: true, speed: true, linearSpeed: true, brake: true, brakeTorque: true, vibration: true, brakeLocation: true, cycles: true },
  drive: { availableTorque: true, loadMass: true, accelerationTime: true, acceleration: true, gearbox: { ratio: true, efficiency: true, reverseEfficiency: true } },
};

/** How many allowable-pressure steps the form has rows for; a longer list is kept as loaded. */
const STEP_ROWS = 3;

/** True when a loaded list of pressure steps fits the form's rows (text values of the two known keys only). */
function stepsFit(steps) {
  return Array.isArray(steps) && steps.length <= STEP_ROWS && steps.every(function (step) {
    return isObject(step) && Object.keys(step).every(function (k) {
      return (k === 'allowablePressure' || k === 'upToRubbingSpeed') && typeof step[k] === 'string';
    });
  });
}

/** The loaded design's fields without a control: [{ path: ['drive', 'gearbox'], value }], in the input's order. */
let kept = [];

function isObject(v) {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** The fields of `value` that `controlled` has no control for, each with its path. */
function uncontrolled(value, controlled, path) {
  if (typeof controlled === 'function') return controlled(value) ? [] : [{ path: path, value: value }];
  if (controlled === true || !isObject(value)) return [];
  const out = [];
  Object.keys(value).forEach(function (key) {
    const at = path.concat([key]);
    if (!Object.prototype.hasOwnProperty.call(controlled, key)) out.push({ path: at, value: value[key] });
    else out.push.apply(out, uncontrolled(value[key], controlled[key], at));
  });
  return out;
}

/** Names in the trade's words of the fields the form may keep as loaded. */
const KEPT_WORDS = {
  'thread.toleranceClass': 'thread tolerance class',
  'nut.allowablePressureBySpeed': 'nut allowable pressure by rubbing speed',
  'screw.whirlSpan': 'rotating span for whirl',
  'screw.whirlEnds': 'end conditions of the rotating span',
  'duty.brakeLocation': 'shaft the brake sits on',
  'drive.loadMass': 'mass moved with the nut',
  'drive.accelerationTime': 'time to reach speed',
  'drive.acceleration': 'nut acceleration',
  'drive.gearbox': 'gearbox',
};

/** The kept fields in words, e.g. "gearbox (drive.gearbox)"; empty when the form holds every loaded field. */
export function keptInWords() {
  return keptPaths().map(function (p) {
    return KEPT_WORDS[p] ? KEPT_WORDS[p] + ' (' + p + ')' : p;
  });
}

/** The dotted paths of the loaded design's fields the form keeps as loaded (it has no control for them). */
export function keptPaths() {
  return kept.map(function (k) {
    return k.path.join('.');
  });
}

/** Puts every kept field back into a design read from the controls (a copy of the value, never shared). */
function restoreKept(design) {
  kept.forEach(function (k) {
    let node = design;
    for (let i = 0; i < k.path.length - 1; i++) {
      if (!isObject(node[k.path[i]])) node[k.path[i]] = {};
      node = node[k.path[i]];
    }
    node[k.path[k.path.length - 1]] = JSON.parse(JSON.stringify(k.value));
  });
  return design;
}

function text(id) {
  return $(id).value.trim();
}

function radio(name) {
  const checked = document.querySelector('input[name="' + name + '"]:checked');
  return checked ? checked.value : '';
}

function setRadio(name, value) {
  document.querySelectorAll('input[name="' + name + '"]').forEach(function (r) {
    r.checked = r.value === value;
  });
}

/** Adds key: value when the field holds something (optional fields). */
function optional(target, key, value) {
  if (value !== '') target[key] = value;
}

/** A coefficient typed as a plain number; anything else goes to the API as typed so that it names the field. */
function coefficient(value) {
  if (value === '') return undefined;
  const n = Number(value);
  return Number.isFinite(n) ? n : value;
}

function friction(surface) {
  if (radio('friction-' + surface + '-mode') === 'entry') return { entry: text('f-' + surface + '-entry') };
  const range = { min: coefficient(text('f-' + surface + '-min')), max: coefficient(text('f-' + surface + '-max')), source: { kind: $('f-' + surface + '-source-kind').value, reference: text('f-' + surface + '-ref') } };
  return range;
}

/** The design input of the form, in the API's field names. */
export function readDesign() {
  const form = $('f-form').value;
  const thread = { form: form };
  if (radio('size-mode') === 'standard') thread.size = text('f-size');
  else {
    thread.majorDiameter = text('f-major');
    thread.pitch = text('f-pitch');
  }
  const starts = text('f-starts');
  if (starts !== '') thread.starts = Number.isFinite(Number(starts)) ? Number(starts) : starts;
  if (form === 'buttress') thread.loadFlankAngle = $('f-flank').value;
  optional(thread, 'toleranceClass', $('f-tolerance').value);
  const collarKind = $('f-collar-kind').value;
  const design = {
    thread: thread,
    load: { axial: text('f-load'), sense: $('f-sense').value },
    friction: { thread: friction('thread') },
    collar: { kind: collarKind },
    nut: { length: text('f-nut-length') },
    screw: {},
    duty: { kind: $('f-duty').value },
  };
  if (collarKind !== 'none') design.friction.collar = friction('collar');
  if (collarKind === 'plain' || collarKind === 'rolling') design.collar.meanDiameter = text('f-collar-mean');
  if (collarKind === 'annular') {
    design.collar.outerDiameter = text('f-collar-outer');
    design.collar.innerDiameter = text('f-collar-inner');
    design.collar.model = $('f-collar-model').value;
  }
  optional(design.nut, 'material', text('f-nut-material'));
  optional(design.nut, 'allowablePressure', text('f-nut-p'));
  const steps = [];
  for (let n = 1; n <= STEP_ROWS; n++) {
    const p = text('f-step-' + n + '-p');
    const v = text('f-step-' + n + '-v');
    if (p === '' && v === '') continue;
    const step = {};
    optional(step, 'upToRubbingSpeed', v);
    step.allowablePressure = p; // an empty one goes to the API, which names the field
    steps.push(step);
  }
  if (steps.length) design.nut.allowablePressureBySpeed = steps;
  optional(design.nut, 'allowablePv', text('f-nut-pv'));
  optional(design.nut, 'yieldStrength', text('f-nut-yield'));
  optional(design.nut, 'outsideDiameter', text('f-nut-outside'));
  optional(design.nut, 'allowableWear', text('f-nut-wear'));
  optional(design.nut, 'fatigueStrength', text('f-nut-fatigue'));
  optional(design.screw, 'material', text('f-screw-material'));
  optional(design.screw, 'yieldStrength', text('f-screw-yield'));
  optional(design.screw, 'elasticModulus', text('f-screw-modulus'));
  optional(design.screw, 'density', text('f-screw-density'));
  design.screw.unsupportedLength = text('f-length');
  design.screw.ends = $('f-ends').value;
  design.screw.endConditionBasis = $('f-basis').value;
  optional(design.screw, 'whirlSpan', text('f-whirl-span'));
  optional(design.screw, 'whirlEnds', $('f-whirl-ends').value);
  optional(design.duty, 'speed', text('f-speed'));
  optional(design.duty, 'linearSpeed', text('f-linear'));
  design.duty.brake = $('f-brake').checked;
  optional(design.duty, 'brakeTorque', text('f-brake-torque'));
  optional(design.duty, 'brakeLocation', $('f-brake-location').value);
  const cycles = coefficient(text('f-cycles'));
  if (cycles !== undefined) design.duty.cycles = cycles; // text that is not a number goes to the API, which names the field
  design.duty.vibration = $('f-vibration').checked;
  const drive = {};
  optional(drive, 'availableTorque', text('f-drive'));
  optional(drive, 'loadMass', text('f-load-mass'));
  optional(drive, 'accelerationTime', text('f-accel-time'));
  optional(drive, 'acceleration', text('f-accel'));
  const gear = { ratio: coefficient(text('f-gear-ratio')), efficiency: coefficient(text('f-gear-eff')), reverseEfficiency: coefficient(text('f-gear-rev')) };
  if (Object.values(gear).some(function (v) { return v !== undefined; })) drive.gearbox = gear; // a missing one is named by the API
  if (Object.keys(drive).length) {
    if (drive.availableTorque === undefined) drive.availableTorque = ''; // the API names the missing drive torque
    design.drive = drive;
  }
  return restoreKept(design);
}

function set(id, value) {
  $(id).value = value === undefined || value === null ? '' : String(value);
}

/** Puts a design input (as the API takes it) into the fields. */
export function fillDesign(d) {
  d = d || {};
  kept = uncontrolled(d, CONTROLLED, []);
  const th = d.thread || {};
  set('f-form', th.form || 'trapezoidal');
  setRadio('size-mode', th.size !== undefined || (th.majorDiameter === undefined && th.pitch === undefined) ? 'standard' : 'custom');
  set('f-size', th.size);
  set('f-major', th.majorDiameter);
  set('f-pitch', th.pitch);
  set('f-starts', th.starts === undefined ? 1 : th.starts);
  if (th.loadFlankAngle !== undefined) set('f-flank', typeof th.loadFlankAngle === 'number' ? th.loadFlankAngle + ' deg' : th.loadFlankAngle);
  setToleranceClass(th.form || 'trapezoidal', th.toleranceClass);
  const load = d.load || {};
  set('f-load', load.axial);
  set('f-sense', load.sense || 'compression');
  SURFACES.forEach(function (surface) {
    const f = (d.friction || {})[surface];
    if (!f) return;
    if (f.entry !== undefined) {
      setRadio('friction-' + surface + '-mode', 'entry');
      set('f-' + surface + '-entry', f.entry);
    } else {
      setRadio('friction-' + surface + '-mode', 'range');
      set('f-' + surface + '-min', f.min);
      set('f-' + surface + '-max', f.max);
      set('f-' + surface + '-source-kind', (f.source && f.source.kind) || 'handbook');
      set('f-' + surface + '-ref', f.source && f.source.reference);
    }
  });
  const c = d.collar || { kind: 'none' };
  set('f-collar-kind', c.kind);
  set('f-collar-mean', c.meanDiameter);
  set('f-collar-outer', c.outerDiameter);
  set('f-collar-inner', c.innerDiameter);
  set('f-collar-model', c.model || 'uniform-wear');
  const nut = d.nut || {};
  set('f-nut-length', nut.length);
  set('f-nut-material', nut.material);
  set('f-nut-p', nut.allowablePressure);
  const steps = stepsFit(nut.allowablePressureBySpeed) ? nut.allowablePressureBySpeed : [];
  for (let n = 1; n <= STEP_ROWS; n++) {
    set('f-step-' + n + '-p', steps[n - 1] && steps[n - 1].allowablePressure);
    set('f-step-' + n + '-v', steps[n - 1] && steps[n - 1].upToRubbingSpeed);
  }
  set('f-nut-pv', nut.allowablePv);
  set('f-nut-yield', nut.yieldStrength);
  set('f-nut-outside', nut.outsideDiameter);
  set('f-nut-wear', nut.allowableWear);
  set('f-nut-fatigue', nut.fatigueStrength);
  const s = d.screw || {};
  set('f-screw-material', s.material);
  set('f-screw-yield', s.yieldStrength);
  set('f-screw-modulus', s.elasticModulus);
  set('f-screw-density', s.density);
  set('f-length', s.unsupportedLength);
  set('f-ends', s.ends || 'fixed-free');
  set('f-basis', s.endConditionBasis || 'recommended');
  set('f-whirl-span', s.whirlSpan);
  set('f-whirl-ends', s.whirlEnds);
  const duty = d.duty || {};
  set('f-duty', duty.kind || 'lifting');
  set('f-speed', duty.speed);
  set('f-linear', duty.linearSpeed);
  $('f-brake').checked = duty.brake === true;
  set('f-brake-torque', duty.brakeTorque);
  set('f-brake-location', duty.brakeLocation);
  set('f-cycles', duty.cycles);
  $('f-vibration').checked = duty.vibration === true;
  const dr = d.drive || {};
  set('f-drive', dr.availableTorque);
  set('f-load-mass', dr.loadMass);
  set('f-accel-time', dr.accelerationTime);
  set('f-accel', dr.acceleration);
  const gb = dr.gearbox || {};
  set('f-gear-ratio', gb.ratio);
  set('f-gear-eff', gb.efficiency);
  set('f-gear-rev', gb.reverseEfficiency);
  syncVisibility();
  showDefaults();
}

/**
 * Selects a loaded tolerance class; one the form's list does not hold for that thread form is added as it came
 * (marked so), so that it is sent unchanged and the API names what is wrong with it at the field.
 */
function setToleranceClass(form, value) {
  const select = $('f-tolerance');
  select.querySelectorAll('option[data-loaded]').forEach(function (o) {
    o.remove();
  });
  if (value === undefined || value === null || value === '') {
    select.value = '';
    return;
  }
  const held = Array.from(select.options).some(function (o) {
    return o.value === String(value) && o.dataset.form === form;
  });
  if (!held) {
    const option = document.createElement('option');
    option.value = String(value);
    option.dataset.form = form;
    option.dataset.loaded = 'true';
    option.textContent = String(value) + ' (as loaded; not a class held for this form)';
    select.append(option);
  }
  select.value = String(value);
}

/** Offers only the tolerance classes of the chosen form; the field shows only for a form that has classes. */
function syncToleranceClasses() {
  const form = $('f-form').value;
  const select = $('f-tolerance');
  let any = false;
  Array.from(select.options).forEach(function (o) {
    if (o.value === '') return;
    const mine = o.dataset.form === form;
    o.hidden = !mine;
    o.disabled = !mine;
    if (mine) any = true;
  });
  const chosen = select.options[select.selectedIndex];
  if (chosen && chosen.disabled) select.value = ''; // the form changed: its classes are another standard's
  $('f-tolerance-field').hidden = !any && select.value === '';
}

/** Shows the fields that the choices made call for. */
export function syncVisibility() {
  syncToleranceClasses();
  const standard = radio('size-mode') === 'standard';
  $('f-size-field').hidden = !standard;
  $('f-custom-size').hidden = standard;
  $('f-flank-field').hidden = $('f-form').value !== 'buttress';
  SURFACES.forEach(function (surface) {
    const entry = radio('friction-' + surface + '-mode') === 'entry';
    $('f-' + surface + '-entry-field').hidden = !entry;
    $('f-' + surface + '-range').hidden = entry;
  });
  const kind = $('f-collar-kind').value;
  $('f-collar-mean-field').hidden = !(kind === 'plain' || kind === 'rolling');
  $('f-collar-annular').hidden = kind !== 'annular';
  $('f-friction-collar').hidden = kind === 'none';
}

/**
 * The visible input a problem path names ("design." prefix allowed), or the nearest one above it
 * ("friction.collar" -> the collar friction's first field); null when the path is no field of the form.
 */
export function fieldFor(path) {
  let p = String(path).replace(/^design\./, '');
  while (p) {
    const exact = document.querySelector('[data-path="' + p + '"]');
    if (exact && !exact.closest('[hidden]')) return exact;
    const below = Array.from(document.querySelectorAll('[data-path^="' + p + '."]')).find(function (node) {
      return !node.closest('[hidden]');
    });
    if (below) return below;
    p = p.includes('.') ? p.slice(0, p.lastIndexOf('.')) : '';
  }
  return null;
}

/*
 * Defaults in words: an optional field the material library fills when it is left empty shows, below it, the value
 * the library gives and its source, labelled as a default (never as placeholder text, which reads as if entered).
 * The material fields show the library material's name beside its id.
 */
const DEFAULTS = {
  'f-nut-p': { part: 'nut', describe: function (m) {
    if (m.pressureBySpeed && m.pressureBySpeed.length) {
      return m.pressureBySpeed.filter(function (s) { return s.allowablePressure !== null; }).map(function (s) {
        return quantity(s.allowablePressure, 'pressure', 'SI') + (s.upToRubbingSpeed === null ? ' above' : ' up to ' + quantity(s.upToRubbingSpeed, 'slidingSpeed', 'SI'));
      }).join('; ') + ' of rubbing speed (the step for the design\'s speed is used) · source: ' + m.pressureBySpeed[0].source;
    }
    return m.allowablePressure === null ? null : quantity(m.allowablePressure, 'pressure', 'SI') + ' · source: ' + m.allowablePressureSource;
  } },
  'f-nut-pv': { part: 'nut', describe: function (m) { return m.allowablePv === null ? null : quantity(m.allowablePv, 'pv', 'SI') + ' · source: ' + m.allowablePvSource; } },
  'f-nut-yield': { part: 'nut', describe: function (m) { return m.yieldStrength === null ? null : quantity(m.yieldStrength, 'stress', 'SI') + ' · source: ' + m.yieldSource; } },
  'f-screw-yield': { part: 'screw', describe: function (m) { return quantity(m.yieldStrength, 'stress', 'SI') + ' · source: ' + m.source; } },
  'f-screw-modulus': { part: 'screw', describe: function (m) { return quantity(m.elasticModulus, 'modulus', 'SI') + ' · source: ' + m.source; } },
  'f-screw-density': { part: 'screw', describe: function (m) { return quantity(m.density, 'density', 'SI') + ' · source: ' + m.source; } },
};

let library = null;

/** The library material a material field names, or null. */
function materialOf(part) {
  if (!library) return null;
  const id = $('f-' + part + '-material').value.trim();
  return (part === 'nut' ? library.nuts : library.screws).find(function (m) { return m.id === id; }) || null;
}

/** Writes each default line and each material's name from the library and the fields as they stand. */
export function showDefaults() {
  if (!library) return;
  ['nut', 'screw'].forEach(function (part) {
    const named = $('f-' + part + '-material-name');
    if (!named) return;
    const m = materialOf(part);
    const id = $('f-' + part + '-material').value.trim();
    named.textContent = m ? 'Library material: ' + m.name + ' (id ' + m.id + ').' : id ? '"' + id + '" is not a library material: give the values below.' : '';
    named.hidden = named.textContent === '';
  });
  Object.keys(DEFAULTS).forEach(function (id) {
    const line = $(id + '-default');
    if (!line) return;
    const m = materialOf(DEFAULTS[id].part);
    const words = m ? DEFAULTS[id].describe(m) : null;
    const empty = $(id).value.trim() === '';
    line.textContent = words ? (empty ? 'Default (left empty): ' : 'Library value, replaced by yours: ') + words + ' (' + m.name + ')' : '';
    line.hidden = line.textContent === '';
  });
}

/** Gives the form the material library for its default lines; they follow every edit. */
export function useLibrary(materials) {
  library = materials;
  const form = $('design-form');
  if (form && !form.dataset.defaultsWatched) {
    form.dataset.defaultsWatched = 'true';
    form.addEventListener('input', showDefaults);
    form.addEventListener('change', showDefaults);
  }
  showDefaults();
}

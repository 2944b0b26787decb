/*
 * The design form's fields and the API's design input: readDesign builds exactly the body POST /evaluations
 * takes (empty optional fields left out), fillDesign puts a design input back into the fields, and fieldFor
 * finds the input a problem+json path names. A loaded field the form has no control for is kept and sent as it
 * came (keptPaths names them), so that saving or exporting never drops part of an engineering record. Which fields show follows the choices made (size or diameter
 * and pitch, library entry or typed range, kind of collar, buttress).
 */
import { $ } from './lib-dom.js';

const SURFACES = ['thread', 'collar'];

/**
 * The design input's fields the form has a control for (true: the whole subtree). Anything else in a loaded
 * design (a field of a later engine, or one the form does not offer yet) is kept as loaded and sent unchanged.
 */
const CONTROLLED = {
  thread: { form: true, size: true, majorDiameter: true, pitch: true, starts: true, loadFlankAngle: true },
  load: { axial: true, sense: true },
  friction: { thread: true, collar: true },
  collar: true,
  nut: { length: true, material: true, allowablePressure: true, allowablePv: true, yieldStrength: true },
  screw: { material: true, yieldStrength: true, elasticModulus: true, density: true, unsupportedLength: true, ends: true, endConditionBasis: true },
  duty: { kind: true, speed: true, linearSpeed: true, brake: true, brakeTorque: true, vibration: true },
  drive: { availableTorque: true },
};

/** The loaded design's fields without a control: [{ path: ['drive', 'gearbox'], value }], in the input's order. */
let kept = [];

function isObject(v) {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** The fields of `value` that `controlled` has no control for, each with its path. */
function uncontrolled(value, controlled, path) {
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
  optional(design.nut, 'allowablePv', text('f-nut-pv'));
  optional(design.nut, 'yieldStrength', text('f-nut-yield'));
  optional(design.screw, 'material', text('f-screw-material'));
  optional(design.screw, 'yieldStrength', text('f-screw-yield'));
  optional(design.screw, 'elasticModulus', text('f-screw-modulus'));
  optional(design.screw, 'density', text('f-screw-density'));
  design.screw.unsupportedLength = text('f-length');
  design.screw.ends = $('f-ends').value;
  design.screw.endConditionBasis = $('f-basis').value;
  optional(design.duty, 'speed', text('f-speed'));
  optional(design.duty, 'linearSpeed', text('f-linear'));
  design.duty.brake = $('f-brake').checked;
  optional(design.duty, 'brakeTorque', text('f-brake-torque'));
  design.duty.vibration = $('f-vibration').checked;
  const drive = text('f-drive');
  if (drive !== '') design.drive = { availableTorque: drive };
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
  set('f-nut-pv', nut.allowablePv);
  set('f-nut-yield', nut.yieldStrength);
  const s = d.screw || {};
  set('f-screw-material', s.material);
  set('f-screw-yield', s.yieldStrength);
  set('f-screw-modulus', s.elasticModulus);
  set('f-screw-density', s.density);
  set('f-length', s.unsupportedLength);
  set('f-ends', s.ends || 'fixed-free');
  set('f-basis', s.endConditionBasis || 'recommended');
  const duty = d.duty || {};
  set('f-duty', duty.kind || 'lifting');
  set('f-speed', duty.speed);
  set('f-linear', duty.linearSpeed);
  $('f-brake').checked = duty.brake === true;
  set('f-brake-torque', duty.brakeTorque);
  $('f-vibration').checked = duty.vibration === true;
  set('f-drive', d.drive && d.drive.availableTorque);
  syncVisibility();
}

/** Shows the fields that the choices made call for. */
export function syncVisibility() {
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

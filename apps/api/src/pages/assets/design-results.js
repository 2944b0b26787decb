/*
 * The design form's results panel: the figures an engineer reads first, from one POST /evaluations answer,
 * in SI or US customary units; the findings by severity with their basis; the report's charts as SVG images.
 * Every status is said in words (within / ABOVE the allowable, locks / does NOT lock), colour only follows.
 */
import { el } from './lib-dom.js';
import { badge, countFindings, findingCounts, percent, quantity, sig, VERDICTS } from './lib-format.js';
import { renderFindings } from './lib-findings.js';

/**
 * The strength check with the lowest factor among the answer's `checks` (the rules' declarations, as the API
 * answers them; the report's summary takes the same one), or null.
 */
export function lowestStrengthCheck(checks) {
  let lowest = null;
  for (const c of checks || []) {
    if (c.group !== 'strength' || c.value === null) continue;
    if (!lowest || c.value < lowest.value) lowest = c;
  }
  return lowest;
}

/** A check's value or limit as printed: a factor with significant figures, a share of an allowable in per cent. */
function checkFigure(c, x) {
  return c.quantity === 'fraction' ? percent(x) : sig(x);
}

const CHECK_STATUS_WORDS = { pass: 'within the limit', warning: 'past the warning level', fail: 'PAST the limit', 'not-computed': 'not computed' };

/** The governing check: its value, what it is, its limit and its status in words. */
function governingRow(g) {
  if (!g) return row('Governing check', 'no check has a value');
  const limit = (g.limitKind === 'minimum' ? 'at least ' : 'at most ') + checkFigure(g, g.limit);
  const words = g.note ? 'FAILS: ' + g.note : CHECK_STATUS_WORDS[g.status];
  return row('Governing check', [value('governing-value', g.value === null ? 'not computed' : checkFigure(g, g.value)), ' — ', value('governing-check', g.label)], 'limit ' + limit,
    el('span', { class: g.status === 'pass' ? 'ok-word' : 'bad-word' }, words));
}

/** What a lowering torque's sign means, said only for the signs present. */
function loweringNote(t) {
  const negative = t.atMinFriction < 0 || t.atMaxFriction < 0;
  const positive = t.atMinFriction >= 0 || t.atMaxFriction >= 0;
  if (negative && positive) return 'a negative value: the load drives the screw back; positive: torque is needed to lower';
  return negative ? 'negative: the load drives the screw back' : 'positive: torque is needed to lower';
}

function value(figure, text) {
  return el('span', { 'data-figure': figure }, text);
}

function status(ok, good, bad) {
  return ok === null ? el('span', { class: 'muted' }, 'not checked') : el('span', { class: ok ? 'ok-word' : 'bad-word' }, ok ? good : bad);
}

/** One figure: what it is, its values, and beside them what it is held against and the status in words. */
function row(label, values, against, verdict) {
  const note = el('td', { class: 'against' }, against || '');
  if (verdict) note.append(against ? el('br') : '', verdict);
  return el('tr', {}, el('th', { scope: 'row' }, label), el('td', {}, values), note);
}

/** Fills the panel from one evaluation answer (SI) in the chosen display system ('SI' or 'US'). */
export function renderResults(panel, e, system) {
  const q = function (si, kind) {
    return quantity(si, kind, system);
  };
  panel.verdict.replaceChildren('Verdict of the rules: ', badge('verdict', e.verdict, VERDICTS), ' ', findingCounts(countFindings(e.findings)), el('span', { class: 'muted small' }, ' · rule set ' + e.ruleSetVersion + ' · engine ' + e.engineVersion));
  const lowest = lowestStrengthCheck(e.checks);
  const w = e.wear;
  const rows = [
    row('Raising torque (thread + collar)', [value('raise-min', q(e.torque.raise.atMinFriction, 'torque')), ' at lowest friction; ', value('raise-max', q(e.torque.raise.atMaxFriction, 'torque')), ' at highest']),
    row('Lowering torque (thread + collar)', [value('lower-min', q(e.torque.lower.atMinFriction, 'torque')), ' at lowest friction; ', value('lower-max', q(e.torque.lower.atMaxFriction, 'torque')), ' at highest'], loweringNote(e.torque.lower)),
    row('Efficiency', [value('efficiency-min', percent(e.efficiency.atMinFriction)), ' at lowest friction; ', value('efficiency-max', percent(e.efficiency.atMaxFriction)), ' at highest']),
    row('Self-locking (thread, lowest friction)', [value('locking-margin', sig(e.selfLocking.margin)), ' margin f / (cos αₙ tan λ)'], 'locks above 1', status(e.selfLocking.locks, 'locks', 'does NOT lock')),
    governingRow(e.governing),
    row('Lowest strength safety factor', lowest ? [value('lowest-factor', sig(lowest.value)), ' — ', value('lowest-check', lowest.label)] : 'none computed', lowest ? 'minimum ' + sig(lowest.limit) : ''),
    row('Buckling safety factor', e.buckling.applies ? [value('buckling-factor', sig(e.buckling.safetyFactor)), e.buckling.regime ? ' (' + e.buckling.regime + ' column)' : ''] : value('buckling-factor', 'does not apply (screw in tension)')),
    row('Whirl (critical speed)', [value('critical-speed', sig(e.criticalSpeed.rpm) + ' rpm'), ' critical; operating / critical = ', value('speed-ratio', e.criticalSpeed.ratio === null ? 'no speed given' : sig(e.criticalSpeed.ratio))]),
    ...partlyFixedRows(e.criticalSpeed.partlyFixed),
    row('Nut bearing pressure', value('nut-pressure', q(w.bearingPressure, 'pressure')), w.allowablePressure === null ? 'no allowable given' : ['allowable ', value('nut-pressure-allowable', q(w.allowablePressure, 'pressure')), ...allowableClass(w)], w.pressureRatio === null ? status(null) : status(w.pressureRatio <= 1, 'within the allowable', 'ABOVE the allowable')),
    row('Nut pV', value('pv', w.pv === null ? 'no speed given' : q(w.pv, 'pv')), w.allowablePv === null ? 'no allowable given' : ['allowable ', value('pv-allowable', q(w.allowablePv, 'pv'))], w.pvRatio === null ? status(null) : status(w.pvRatio <= 1, 'within the allowable', 'ABOVE the allowable')),
    row('Drive margin', e.drive ? [value('drive-margin', sig(e.drive.margin)), ' = available / required'] : value('drive-margin', 'no drive torque given'), e.drive ? ['required ', value('drive-required', q(e.drive.requiredTorque, 'torque')), driveBasis(e.drive), ', available ', q(e.drive.availableTorque, 'torque')] : ''),
  ];
  if (e.brake) rows.push(brakeRow(e.brake, e.drive, q));
  panel.figures.tBodies[0].replaceChildren(...rows);
  renderFindings(panel.findings, e.findings);
}

/** Which allowable pressure applied: the rubbing-speed class of a speed-rated table, or one value at any speed. */
function allowableClass(w) {
  if (w.allowablePressureBasis === 'any-speed') return [' (', value('nut-pressure-class', 'one value, used at any speed'), ')'];
  if (w.allowablePressureClass) return [' for the rubbing speed (', value('nut-pressure-class', w.allowablePressureClass), ')'];
  return [];
}

/** Whirl with fixed ends taken as only partly fixed, where the engine reports it (the rule uses the lower speed). */
function partlyFixedRows(pf) {
  if (!pf) return [];
  return [row('Whirl, fixed ends partly fixed', [value('critical-speed-partly-fixed', sig(pf.rpm) + ' rpm'), ' critical; operating / critical = ', value('speed-ratio-partly-fixed', pf.ratio === null ? 'no speed given' : sig(pf.ratio))], 'the whirl rule uses the lower critical speed')];
}

/** What the drive's required torque is: the peak at the motor, steady plus acceleration, through a gearbox if any. */
function driveBasis(d) {
  if (d.peakTorqueAtMotor === undefined) return '';
  const parts = [' (peak at the motor'];
  if (d.accelerationTorque > 0) parts.push(': steady raise torque plus acceleration');
  if (d.gearbox) parts.push(', through the gearbox');
  parts.push(')');
  return parts.join('');
}

/** Holding the load: the torque a brake must supply with thread friction lost, and against the rated torque if stated. */
function brakeRow(b, drive, q) {
  const values = [value('brake-holding', q(b.holdingTorqueNoFriction, 'torque')), ' with thread friction lost; ', value('brake-holding-min', q(b.holdingTorqueMinFriction, 'torque')), ' at lowest friction'];
  if (drive && drive.gearbox) values.push('; at the motor ', value('brake-holding-motor', q(drive.holdingTorqueAtMotor, 'torque')));
  const against = b.ratedTorque === null
    ? 'no brake torque stated'
    : ['brake rated ', q(b.ratedTorque, 'torque'), ' = ', value('brake-ratio', sig(b.ratio)), ' × the torque with friction lost at the brake'];
  return row('Brake holding torque (at the screw)', values, against);
}

/** Shows a server-drawn SVG chart as an image (no markup from the API enters the page), or hides its figure. */
export function showChart(img, svg) {
  const figure = img.closest('figure');
  if (!svg) {
    figure.hidden = true;
    img.removeAttribute('src');
    return;
  }
  const standalone = svg.replace(/^<svg /, '<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" ');
  img.src = 'data:image/svg+xml;charset=utf-8,' + encodeURIComponent(standalone);
  figure.hidden = false;
}

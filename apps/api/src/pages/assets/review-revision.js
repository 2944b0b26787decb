/*
 * One revision under review (/review/revisions/:id): header, the changes since the previous revision (inputs and
 * results, that revision's decision and comments), what was said on this one, the calculation report in the page,
 * findings and results (the revision's checks) with the comments on each and the comment form (review-remarks.js),
 * and the decision form (no preset decision; a blocked revision offers only Reject).
 */
import { api, ApiError, download } from './lib-api.js';
import { $, el, pathId } from './lib-dom.js';
import { badge, percent, quantity, sig, STATES, time, verdictBadge } from './lib-format.js';
import { renderFindings, sortedFindings } from './lib-findings.js';
import { passkeysAvailable, usePasskey } from './lib-passkey.js';
import { clearFieldErrors, clearProblem, showFieldErrors, showProblem } from './lib-problem.js';
import { currentUser, startPage } from './lib-session.js';
import { remarkItem, rememberFieldLabels, rememberPreviousRemarks, renderInputRemarks, renderRemarks, setUpComment } from './review-remarks.js';

/**
 * The report is shown in the page itself, as the service renders it for embedding (report.html?part=embedded): its
 * styles nested under its own box and carrying this response's style nonce, its ids prefixed, no style attributes
 * and no script. It is parsed by DOMParser (an inert document: nothing in it runs) and moved in as it was served;
 * the page's policy (script-src 'self', style-src 'self' plus the nonce) holds for it as for the page.
 */
async function showReport(base) {
  const html = await api(base + '/report.html?part=embedded&idPrefix=report-&styleNonce=' + encodeURIComponent(styleNonce()), { as: 'text', accept: 'text/html' });
  const parsed = new DOMParser().parseFromString(html, 'text/html');
  $('report-body').replaceChildren(...Array.from(parsed.head.childNodes), ...Array.from(parsed.body.childNodes));
  $('report-status').textContent = '';
  $('report-status').hidden = true;
}

function styleNonce() {
  const meta = document.querySelector('meta[name="leadline-style-nonce"]');
  return meta ? meta.content : '';
}

function fact(list, term, value) {
  list.append(el('dt', {}, term), el('dd', {}, value));
}

function renderHeader(rev, product, calculation) {
  document.title = product.code + ' · ' + calculation.title + ' · revision ' + rev.revision + ' · Leadline';
  $('revision-heading').replaceChildren(product.code + ' · ' + calculation.title + ' · revision ' + rev.revision);
  const facts = $('revision-header');
  facts.replaceChildren();
  fact(facts, 'Product', product.code + ' — ' + product.name);
  fact(facts, 'Calculation', calculation.title);
  fact(facts, 'Revision', String(rev.revision) + (rev.note ? ' — ' + rev.note : ''));
  const state = el('span', {}, badge('state', rev.review.state, STATES));
  if (rev.review.decidedBy) state.append(' by ' + rev.review.decidedBy.name + ' at ' + time(rev.review.decidedAt) + ' UTC');
  if (rev.review.signature) state.append('; signed: ' + rev.review.signature.meaning + ', ' + rev.review.signature.signedAt + ', by ' + rev.review.signature.method + ' (signature ' + rev.review.signature.fingerprint + ')');
  fact(facts, 'Review state', state);
  fact(facts, 'Verdict of the rules', verdictBadge(rev.verdict, rev.review.state));
  fact(facts, 'Author', rev.author ? rev.author.name : '–');
  fact(facts, 'Submitted', time(rev.createdAt) + ' UTC');
  fact(facts, 'Engine · rule set', rev.engineVersion + ' · ' + rev.ruleSetVersion);
  fact(facts, 'Record hash', el('code', { class: 'hash wrap' }, rev.hash));
}

function textField(id, labelNodes, hint, extraAttrs) {
  const wrap = el('div', { class: 'field' });
  wrap.append(el('label', { for: id }, ...labelNodes));
  if (hint) wrap.append(el('p', { class: 'muted small', id: id + '-hint' }, hint));
  wrap.append(el('textarea', Object.assign({ id: id, rows: 2, 'aria-describedby': hint ? id + '-hint' : null }, extraAttrs || {})));
  return wrap;
}

function setUpDecision(rev, reload) {
  const minLength = Number($('acknowledgements').dataset.minLength || 0);
  const blocking = rev.findings.filter(function (f) {
    return f.severity === 'blocking';
  });
  const warnings = rev.findings.filter(function (f) {
    return f.severity === 'warning';
  });
  const form = $('decision-form');
  const acks = $('acknowledgements');
  acks.replaceChildren();
  if (blocking.length) {
    // it cannot be approved: say so, name the blocking findings first, offer only Reject
    $('blocked-notice').replaceChildren(
      el('strong', {}, 'This revision cannot be approved: '),
      blocking.length + ' blocking finding' + (blocking.length === 1 ? '' : 's') + ' (' + blocking.map(function (f) { return f.ruleId; }).join(', ') + '). Only a rejection can be recorded; say what must change.',
    );
    $('blocked-notice').hidden = false;
    $('approve-choice').remove();
    form.querySelector('input[name="decision"][value="reject"]').checked = true;
  }
  acks.classList.toggle('empty', warnings.length === 0 || blocking.length > 0);
  if (warnings.length && !blocking.length) {
    acks.append(el('p', { class: 'small' }, 'An approval must acknowledge every warning with its reason, at least ' + minLength + ' characters (e.g. "Friction test booked with the supplier").'));
    warnings.forEach(function (f, i) {
      acks.append(textField('ack-' + i, ['Acknowledge warning ', el('code', {}, f.ruleId), ' ', el('span', { class: 'required' }, '(required, at least ' + minLength + ' characters)')], f.message, { 'data-finding': f.ruleId, 'aria-required': 'true' }));
    });
  }
  const commentFields = $('finding-comment-fields');
  commentFields.replaceChildren();
  sortedFindings(rev.findings).forEach(function (f, i) {
    commentFields.append(textField('finding-comment-' + i, ['Comment on ', el('code', {}, f.ruleId)], null, { 'data-finding': f.ruleId }));
  });
  $('finding-comments').hidden = rev.findings.length === 0;

  const slot = $('decision-problem');
  function chosen() {
    const checked = form.querySelector('input[name="decision"]:checked');
    return checked ? checked.value : null;
  }
  function sync() {
    const decision = chosen();
    acks.hidden = decision !== 'approve';
    $('decision-comment').setAttribute('aria-required', decision === 'reject' ? 'true' : 'false');
    $('decision-submit').textContent = decision === 'approve' ? 'Approve revision ' + rev.revision : decision === 'reject' ? 'Reject revision ' + rev.revision : 'Sign and record decision';
  }
  form.querySelectorAll('input[name="decision"]').forEach(function (radio) {
    radio.addEventListener('change', sync);
  });
  sync();

  let sentAcks = [];
  let sentComments = [];
  /** The box a field path names, for the message at the field and the focus. */
  function locate(path) {
    let m;
    if (path === 'decision') return form.querySelector('input[name="decision"]');
    if (path === 'comment') return $('decision-comment');
    if (/^signature/.test(path)) return passkeySigner() ? $('signature-passkey') : $('signature-password-field').hidden ? $('signature-oidc-start') : $('signature-password');
    if (path === 'acknowledgements') {
      return Array.from(acks.querySelectorAll('textarea')).find(function (area) { return area.value.trim().length < minLength; }) || acks.querySelector('textarea');
    }
    if ((m = /^acknowledgements\.(\d+)/.exec(path))) return sentAcks[m[1]] || null;
    if ((m = /^comments\.(\d+)/.exec(path))) return sentComments[m[1]] || null;
    return null;
  }
  /** A field path in words, for the summary above the button. */
  function label(path) {
    if (/^signature/.test(path)) return 'Electronic signature';
    const box = locate(path);
    if (box && box.type === 'radio') return 'Decision';
    if (box && box.id) {
      const l = document.querySelector('label[for="' + box.id + '"]');
      if (l) return l.textContent.replace(/\s*\(.*\)\s*$/, '').trim();
    }
    if (/^signature/.test(path)) return 'Electronic signature';
    return path;
  }
  function refuse(err) {
    showProblem(slot, err, { label: label });
    const errors = (err.problem && err.problem.errors) || [];
    const unplaced = showFieldErrors(form, errors, locate, { focus: true });
    if (errors.length === 0 || unplaced.length === errors.length) {
      slot.setAttribute('tabindex', '-1');
      slot.focus();
    }
  }

  form.addEventListener('submit', async function (event) {
    event.preventDefault();
    clearProblem(slot);
    clearFieldErrors(form);
    const decision = chosen();
    const issues = [];
    if (!decision) issues.push({ path: 'decision', message: 'choose Approve or Reject' });
    const body = { decision: decision };
    const comment = $('decision-comment').value.trim();
    if (comment) body.comment = comment;
    else if (decision === 'reject') issues.push({ path: 'comment', message: 'a rejection says what must change' });
    sentAcks = [];
    if (decision === 'approve') {
      acks.querySelectorAll('textarea').forEach(function (area) {
        if (area.value.trim()) sentAcks.push(area);
        if (area.value.trim().length < minLength) issues.push({ path: 'acknowledgements', message: 'give the reason for accepting this warning in at least ' + minLength + ' characters', box: area });
      });
      if (sentAcks.length) body.acknowledgements = sentAcks.map(function (area) {
        return { finding: area.dataset.finding, comment: area.value.trim() };
      });
    }
    sentComments = [];
    commentFields.querySelectorAll('textarea').forEach(function (area) {
      if (area.value.trim()) sentComments.push(area);
    });
    if (sentComments.length) body.comments = sentComments.map(function (area) {
      return { text: area.value.trim(), target: { finding: area.dataset.finding } };
    });
    if (issues.length) {
      // said here before anything is sent, in the same words and places as the service's refusal
      const boxes = issues.map(function (i) { return i.box || locate(i.path); });
      const shown = issues.map(function (i, k) { return { path: String(k), message: i.message }; });
      const words = function (k) {
        const box = boxes[Number(k)];
        if (box && box.type === 'radio') return 'Decision';
        const l = box && box.id ? document.querySelector('label[for="' + box.id + '"]') : null;
        return l ? l.textContent.replace(/\s*\(.*\)\s*$/, '').trim() : null;
      };
      showProblem(slot, new ApiError(0, { title: 'Not recorded: ' + issues.length + ' field' + (issues.length === 1 ? '' : 's') + ' to complete', errors: shown }), { label: words });
      showFieldErrors(form, shown, function (k) { return boxes[Number(k)]; }, { focus: true });
      return;
    }
    // signed at the identity provider (a fresh login for this revision), or with the password given now; without
    // either the service refuses the unsigned decision itself (403 naming signature)
    const button = $('decision-submit');
    button.disabled = true;
    try {
      if (passkeySigner()) body.signature = await passkeySignature(rev.id);
      else if (oidcSigner()) body.signature = { method: 'oidc' };
      else if ($('signature-password').value) body.signature = { method: 'password', password: $('signature-password').value };
      const result = await api('/api/v1/revisions/' + encodeURIComponent(rev.id) + '/decisions', { method: 'POST', body: body });
      $('decision').hidden = true;
      const done = $('decision-done');
      const sig = result.signature;
      done.replaceChildren('Revision ' + rev.revision + ' ' + result.state + ' at ' + time(result.decidedAt) + ' UTC, signed by ' + sig.printedName + ' (' + sig.meaning + '; signature ' + sig.fingerprint + '). Event hash ', el('code', { class: 'hash wrap' }, result.hash), '.');
      done.hidden = false;
      $('signature-password').value = '';
      reload();
    } catch (err) {
      $('signature-password').value = '';
      refuse(err && err.name === 'NotAllowedError'
        ? new ApiError(0, { title: 'Not recorded: the passkey did not sign', errors: [{ path: 'signature', message: 'the passkey did not sign (cancelled or timed out)' }] })
        : err);
    } finally {
      button.disabled = false;
    }
  });
}

/** Whether the signer chose their passkey. */
function passkeySigner() {
  return !$('signature-passkey-field').hidden && $('signature-passkey').checked;
}

/** A passkey signature over this revision's record hash: the service's one-use challenge, signed by the authenticator. */
async function passkeySignature(revisionId) {
  const challenge = await api('/api/v1/revisions/' + encodeURIComponent(revisionId) + '/passkey-challenges', { method: 'POST' });
  return { method: 'passkey', challengeId: challenge.challengeId, response: await usePasskey(challenge.options) };
}

/** Offers the passkey when this browser can use one and the signer has one here (chosen already after a passkey sign-in). */
async function setUpPasskeySignature() {
  if (!passkeysAvailable()) return;
  const keys = (await api('/api/v1/account/passkeys')).items.filter(function (k) { return k.rpId === location.hostname; });
  if (keys.length === 0) return;
  $('signature-passkey-field').hidden = false;
  const me = currentUser();
  $('signature-passkey').checked = Boolean(me && me.authMethod === 'passkey');
  const sync = function () {
    $('signature-password-field').hidden = $('signature-passkey').checked || oidcSigner();
  };
  $('signature-passkey').addEventListener('change', sync);
  sync();
}

function checkFigure(c) {
  if (!c || c.value === null || c.value === undefined) return 'not computed';
  return c.quantity === 'fraction' ? percent(c.value) : sig(c.value);
}

/** "Changes since revision N": inputs and results, that revision's decision and comments, and the compare link. */
async function renderChanges(rev) {
  if (rev.revision < 2) return;
  const list = await api('/api/v1/calculations/' + encodeURIComponent(rev.calculationId) + '/revisions?view=summary&after=' + (rev.revision - 2) + '&limit=1');
  const previous = list.items[0];
  if (!previous || previous.revision !== rev.revision - 1) return;
  const [diff, before] = await Promise.all([
    api('/api/v1/revisions/' + encodeURIComponent(rev.id) + '/diff?against=' + encodeURIComponent(previous.id)),
    api('/api/v1/revisions/' + encodeURIComponent(previous.id)),
  ]);
  const n = previous.revision;
  rememberFieldLabels(diff.inputs);
  $('changes-heading').textContent = 'Changes since revision ' + n;
  const state = before.review;
  $('previous-review').replaceChildren(
    'Revision ' + n + ': ', badge('state', state.state, STATES),
    state.decidedBy ? ' by ' + state.decidedBy.name + ' at ' + time(state.decidedAt) + ' UTC' : '',
    before.note ? '. Its note: ' + before.note : '', '.',
  );
  const remarks = before.remarks || [];
  rememberPreviousRemarks(remarks);
  $('previous-remarks').replaceChildren(...(remarks.length ? remarks.map(remarkItem) : [el('li', { class: 'muted' }, 'Nothing was said on revision ' + n + '.')]));
  $('previous-remarks').setAttribute('aria-label', 'What was said on revision ' + n);
  $('changes-governing').replaceChildren(
    el('strong', {}, 'Governing check: '),
    rev.governing ? rev.governing.label + ' ' + checkFigure(rev.governing) : 'none',
    ' (revision ' + n + ': ' + (before.governing ? before.governing.label + ' ' + checkFigure(before.governing) : 'none') + '). Verdict of the rules: ',
    verdictBadge(rev.verdict, rev.review.state), ' (revision ' + n + ': ', verdictBadge(before.verdict, state.state), ').',
  );
  ['inputs', 'results'].forEach(function (part) {
    $('changes-' + part + '-caption').textContent = (part === 'inputs' ? 'Inputs' : 'Results') + ' changed since revision ' + n;
    $('changes-' + part + '-before').textContent = 'Revision ' + n;
    $('changes-' + part + '-after').textContent = 'Revision ' + rev.revision;
  });
  const shown = function (v) {
    return v === undefined || v === null || v === '' ? '(not given)' : v === true ? 'yes' : v === false ? 'no' : String(v);
  };
  $('changes-inputs').tBodies[0].replaceChildren(...(diff.inputs.length ? diff.inputs.map(function (c) {
    return el('tr', { 'data-path': c.path }, el('th', { scope: 'row' }, c.label), el('td', {}, shown(c.from)), el('td', {}, shown(c.to)));
  }) : [el('tr', {}, el('td', { colspan: 3 }, 'No input changed.'))]));
  renderInputRemarks(rev);
  $('changes-results').tBodies[0].replaceChildren(...(diff.results.length ? diff.results.map(function (c) {
    const value = function (v, missing) {
      return missing ? 'not computed by its engine' : c.quantity ? quantity(v, c.quantity, 'SI') : shown(v);
    };
    return el('tr', { 'data-path': c.path }, el('th', { scope: 'row' }, c.label || c.path), el('td', {}, value(c.from, c.notComputed === 'from')), el('td', {}, value(c.to, c.notComputed === 'to')));
  }) : [el('tr', {}, el('td', { colspan: 3 }, 'No result changed.'))]));
  $('compare-link').setAttribute('href', '/design/calculations/' + encodeURIComponent(rev.calculationId) + '#compare');
  $('compare-link').textContent = 'Compare revisions ' + n + ' and ' + rev.revision + ' side by side';
  $('changes').hidden = false;
}

/** A user signed in at the identity provider signs there too (a fresh login, max_age=0), not with a password. */
function oidcSigner() {
  const me = currentUser();
  return Boolean(me && me.authMethod === 'oidc');
}

/** For a provider-signed-in user: the link to the fresh login for this revision, and what came back from it. */
function setUpProviderSignature(revisionId) {
  if (!oidcSigner()) return;
  $('signature-password-field').hidden = true;
  $('signature-oidc').hidden = false;
  $('signature-oidc-start').setAttribute('href', '/api/v1/auth/oidc/start?purpose=sign&revision=' + encodeURIComponent(revisionId) + '&next=' + encodeURIComponent(location.pathname));
  const status = $('signature-oidc-status');
  if (location.hash === '#signed-at-provider') status.textContent = 'Identity confirmed at the provider: record the decision now.';
  else if (location.hash === '#provider-login-too-old') status.textContent = 'The provider did not ask you to sign in again; confirm once more.';
  else status.textContent = 'Confirm first, then record the decision.';
}

async function revisionPage() {
  const id = pathId(/^\/review\/revisions\/([^/]+)$/);
  const base = '/api/v1/revisions/' + encodeURIComponent(id);
  const problemSlot = $('revision-problem');
  async function loadHeader() {
    const rev = await api(base);
    const related = await Promise.all([api('/api/v1/products/' + encodeURIComponent(rev.productId)), api('/api/v1/calculations/' + encodeURIComponent(rev.calculationId))]);
    renderHeader(rev, related[0], related[1]);
    renderRemarks(rev);
    return { rev: rev, product: related[0] };
  }
  try {
    const loaded = await loadHeader();
    const rev = loaded.rev;
    $('audit-link').setAttribute('href', '/review/products/' + encodeURIComponent(rev.productId) + '/audit');
    renderFindings($('findings'), rev.findings);
    renderRemarks(rev);
    $('revision').hidden = false;
    try {
      await renderChanges(rev);
    } catch (err) {
      showProblem(problemSlot, err);
    }
    const me = currentUser();
    const reloadRemarks = function () {
      loadHeader().catch(function (err) {
        showProblem(problemSlot, err);
      });
    };
    if (me && (me.roles.includes('reviewer') || me.roles.includes('author'))) setUpComment(rev, reloadRemarks);
    if (rev.review.state === 'submitted' && me && !me.roles.includes('reviewer')) {
      const done = $('decision-done');
      done.textContent = 'This revision awaits review; a checking engineer records the decision.';
      done.hidden = false;
    } else if (rev.review.state === 'submitted') {
      setUpProviderSignature(rev.id);
      setUpPasskeySignature().catch(function (err) {
        showProblem(problemSlot, err);
      });
      setUpDecision(rev, reloadRemarks);
      $('decision').hidden = false;
    } else {
      const done = $('decision-done');
      done.textContent = 'This revision is ' + (STATES[rev.review.state] || rev.review.state).toLowerCase() + '; no decision can be recorded on it.';
      done.hidden = false;
    }
    $('download-pdf').addEventListener('click', function () {
      download(base + '/report.pdf', loaded.product.code + '-rev' + rev.revision + '.pdf', $('download-status'));
    });
    await showReport(base).catch(function (err) {
      $('report-status').textContent = 'The report could not be shown here; the PDF report above has the same content.';
      throw err;
    });
  } catch (err) {
    showProblem(problemSlot, err);
  }
}


startPage(revisionPage);

/* One revision under review (/review/revisions/:id): header, report frame, findings, decision form. */
import { api, download } from './lib-api.js';
import { $, el, pathId } from './lib-dom.js';
import { badge, STATES, time, verdictBadge } from './lib-format.js';
import { renderFindings, sortedFindings } from './lib-findings.js';
import { passkeysAvailable, usePasskey } from './lib-passkey.js';
import { clearProblem, showProblem } from './lib-problem.js';
import { currentUser, startPage } from './lib-session.js';

/**
 * The report goes into a sandboxed frame (no scripts, opaque origin) through srcdoc, which inherits this page's
 * policy. The service renders it for this page: its style blocks carry this response's style nonce and it has no
 * style attributes, so it is shown exactly as served.
 */
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
  const warnings = rev.findings.filter(function (f) {
    return f.severity === 'warning';
  });
  const acks = $('acknowledgements');
  acks.replaceChildren();
  acks.classList.toggle('empty', warnings.length === 0);
  if (warnings.length) {
    acks.append(el('p', { class: 'small' }, 'An approval must acknowledge every warning with a comment.'));
    warnings.forEach(function (f, i) {
      acks.append(textField('ack-' + i, ['Acknowledge warning ', el('code', {}, f.ruleId), ' ', el('span', { class: 'required' }, '(required)')], f.message, { 'data-finding': f.ruleId, 'aria-required': 'true' }));
    });
  }
  const commentFields = $('finding-comment-fields');
  commentFields.replaceChildren();
  sortedFindings(rev.findings).forEach(function (f, i) {
    commentFields.append(textField('finding-comment-' + i, ['Comment on ', el('code', {}, f.ruleId)], null, { 'data-finding': f.ruleId }));
  });
  $('finding-comments').hidden = rev.findings.length === 0;

  const form = $('decision-form');
  const slot = $('decision-problem');
  function chosen() {
    return form.querySelector('input[name="decision"]:checked').value;
  }
  function sync() {
    const approving = chosen() === 'approve';
    acks.hidden = !approving;
    $('decision-comment').setAttribute('aria-required', approving ? 'false' : 'true');
    $('decision-submit').textContent = approving ? 'Approve revision ' + rev.revision : 'Reject revision ' + rev.revision;
  }
  form.querySelectorAll('input[name="decision"]').forEach(function (radio) {
    radio.addEventListener('change', sync);
  });
  sync();

  form.addEventListener('submit', async function (event) {
    event.preventDefault();
    clearProblem(slot);
    form.querySelectorAll('[aria-invalid]').forEach(function (node) {
      node.removeAttribute('aria-invalid');
    });
    const decision = chosen();
    const body = { decision: decision };
    const comment = $('decision-comment').value.trim();
    if (comment) body.comment = comment;
    const sentAcks = [];
    if (decision === 'approve') {
      acks.querySelectorAll('textarea').forEach(function (area) {
        if (area.value.trim()) sentAcks.push(area);
      });
      if (sentAcks.length) body.acknowledgements = sentAcks.map(function (area) {
        return { finding: area.dataset.finding, comment: area.value.trim() };
      });
    }
    const sentComments = [];
    commentFields.querySelectorAll('textarea').forEach(function (area) {
      if (area.value.trim()) sentComments.push(area);
    });
    if (sentComments.length) body.comments = sentComments.map(function (area) {
      return { text: area.value.trim(), target: { finding: area.dataset.finding } };
    });
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
      showProblem(slot, err && err.name === 'NotAllowedError' ? { message: 'The passkey did not sign (cancelled or timed out).' } : err);
      markInvalid(err, sentAcks, sentComments, acks);
      if (((err.problem && err.problem.errors) || []).some(function (i) { return /^signature/.test(String(i.path)); })) $('signature-password').setAttribute('aria-invalid', 'true');
      slot.scrollIntoView({ block: 'nearest' });
    } finally {
      button.disabled = false;
    }
  });
}

/** Points the field paths of a 422 back at the boxes they came from. */
function markInvalid(err, sentAcks, sentComments, acks) {
  const errors = (err.problem && err.problem.errors) || [];
  errors.forEach(function (issue) {
    const path = String(issue.path);
    let m;
    if (path === 'comment') $('decision-comment').setAttribute('aria-invalid', 'true');
    else if (path === 'acknowledgements') {
      acks.querySelectorAll('textarea').forEach(function (area) {
        if (!area.value.trim()) area.setAttribute('aria-invalid', 'true');
      });
    } else if ((m = /^acknowledgements\.(\d+)/.exec(path)) && sentAcks[m[1]]) sentAcks[m[1]].setAttribute('aria-invalid', 'true');
    else if ((m = /^comments\.(\d+)/.exec(path)) && sentComments[m[1]]) sentComments[m[1]].setAttribute('aria-invalid', 'true');
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
    return { rev: rev, product: related[0] };
  }
  try {
    const loaded = await loadHeader();
    const rev = loaded.rev;
    $('audit-link').setAttribute('href', '/review/products/' + encodeURIComponent(rev.productId) + '/audit');
    renderFindings($('findings'), rev.findings);
    $('revision').hidden = false;
    const me = currentUser();
    if (rev.review.state === 'submitted' && me && !me.roles.includes('reviewer')) {
      const done = $('decision-done');
      done.textContent = 'This revision awaits review; a checking engineer records the decision.';
      done.hidden = false;
    } else if (rev.review.state === 'submitted') {
      setUpProviderSignature(rev.id);
      setUpPasskeySignature().catch(function (err) {
        showProblem(problemSlot, err);
      });
      setUpDecision(rev, function () {
        loadHeader().catch(function (err) {
          showProblem(problemSlot, err);
        });
      });
      $('decision').hidden = false;
    } else {
      const done = $('decision-done');
      done.textContent = 'This revision is ' + (STATES[rev.review.state] || rev.review.state).toLowerCase() + '; no decision can be recorded on it.';
      done.hidden = false;
    }
    $('download-pdf').addEventListener('click', function () {
      download(base + '/report.pdf', loaded.product.code + '-rev' + rev.revision + '.pdf', $('download-status'));
    });
    const frame = $('report-frame');
    frame.srcdoc = await api(base + '/report.html?styleNonce=' + encodeURIComponent(styleNonce()), { as: 'text', accept: 'text/html' });
  } catch (err) {
    showProblem(problemSlot, err);
  }
}


startPage(revisionPage);

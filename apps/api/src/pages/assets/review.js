/*
 * Leadline reviewer pages. The HTML shells hold no data: this script asks the JSON API for everything, with the
 * bearer token the user pasted. The token lives in sessionStorage (this tab only) and travels only in the
 * Authorization header: never in a cookie, a web address or a log line. API data reaches the page only through
 * textContent and attributes, never as markup.
 */
(function () {
  'use strict';

  const TOKEN_KEY = 'leadline.reviewToken';
  const AUDIT_PAGE_SIZE = 25;
  const QUEUE_LIMIT = 200; // the API's largest page
  const VERDICTS = { clear: 'Clear', 'needs-acknowledgement': 'Needs acknowledgement', blocked: 'Blocked' };
  const STATES = { submitted: 'Awaiting review', approved: 'Approved', rejected: 'Rejected', withdrawn: 'Withdrawn', superseded: 'Superseded' };
  const SEVERITIES = { blocking: 'Blocking', warning: 'Warning', info: 'Information' };
  const SEVERITY_ORDER = { blocking: 0, warning: 1, info: 2 };

  // ---- small DOM helpers -------------------------------------------------------------------------------------

  function $(id) {
    return document.getElementById(id);
  }

  /** An element with attributes and children; strings become text nodes, so nothing is parsed as markup. */
  function el(tag, attrs, ...children) {
    const node = document.createElement(tag);
    for (const [key, value] of Object.entries(attrs || {})) {
      if (value === undefined || value === null || value === false) continue;
      if (key === 'class') node.className = value;
      else node.setAttribute(key, value === true ? '' : String(value));
    }
    for (const child of children) {
      if (child === undefined || child === null || child === false) continue;
      node.append(typeof child === 'number' ? String(child) : child);
    }
    return node;
  }

  function badge(kind, value, labels) {
    const known = Object.prototype.hasOwnProperty.call(labels, value);
    return el('span', { class: 'badge ' + kind + '-' + (known ? value : 'other') }, known ? labels[value] : String(value));
  }

  /** "2026-03-01T09:12:44.123456Z" -> "2026-03-01 09:12:44" (the column headings say UTC). */
  function time(iso) {
    return iso ? String(iso).replace('T', ' ').replace(/(\.\d+)?Z$/, '') : '';
  }

  function shortHash(hash) {
    return el('code', { class: 'hash', title: hash }, hash ? hash.slice(0, 10) + '…' : '–');
  }

  /** Counts per severity; compact shows only the non-zero ones (the audit table). */
  function findingCounts(counts, compact) {
    if (!counts) return el('span', { class: 'muted' }, '–');
    const box = el('span', { class: 'counts' });
    ['blocking', 'warning', 'info'].forEach(function (severity) {
      const n = counts[severity] || 0;
      if (compact && n === 0) return;
      box.append(el('span', { class: 'count' + (n > 0 ? ' severity-' + severity : ''), title: SEVERITIES[severity] }, n + ' ' + severity));
    });
    if (!box.childElementCount) box.append(el('span', { class: 'muted' }, 'none'));
    return box;
  }

  // ---- API access --------------------------------------------------------------------------------------------

  /** A refusal (or an unreachable service, status 0) with its problem+json body. */
  class ApiError extends Error {
    constructor(status, problem) {
      super((problem && (problem.detail || problem.title)) || 'HTTP ' + status);
      this.status = status;
      this.problem = problem || {};
    }
  }

  function token() {
    return sessionStorage.getItem(TOKEN_KEY);
  }

  /**
   * fetch with the stored token (or, while signing in, the candidate `bearer`); JSON, text or a blob back;
   * refusals become ApiError. A 401 on the stored token signs out.
   */
  async function request(path, options, bearer) {
    options = options || {};
    const headers = { authorization: 'Bearer ' + (bearer || token()), accept: options.accept || 'application/json' };
    if (options.body !== undefined) headers['content-type'] = 'application/json';
    let res;
    try {
      res = await fetch(path, {
        method: options.method || 'GET',
        headers: headers,
        body: options.body === undefined ? undefined : JSON.stringify(options.body),
        credentials: 'omit',
        cache: 'no-store',
        referrerPolicy: 'no-referrer',
      });
    } catch (err) {
      throw new ApiError(0, { title: 'The service could not be reached', detail: String(err && err.message ? err.message : err) });
    }
    if (!res.ok) {
      let problem = null;
      try {
        problem = await res.json();
      } catch (e) {
        problem = { title: res.statusText || 'Request refused' };
      }
      if (res.status === 401 && !bearer) signOut(problem);
      throw new ApiError(res.status, problem);
    }
    if (options.as === 'blob') return { blob: await res.blob(), disposition: res.headers.get('content-disposition') };
    if (options.as === 'text') return res.text();
    return res.json();
  }

  function api(path, options) {
    return request(path, options);
  }

  /** Shows a problem+json refusal: title and status, then each field path with its message (or the detail). */
  function showProblem(slot, err) {
    const problem = err instanceof ApiError ? err.problem : { title: 'Something went wrong', detail: String(err && err.message) };
    const box = el('div', { class: 'problem' });
    box.append(el('p', { class: 'problem-title' }, problem.title || 'Request refused', err && err.status ? el('span', { class: 'status' }, ' HTTP ' + err.status) : null));
    const errors = Array.isArray(problem.errors) ? problem.errors : [];
    if (errors.length) {
      const list = el('ul', { class: 'field-errors' });
      errors.forEach(function (issue) {
        list.append(el('li', {}, el('code', {}, String(issue.path)), ' ', String(issue.message)));
      });
      box.append(list);
    } else if (problem.detail) {
      box.append(el('p', {}, String(problem.detail)));
    }
    slot.replaceChildren(box);
  }

  function clearProblem(slot) {
    slot.replaceChildren();
  }

  /** Downloads a file fetched with the token (a blob: address, so the token is not in any link). */
  async function download(path, fallbackName, status) {
    status.textContent = 'Preparing ' + fallbackName + '…';
    try {
      const file = await request(path, { as: 'blob', accept: '*/*' });
      const match = /filename="([^"]+)"/.exec(file.disposition || '');
      const url = URL.createObjectURL(file.blob);
      const link = el('a', { href: url, download: match ? match[1] : fallbackName, hidden: true });
      document.body.append(link);
      link.click();
      link.remove();
      setTimeout(function () {
        URL.revokeObjectURL(url);
      }, 60000);
      status.textContent = 'Downloaded ' + (match ? match[1] : fallbackName) + '.';
    } catch (err) {
      status.textContent = 'Download refused: ' + err.message;
    }
  }

  // ---- sign-in -----------------------------------------------------------------------------------------------

  let started = false;

  function signOut(problem) {
    sessionStorage.removeItem(TOKEN_KEY);
    $('content').hidden = true;
    $('sign-out').hidden = true;
    $('sign-in').hidden = false;
    if (problem) showProblem($('sign-in-problem'), new ApiError(401, problem));
    $('token-input').focus();
  }

  function signedIn() {
    $('sign-in').hidden = true;
    $('sign-out').hidden = false;
    $('content').hidden = false;
    if (started) return location.reload(); // signed in again after a refusal: start afresh
    started = true;
    const page = PAGES[document.body.dataset.page];
    if (page) page();
  }

  function setUpSignIn() {
    $('sign-in-form').addEventListener('submit', async function (event) {
      event.preventDefault();
      const input = $('token-input');
      const candidate = input.value.trim();
      const slot = $('sign-in-problem');
      if (!candidate) {
        showProblem(slot, new ApiError(0, { title: 'Paste your token first' }));
        return;
      }
      try {
        await request('/api/v1/reviews/queue?limit=1', {}, candidate); // any valid token may read the queue
      } catch (err) {
        showProblem(slot, err);
        return;
      }
      sessionStorage.setItem(TOKEN_KEY, candidate);
      input.value = '';
      clearProblem(slot);
      signedIn();
    });
    $('sign-out').addEventListener('click', function () {
      sessionStorage.removeItem(TOKEN_KEY);
      location.assign('/review');
    });
  }

  /** The id in /review/revisions/:id or /review/products/:id/audit. */
  function pathId(pattern) {
    const m = pattern.exec(location.pathname);
    return m ? decodeURIComponent(m[1]) : '';
  }

  // ---- the review queue --------------------------------------------------------------------------------------

  async function queuePage() {
    try {
      const queue = await api('/api/v1/reviews/queue?limit=' + QUEUE_LIMIT);
      const body = $('queue').tBodies[0];
      body.replaceChildren();
      queue.items.forEach(function (item) {
        body.append(
          el(
            'tr',
            { 'data-revision': item.revisionId },
            el('td', {}, el('a', { href: '/review/products/' + encodeURIComponent(item.productId) + '/audit', title: 'Audit trail of ' + item.productCode }, item.productCode), el('div', { class: 'muted' }, item.productName)),
            el('td', {}, el('a', { href: '/review/revisions/' + encodeURIComponent(item.revisionId), class: 'strong' }, item.title)),
            el('td', { class: 'num' }, item.revision),
            el('td', {}, badge('verdict', item.verdict, VERDICTS)),
            el('td', {}, findingCounts(item.findings)),
            el('td', {}, item.author ? item.author.name : '–'),
            el('td', { class: 'nowrap' }, time(item.submittedAt)),
          ),
        );
      });
      $('queue').hidden = queue.items.length === 0;
      $('queue-empty').hidden = queue.items.length > 0;
      $('queue-more').hidden = queue.items.length < QUEUE_LIMIT;
    } catch (err) {
      showProblem($('queue-problem'), err);
    }
  }

  // ---- one revision ------------------------------------------------------------------------------------------

  /**
   * The report goes into a sandboxed frame (no scripts, opaque origin) through srcdoc, which inherits this page's
   * policy. Its <style> blocks get this response's style nonce, and its few style attributes (column widths)
   * become rules of one more nonce'd block, so the report looks as it does on its own. The text is edited rather
   * than parsed because a parsed document would inherit the policy too and report every style attribute as a
   * violation; the report is the service's own escaped output, so a literal `<style` or `style="` can only be markup.
   */
  function reportDocument(html) {
    const meta = document.querySelector('meta[name="leadline-style-nonce"]');
    const nonce = meta ? meta.content : '';
    const rules = [];
    return html
      .replace(/\sstyle="([^"]*)"/g, function (_attr, declarations) {
        if (/[<>{}]/.test(declarations)) return '';
        rules.push('[data-ll-style="' + rules.length + '"]{' + declarations + '}');
        return ' data-ll-style="' + (rules.length - 1) + '"';
      })
      .replace(/<\/head>/i, '<style>' + rules.join('\n') + '</style></head>')
      .replace(/<style(?=[\s>])/gi, '<style nonce="' + nonce + '"');
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
    fact(facts, 'Review state', state);
    fact(facts, 'Verdict of the rules', badge('verdict', rev.verdict, VERDICTS));
    fact(facts, 'Author', rev.author ? rev.author.name : '–');
    fact(facts, 'Submitted', time(rev.createdAt) + ' UTC');
    fact(facts, 'Engine · rule set', rev.engineVersion + ' · ' + rev.ruleSetVersion);
    fact(facts, 'Record hash', el('code', { class: 'hash wrap' }, rev.hash));
  }

  function sortedFindings(findings) {
    return findings.slice().sort(function (a, b) {
      return (SEVERITY_ORDER[a.severity] ?? 9) - (SEVERITY_ORDER[b.severity] ?? 9);
    });
  }

  function renderFindings(findings) {
    const list = $('findings');
    list.replaceChildren();
    if (findings.length === 0) list.append(el('li', { class: 'muted' }, 'No findings.'));
    sortedFindings(findings).forEach(function (f) {
      list.append(
        el(
          'li',
          { class: 'finding finding-' + (SEVERITIES[f.severity] ? f.severity : 'other'), 'data-rule': f.ruleId },
          el('div', { class: 'finding-head' }, badge('severity', f.severity, SEVERITIES), ' ', el('code', {}, f.ruleId), f.subject ? el('span', { class: 'muted' }, ' · ' + f.subject) : null),
          el('p', {}, f.message),
          f.basis ? el('p', { class: 'muted small' }, 'Basis: ' + f.basis) : null,
        ),
      );
    });
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
      const button = $('decision-submit');
      button.disabled = true;
      try {
        const result = await api('/api/v1/revisions/' + encodeURIComponent(rev.id) + '/decisions', { method: 'POST', body: body });
        $('decision').hidden = true;
        const done = $('decision-done');
        done.replaceChildren('Revision ' + rev.revision + ' ' + result.state + ' at ' + time(result.decidedAt) + ' UTC. Event hash ', el('code', { class: 'hash wrap' }, result.hash), '.');
        done.hidden = false;
        reload();
      } catch (err) {
        showProblem(slot, err);
        markInvalid(err, sentAcks, sentComments, acks);
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
      renderFindings(rev.findings);
      $('revision').hidden = false;
      if (rev.review.state === 'submitted') {
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
      frame.srcdoc = reportDocument(await api(base + '/report.html', { as: 'text', accept: 'text/html' }));
    } catch (err) {
      showProblem(problemSlot, err);
    }
  }

  // ---- a product's audit trail -------------------------------------------------------------------------------

  function auditRow(entry) {
    const revisionCell = entry.revision === null ? '–' : entry.revisionId ? el('a', { href: '/review/revisions/' + encodeURIComponent(entry.revisionId) }, String(entry.revision)) : String(entry.revision);
    return el(
      'tr',
      { 'data-type': entry.type, 'data-seq': entry.seq },
      el('td', { class: 'num' }, entry.seq),
      el('td', { class: 'nowrap' }, time(entry.time)),
      el('td', { class: 'nowrap' }, el('span', { class: 'entry entry-' + (entry.kind === 'revision' ? 'revision' : 'event') }, entry.type)),
      el('td', { class: 'actor' }, entry.actor ? entry.actor.name : '–'),
      el('td', { class: 'num' }, revisionCell),
      el('td', {}, entry.verdict ? badge('verdict', entry.verdict, VERDICTS) : ''),
      el('td', {}, entry.findings ? findingCounts(entry.findings, true) : ''),
      el('td', { class: 'summary' }, entry.summary),
      el('td', { class: 'nowrap' }, shortHash(entry.hash)),
    );
  }

  async function auditPage() {
    const id = pathId(/^\/review\/products\/([^/]+)\/audit$/);
    const base = '/api/v1/products/' + encodeURIComponent(id);
    const slot = $('audit-problem');
    let product;
    try {
      product = await api(base);
      document.title = 'Audit trail · ' + product.code + ' · Leadline';
      $('audit-heading').replaceChildren('Audit trail · ' + product.code + ' — ' + product.name);
      $('audit').hidden = false;
    } catch (err) {
      showProblem(slot, err);
      return;
    }
    const status = $('download-status');
    $('download-csv').addEventListener('click', function () {
      download(base + '/audit?format=csv', 'audit-' + product.code + '.csv', status);
    });
    $('download-json').addEventListener('click', function () {
      download(base + '/audit?format=json', 'audit-' + product.code + '.json', status);
    });

    const banner = $('chain');
    api(base + '/verify').then(
      function (v) {
        banner.className = 'banner ' + (v.valid ? 'banner-ok' : 'banner-broken');
        banner.dataset.valid = String(v.valid);
        if (v.valid) banner.replaceChildren('Hash chain intact: ' + v.links + ' links recomputed, head hash ', el('code', { class: 'hash wrap' }, v.headHash || '–'), '.');
        else {
          const b = v.firstBrokenLink;
          banner.replaceChildren('Hash chain BROKEN' + (b ? ' at seq. ' + b.seq + ' (' + b.kind + ' ' + b.id + '): ' + b.reason : '') + '. Do not rely on this trail; tell the administrator.');
        }
      },
      function (err) {
        banner.className = 'banner banner-broken';
        banner.replaceChildren('The chain could not be checked: ' + err.message);
      },
    );

    const body = $('trail').tBodies[0];
    const more = $('load-more');
    let cursor = 0;
    async function loadPage() {
      more.disabled = true;
      try {
        const page = await api(base + '/audit?after=' + cursor + '&limit=' + AUDIT_PAGE_SIZE);
        page.items.forEach(function (entry) {
          body.append(auditRow(entry));
        });
        cursor = page.nextCursor === null ? cursor : page.nextCursor;
        more.hidden = page.nextCursor === null;
      } catch (err) {
        showProblem(slot, err);
      } finally {
        more.disabled = false;
      }
    }
    more.addEventListener('click', loadPage);
    await loadPage();
  }

  const PAGES = { queue: queuePage, revision: revisionPage, audit: auditPage };

  document.addEventListener('DOMContentLoaded', function () {
    setUpSignIn();
    if (token()) signedIn();
    else signOut(null);
  });
})();

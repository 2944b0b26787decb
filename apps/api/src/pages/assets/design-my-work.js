/* My work (/design/my-work): the signed-in author's revisions by review state; withdraw while awaiting review. */
import { api } from './lib-api.js';
import { $, el } from './lib-dom.js';
import { badge, findingCounts, STATES, time, verdictBadge } from './lib-format.js';
import { showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';

const LISTS = { submitted: 'work-submitted', rejected: 'work-rejected', approved: 'work-approved', withdrawn: 'work-other', superseded: 'work-other' };

function item(r, reload) {
  const calc = '/design/calculations/' + encodeURIComponent(r.calculationId);
  const li = el(
    'li',
    { class: 'work', 'data-revision': r.revisionId, 'data-state': r.state },
    el(
      'div',
      { class: 'work-head' },
      el('a', { href: calc, class: 'strong' }, r.productCode + ' · ' + r.title + ' · revision ' + r.revision),
      ' ',
      badge('state', r.state, STATES),
      ' ',
      verdictBadge(r.verdict, r.state),
      ' ',
      findingCounts(r.findings, true),
    ),
    el('p', { class: 'muted small' }, 'Submitted ' + time(r.submittedAt) + ' UTC' + (r.decidedBy ? ' · ' + (STATES[r.state] || r.state).toLowerCase() + ' by ' + r.decidedBy.name + ' at ' + time(r.decidedAt) + ' UTC' : '') + (r.note ? ' · note: ' + r.note : '')),
  );
  if (r.comments.length) {
    const list = el('ul', { class: 'remarks', 'aria-label': "Reviewer's comments on revision " + r.revision });
    r.comments.forEach(function (c) {
      const on = c.on ? ' on ' + c.on : '';
      list.append(el('li', {}, el('strong', {}, (c.kind === 'decision' ? 'Decision comment' : 'Comment') + on + ' (' + (c.by ? c.by.name : '–') + '): '), c.text));
    });
    li.append(list);
  }
  const actions = el('p', { class: 'actions' });
  if (r.state === 'rejected' || r.state === 'approved' || r.state === 'withdrawn') {
    actions.append(el('a', { href: calc + '/revise?from=' + encodeURIComponent(r.revisionId) }, 'New revision from revision ' + r.revision));
  }
  actions.append(el('a', { href: '/review/revisions/' + encodeURIComponent(r.revisionId) }, 'Report of revision ' + r.revision));
  if (r.canWithdraw) {
    const button = el('button', { type: 'button', class: 'withdraw' }, 'Withdraw revision ' + r.revision);
    button.addEventListener('click', async function () {
      button.disabled = true;
      try {
        await api('/api/v1/revisions/' + encodeURIComponent(r.revisionId) + '/withdraw', { method: 'POST', body: {} });
        $('work-status').textContent = r.productCode + ' · ' + r.title + ' revision ' + r.revision + ' withdrawn.';
        reload();
      } catch (err) {
        showProblem($('work-problem'), err);
        button.disabled = false;
      }
    });
    actions.append(button);
  }
  li.append(actions);
  return li;
}

async function myWorkPage() {
  async function load() {
    try {
      const items = (await api('/api/v1/me/revisions?limit=500')).items;
      const lists = {};
      for (const id of new Set(Object.values(LISTS))) lists[id] = [];
      items.forEach(function (r) {
        lists[LISTS[r.state] || 'work-other'].push(item(r, load));
      });
      for (const [id, nodes] of Object.entries(lists)) {
        $(id).replaceChildren(...(nodes.length ? nodes : [el('li', { class: 'muted' }, 'None.')]));
      }
    } catch (err) {
      showProblem($('work-problem'), err);
    }
  }
  await load();
}

startPage(myWorkPage);

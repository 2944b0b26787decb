/* A product's audit trail (/review/products/:id/audit) with its hash-chain check and downloads. */
import { api, download } from './lib-api.js';
import { $, el, pathId } from './lib-dom.js';
import { badge, findingCounts, shortHash, time, VERDICTS } from './lib-format.js';
import { showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';

const AUDIT_PAGE_SIZE = 25;

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


startPage(auditPage);

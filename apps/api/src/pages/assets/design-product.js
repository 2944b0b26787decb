/*
 * One product (/design/products/:id): its calculations with the latest revision, state and verdict (and the latest
 * approved revision when a later one is not approved); the design file.
 */
import { api } from './lib-api.js';
import { designFilePanel } from './design-file-job.js';
import { $, el, fillTable, pathId } from './lib-dom.js';
import { badge, STATES, time, verdictBadge } from './lib-format.js';
import { showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';
import { rememberProduct } from './lib-recent.js';

async function productPage() {
  const id = pathId(/^\/design\/products\/([^/]+)$/);
  const slot = $('product-problem');
  try {
    const product = await api('/api/v1/products/' + encodeURIComponent(id));
    document.title = product.code + ' · Products · Leadline';
    rememberProduct(product.id);
    $('product-heading').textContent = product.code + ' — ' + product.name;
    $('product-description').textContent = product.description || '';
    $('new-calculation').setAttribute('href', '/design/products/' + encodeURIComponent(id) + '/new');
    $('audit-link').setAttribute('href', '/review/products/' + encodeURIComponent(id) + '/audit');
    designFilePanel(id);
    const latest = await Promise.all(
      product.calculations.map(async function (c) {
        const revisions = (await api('/api/v1/calculations/' + encodeURIComponent(c.id) + '/revisions')).items;
        const approved = revisions.filter(function (r) {
          return r.review.state === 'approved';
        });
        return { calculation: c, latest: revisions[revisions.length - 1], approved: approved[approved.length - 1] || null };
      }),
    );
    fillTable(
      $('calculations'),
      latest.map(function (row) {
        const r = row.latest;
        return el(
          'tr',
          { 'data-calculation': row.calculation.id },
          el('td', {}, el('a', { href: '/design/calculations/' + encodeURIComponent(row.calculation.id), class: 'strong' }, row.calculation.title)),
          el('td', { class: 'num' }, r ? r.revision : '–'),
          el('td', {}, r ? badge('state', r.review.state, STATES) : '–', approvedLine(row.approved, r)),
          el('td', {}, r ? verdictBadge(r.verdict, r.review.state) : '–'),
          el('td', {}, r && r.author ? r.author.name : '–'),
          el('td', { class: 'nowrap' }, r ? time(r.createdAt) : ''),
        );
      }),
      $('calculations-empty'),
    );
    $('product').hidden = false;
  } catch (err) {
    showProblem(slot, err);
  }
}

/** A later revision withdrawn, rejected or awaiting review does not hide that an earlier one is approved. */
function approvedLine(approved, latest) {
  if (!approved || !latest || approved.id === latest.id) return null;
  return el('span', { class: 'approved-earlier' }, el('br'), 'Revision ' + approved.revision + ': ', badge('state', 'approved', STATES));
}

startPage(productPage);

/* One product (/design/products/:id): its calculations with the latest revision, state and verdict; the design file. */
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
        return { calculation: c, latest: revisions[revisions.length - 1] };
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
          el('td', {}, r ? badge('state', r.review.state, STATES) : '–'),
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

startPage(productPage);

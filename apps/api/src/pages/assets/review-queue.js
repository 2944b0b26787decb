/* The review queue (/review): revisions awaiting review, oldest first. */
import { api } from './lib-api.js';
import { $, el } from './lib-dom.js';
import { badge, findingCounts, time, VERDICTS } from './lib-format.js';
import { showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';

const QUEUE_LIMIT = 200; // the API's largest page

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


startPage(queuePage);

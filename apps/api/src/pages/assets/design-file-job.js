/*
 * The product page's design file panel: asks a queue worker for the file (POST .../design-files, 202 with the job's
 * address), follows the job (GET /api/v1/jobs/:id) showing its progress in words and on a progress bar, and offers
 * the download when the file is ready (fetched with the session, saved from a blob: address). On opening, the page
 * finds the newest job of the product (GET .../design-files): one still waiting or running is followed again, and a
 * file ready for the record as it stands is offered, so a reload loses nothing.
 */
import { api, download } from './lib-api.js';
import { $ } from './lib-dom.js';

const POLL_MS = 1000;
/** Where each stage sits on the bar: assembling fills most of it, printing and storing the rest */
const STAGE_SPAN = { assembling: [0, 70], rendering: [70, 95], storing: [95, 100] };

function percent(progress) {
  const span = STAGE_SPAN[progress.stage] || [0, 100];
  const share = progress.total > 0 ? progress.done / progress.total : 0;
  return Math.round(span[0] + (span[1] - span[0]) * share);
}

export function designFilePanel(productId) {
  const prepare = $('prepare-design-file');
  const offer = $('download-design-file');
  const bar = $('design-file-progress');
  const status = $('download-status');
  let following = false;
  let ready = null;

  /** Shows a job's state; true when it has ended. `quiet`: found on opening the page, so focus stays where it is. */
  function show(job, quiet) {
    if (job.state === 'done') {
      bar.value = 100;
      bar.hidden = true;
      ready = job.result;
      status.textContent = 'Design file ready: ' + job.result.fileName + (job.result.reused ? ' (the record is unchanged since it was prepared)' : '') + '.';
      offer.hidden = false;
      if (!quiet) offer.focus();
      return true;
    }
    if (job.state === 'failed') {
      bar.hidden = true;
      status.textContent = 'The design file could not be prepared: ' + (job.error || 'unknown error') + '.';
      return true;
    }
    bar.hidden = false;
    if (job.progress) {
      bar.value = percent(job.progress);
      status.textContent = job.progress.message + '…';
    } else {
      bar.removeAttribute('value');
      status.textContent = job.attempts > 0 ? 'Waiting for a worker to take the design file up again…' : 'Waiting for a worker…';
    }
    return false;
  }

  async function follow(address, quiet) {
    try {
      const job = await api(address);
      if (!show(job, quiet)) setTimeout(follow, POLL_MS, address, quiet);
      else following = false;
    } catch (err) {
      following = false;
      status.textContent = 'The design file could not be followed: ' + err.message;
    }
  }

  prepare.addEventListener('click', async function () {
    if (following) {
      status.textContent = 'The design file is being prepared; its progress is shown here.';
      return;
    }
    following = true;
    ready = null;
    offer.hidden = true;
    status.textContent = 'Asking for the design file…';
    try {
      const accepted = await api('/api/v1/products/' + encodeURIComponent(productId) + '/design-files', { method: 'POST', body: {} });
      show({ state: accepted.state, attempts: 0, progress: null });
      await follow(accepted.status);
    } catch (err) {
      following = false;
      bar.hidden = true;
      status.textContent = 'The design file was refused: ' + err.message;
    }
  });

  offer.addEventListener('click', function () {
    if (ready) download(ready.href, ready.fileName, status);
  });

  // A file asked for before this page was opened (a reload, another tab): follow it, or offer it when it is current
  api('/api/v1/products/' + encodeURIComponent(productId) + '/design-files').then(function (list) {
    const newest = list.items[0];
    if (!newest || following || ready) return;
    if (newest.state === 'ready' || newest.state === 'running') {
      following = true;
      show(newest, true);
      follow(newest.status, true);
    } else if (newest.state === 'done' && newest.current) {
      show(newest, true);
    }
  }, function () {
    // nothing to resume: the panel works as before
  });
}

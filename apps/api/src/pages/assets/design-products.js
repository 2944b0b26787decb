/* Products (/design): find work (code, name, calculation title, thread size, author; latest state), register a product. */
import { api } from './lib-api.js';
import { $, el, fillTable } from './lib-dom.js';
import { time } from './lib-format.js';
import { clearFieldErrors, clearProblem, fieldErrors, showFieldErrors, showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';
import { rememberProduct } from './lib-recent.js';

const PAGE = 200;

/** What a search matched, in words (the API's matchedBy). */
const MATCHED = { code: 'code', name: 'name', calculation: 'calculation title', size: 'thread size', author: 'author' };

async function productsPage() {
  const search = $('search');
  let asked = 0;
  async function list() {
    const mine = ++asked;
    const q = search.value.trim();
    const state = $('search-state').value;
    try {
      const page = await api('/api/v1/products?limit=' + PAGE + (q ? '&q=' + encodeURIComponent(q) : '') + (state ? '&state=' + encodeURIComponent(state) : ''));
      if (mine !== asked) return; // a later search has been sent
      clearProblem($('products-problem'));
      fillTable(
        $('products'),
        page.items.map(function (p) {
          return el(
            'tr',
            { 'data-product': p.id },
            el('td', {}, el('a', { href: '/design/products/' + encodeURIComponent(p.id), class: 'strong' }, p.code)),
            el('td', {}, p.name),
            el('td', {}, (p.matchedBy || []).length ? p.matchedBy.map(function (m) { return MATCHED[m] || m; }).join(', ') : el('span', { class: 'muted' }, '–')),
            el('td', {}, time(p.createdAt)),
          );
        }),
        $('products-empty'),
      );
      $('products-count').textContent = page.total + (page.total === 1 ? ' product' : ' products') + (q ? ' match "' + q + '"' : '') + (state ? ' with a calculation ' + $('search-state').selectedOptions[0].textContent.replace(/^in any state$/, '') : '') + (page.total > PAGE ? '; the first ' + PAGE + ' are listed' : '') + '.';
    } catch (err) {
      showProblem($('products-problem'), err);
    }
  }
  let timer = null;
  search.addEventListener('input', function () {
    clearTimeout(timer);
    timer = setTimeout(list, 150);
  });
  $('search-state').addEventListener('change', list);
  $('search-form').addEventListener('submit', function (event) {
    event.preventDefault();
    list();
  });

  const form = $('register-form');
  form.addEventListener('submit', async function (event) {
    event.preventDefault();
    const slot = $('register-problem');
    clearProblem(slot);
    clearFieldErrors(form);
    const body = { code: $('p-code').value.trim(), name: $('p-name').value.trim() };
    const description = $('p-description').value.trim();
    if (description) body.description = description;
    const button = $('register-submit');
    button.disabled = true;
    try {
      const product = await api('/api/v1/products', { method: 'POST', body: body });
      rememberProduct(product.id);
      location.assign('/design/products/' + encodeURIComponent(product.id));
    } catch (err) {
      showProblem(slot, err);
      showFieldErrors(form, fieldErrors(err), function (path) {
        return form.querySelector('[data-path="' + path + '"]');
      }, { focus: true });
      button.disabled = false;
    }
  });
  await list();
}

startPage(productsPage);

/*
 * The signed-in user and the shared navigation of /review and /design. The session is the HttpOnly cookie set at
 * the sign-in page; GET /api/v1/me says who is signed in and gives the CSRF token. Without a session the page goes
 * to /sign-in and comes back here afterwards.
 */
import { request, setCsrfToken, whenUnauthorized } from './lib-api.js';
import { $ } from './lib-dom.js';

let me = null;

/** The signed-in user ({ id, name, roles }), once the page has started. */
export function currentUser() {
  return me;
}

/** To the sign-in page, which brings the user back to this page (path and query, never another site). */
function toSignIn(problem) {
  const next = location.pathname + location.search;
  const refused = problem && problem.detail && !/^sign in, or send/.test(problem.detail) ? '&refused=' + encodeURIComponent(problem.detail) : '';
  location.assign('/sign-in?next=' + encodeURIComponent(next) + refused);
}

/** Marks the navigation link of this page (aria-current, and in words for sighted users by its style). */
function markNavigation() {
  const path = location.pathname;
  let best = null;
  document.querySelectorAll('nav.pages a').forEach(function (a) {
    const href = a.getAttribute('href');
    const match = a.dataset.match ? new RegExp(a.dataset.match).test(path) : path === href;
    if (match && (!best || href.length > best.getAttribute('href').length)) best = a;
  });
  if (best) best.setAttribute('aria-current', 'page');
}

/** Reads who is signed in (or goes to sign in), then runs the page. */
export async function startPage(run) {
  whenUnauthorized(toSignIn);
  markNavigation();
  $('sign-out').addEventListener('click', async function () {
    try {
      await request('/api/v1/sessions/current', { method: 'DELETE' });
    } finally {
      location.assign('/sign-in');
    }
  });
  try {
    me = await request('/api/v1/me');
  } catch (err) {
    return; // a 401 has gone to the sign-in page already
  }
  setCsrfToken(me.csrfToken);
  $('who').textContent = 'Signed in as ' + me.name;
  $('who').hidden = false;
  $('sign-out').hidden = false;
  if (me.roles.indexOf('admin') >= 0) {
    const users = document.getElementById('nav-users');
    if (users) users.hidden = false;
  }
  $('content').hidden = false;
  run();
}

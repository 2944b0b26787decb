/*
 * Sign-in and the shared navigation of /review and /design. The token is checked against the API, kept in
 * sessionStorage and never put in a URL; the signed-in user's name and roles come from GET /api/v1/me.
 */
import { ApiError, request, token, TOKEN_KEY, whenUnauthorized } from './lib-api.js';
import { $ } from './lib-dom.js';
import { clearProblem, showProblem } from './lib-problem.js';

let started = false;
let me = null;

/** The signed-in user ({ id, name, roles }), once the page has started. */
export function currentUser() {
  return me;
}

function signOut(problem) {
  sessionStorage.removeItem(TOKEN_KEY);
  $('content').hidden = true;
  $('sign-out').hidden = true;
  $('who').hidden = true;
  $('sign-in').hidden = false;
  if (problem) showProblem($('sign-in-problem'), new ApiError(401, problem));
  $('token-input').focus();
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

async function signedIn(run) {
  $('sign-in').hidden = true;
  $('sign-out').hidden = false;
  $('content').hidden = false;
  if (started) return location.reload(); // signed in again after a refusal: start afresh
  started = true;
  try {
    me = await request('/api/v1/me');
    $('who').textContent = 'Signed in as ' + me.name;
    $('who').hidden = false;
  } catch (err) {
    return; // a 401 has signed out already
  }
  run();
}

/** Sets up sign-in and navigation, then runs the page once a token is accepted. */
export function startPage(run) {
  whenUnauthorized(signOut);
  markNavigation();
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
      await request('/api/v1/me', {}, candidate);
    } catch (err) {
      showProblem(slot, err);
      return;
    }
    sessionStorage.setItem(TOKEN_KEY, candidate);
    input.value = '';
    clearProblem(slot);
    signedIn(run);
  });
  $('sign-out').addEventListener('click', function () {
    sessionStorage.removeItem(TOKEN_KEY);
    location.assign(location.pathname.startsWith('/design') ? '/design' : '/review');
  });
  if (token()) signedIn(run);
  else signOut(null);
}

/*
 * The sign-in page: email and password (POST /api/v1/sessions sets the HttpOnly session cookie; nothing is kept in
 * script storage), activation with a one-time code, then back to the page that asked (`next`, a path on this site).
 */
import { ApiError, request } from './lib-api.js';
import { $ } from './lib-dom.js';
import { passkeysAvailable, usePasskey } from './lib-passkey.js';
import { clearProblem, showProblem } from './lib-problem.js';

/** The page to return to: a path of this site only (never another origin). */
function nextPath() {
  const next = new URLSearchParams(location.search).get('next') || '/design';
  return /^\/(?![\/\\])/.test(next) ? next : '/design';
}

function start() {
  const oidc = document.getElementById('oidc-sign-in');
  if (oidc) oidc.href = '/api/v1/auth/oidc/start?next=' + encodeURIComponent(nextPath());
  const refused = new URLSearchParams(location.search).get('refused');
  if (refused) showProblem($('sign-in-problem'), new ApiError(401, { title: 'Sign-in refused', detail: refused }));
  $('sign-in-form').addEventListener('submit', async function (event) {
    event.preventDefault();
    const slot = $('sign-in-problem');
    const email = $('email-input').value.trim();
    const password = $('password-input').value;
    if (!email || !password) {
      showProblem(slot, new ApiError(0, { title: 'Enter your email and password' }));
      return;
    }
    try {
      await request('/api/v1/sessions', { method: 'POST', body: { email: email, password: password }, public: true });
    } catch (err) {
      $('password-input').value = '';
      showProblem(slot, err);
      return;
    }
    $('password-input').value = '';
    clearProblem(slot);
    location.assign(nextPath());
  });
  setUpPasskey();
  $('activate-form').addEventListener('submit', async function (event) {
    event.preventDefault();
    const slot = $('activate-problem');
    $('activate-done').textContent = '';
    try {
      const done = await request('/api/v1/account/activate', {
        method: 'POST',
        body: { activationCode: $('code-input').value.trim(), password: $('new-password-input').value },
        public: true,
      });
      clearProblem(slot);
      $('code-input').value = '';
      $('new-password-input').value = '';
      if (done.email) $('email-input').value = done.email;
      $('activate-done').textContent = 'Password set. Sign in above with it.';
      $('password-input').focus();
    } catch (err) {
      showProblem(slot, err);
    }
  });
}

/** Sign-in with a passkey the user added on their account page (the authenticator offers it; no email needed). */
function setUpPasskey() {
  const button = $('passkey-sign-in');
  if (!passkeysAvailable()) {
    button.disabled = true;
    $('passkey-sign-in-note').textContent = 'Passkeys need HTTPS (or localhost) and a browser that supports them.';
    return;
  }
  button.addEventListener('click', async function () {
    const slot = $('sign-in-problem');
    button.disabled = true;
    try {
      const start = await request('/api/v1/sessions/passkey/options', { method: 'POST', public: true });
      const response = await usePasskey(start.options);
      await request('/api/v1/sessions/passkey', { method: 'POST', body: { challengeId: start.challengeId, response: response }, public: true });
    } catch (err) {
      showProblem(slot, err && err.name === 'NotAllowedError' ? { message: 'No passkey was used (cancelled or timed out).' } : err);
      button.disabled = false;
      return;
    }
    clearProblem(slot);
    location.assign(nextPath());
  });
}

start();

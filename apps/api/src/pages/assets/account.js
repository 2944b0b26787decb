/*
 * The signed-in user's own account: their passkeys, and adding one (options from the service, the authenticator
 * makes the key, the service checks and records it). Reads and writes only /api/v1/account/passkeys.
 */
import { api } from './lib-api.js';
import { $, el } from './lib-dom.js';
import { time } from './lib-format.js';
import { createPasskey, passkeysAvailable } from './lib-passkey.js';
import { clearProblem, showProblem } from './lib-problem.js';
import { startPage } from './lib-session.js';

async function loadPasskeys() {
  const items = (await api('/api/v1/account/passkeys')).items;
  $('passkeys-none').hidden = items.length > 0;
  $('passkey-list').replaceChildren.apply($('passkey-list'), items.map(function (k) {
    return el('li', { 'data-passkey': k.id }, k.label + ', added ' + time(k.createdAt) + ' UTC for ' + k.rpId);
  }));
}

function start() {
  const slot = $('passkey-problem');
  loadPasskeys().catch(function (err) {
    showProblem(slot, err);
  });
  if (!passkeysAvailable()) {
    $('passkey-add').disabled = true;
    $('passkey-done').textContent = 'This browser or this address cannot use passkeys (they need HTTPS, or localhost).';
    return;
  }
  $('passkey-form').addEventListener('submit', async function (event) {
    event.preventDefault();
    $('passkey-done').textContent = '';
    try {
      const start = await api('/api/v1/account/passkeys/options', { method: 'POST' });
      const response = await createPasskey(start.options);
      const label = $('passkey-label').value.trim();
      const added = await api('/api/v1/account/passkeys', { method: 'POST', body: Object.assign({ challengeId: start.challengeId, response: response }, label ? { label: label } : {}) });
      clearProblem(slot);
      $('passkey-label').value = '';
      $('passkey-done').textContent = 'Passkey "' + added.label + '" added. You can now sign in and sign decisions with it.';
      await loadPasskeys();
    } catch (err) {
      showProblem(slot, err && err.name === 'NotAllowedError' ? { message: 'The passkey was not made (cancelled or timed out).' } : err);
    }
  });
}

startPage(start);

/*
 * The admins' users page: every user with roles and status; for one user, roles, deactivation, a password reset
 * (a one-time code for the user, never a password), tokens and the identity events. Reads and writes only the
 * admin JSON API (/api/v1/users, /api/v1/identity-events).
 */
import { api } from './lib-api.js';
import { $, el, fillTable } from './lib-dom.js';
import { time } from './lib-format.js';
import { clearProblem, fieldErrors, showFieldErrors, showProblem } from './lib-problem.js';
import { currentUser, startPage } from './lib-session.js';

const ROLE_NAMES = { author: 'Design author', reviewer: 'Checking engineer', admin: 'Administrator' };
let selected = null;

const roleText = (roles) => (roles.length ? roles.map((r) => ROLE_NAMES[r] || r).join(', ') : 'No role');

async function loadUsers() {
  const slot = $('users-problem');
  try {
    const users = (await api('/api/v1/users')).items;
    clearProblem(slot);
    fillTable($('users'), users.map(function (u) {
      const button = el('button', { type: 'button', class: 'quiet', 'data-user': u.id }, 'Manage ', el('span', { class: 'visually-hidden' }, u.name));
      button.addEventListener('click', function () {
        openUser(u.id);
      });
      return el('tr', { 'data-user': u.id },
        el('td', {}, u.name), el('td', {}, u.email || '(token only)'), el('td', {}, roleText(u.roles)),
        el('td', {}, u.active ? (u.hasPassword ? 'Active' : u.email ? 'Active, not yet activated' : 'Active') : 'Deactivated'),
        el('td', {}, button));
    }));
    return users;
  } catch (err) {
    showProblem(slot, err);
    return [];
  }
}

async function openUser(id) {
  const users = await loadUsers();
  const user = users.find((u) => u.id === id);
  if (!user) return;
  selected = user;
  $('manage').hidden = false;
  $('manage-heading').textContent = user.name + (user.email ? ' (' + user.email + ')' : '');
  document.querySelectorAll('#roles-form input[name="role"]').forEach(function (box) {
    box.checked = user.roles.indexOf(box.value) >= 0;
  });
  $('toggle-active').textContent = user.active ? 'Deactivate' : 'Reactivate';
  $('password-reset').disabled = !user.email || !user.active;
  $('issue-token').disabled = !user.active;
  const me = currentUser();
  if (me && me.id === user.id) $('toggle-active').disabled = true;
  else $('toggle-active').disabled = false;
  await Promise.all([loadTokens(), loadEvents()]);
  $('manage-heading').focus();
}

async function loadTokens() {
  const tokens = (await api('/api/v1/users/' + encodeURIComponent(selected.id) + '/tokens')).items;
  fillTable($('tokens'), tokens.map(function (t) {
    const status = t.revoked ? 'Revoked' : t.expired ? 'Expired' : 'Live';
    const cell = el('td', {});
    if (status === 'Live') {
      const revoke = el('button', { type: 'button', class: 'quiet' }, 'Revoke ', el('span', { class: 'visually-hidden' }, t.label || 'token'));
      revoke.addEventListener('click', function () {
        act('/api/v1/users/' + encodeURIComponent(selected.id) + '/tokens/' + encodeURIComponent(t.id) + '/revoke', 'Token revoked.');
      });
      cell.append(revoke);
    }
    return el('tr', {}, el('td', {}, t.label || '(no label)'), el('td', {}, time(t.createdAt)), el('td', {}, time(t.expiresAt)), el('td', {}, status), cell);
  }), $('tokens-empty'));
}

async function loadEvents() {
  const events = (await api('/api/v1/identity-events?limit=50&user=' + encodeURIComponent(selected.id))).items;
  $('events').replaceChildren(...events.map(function (e) {
    const what = e.data && e.data.role ? e.type + ' (' + e.data.role + ')' : e.type;
    return el('li', {}, time(e.createdAt) + ' UTC · ' + what + ' · by ' + (e.actorName || 'the service'));
  }));
}

/** A POST on the selected user, then the page reloaded; `say` is what the status line tells. */
async function act(path, say, body) {
  const slot = $('manage-problem');
  try {
    const result = await api(path, { method: 'POST', body: body });
    clearProblem(slot);
    // the panel is read again first: the status line changes only once the page shows the new state
    await openUser(selected.id);
    $('manage-status').replaceChildren(...(typeof say === 'function' ? say(result) : [say]));
  } catch (err) {
    showProblem(slot, err);
  }
}

function run() {
  loadUsers();
  $('roles-form').addEventListener('submit', function (event) {
    event.preventDefault();
    const roles = Array.from(document.querySelectorAll('#roles-form input[name="role"]:checked')).map((b) => b.value);
    act('/api/v1/users/' + encodeURIComponent(selected.id) + '/roles', 'Roles saved: ' + roleText(roles) + '.', { roles: roles });
  });
  $('toggle-active').addEventListener('click', function () {
    const off = selected.active;
    act('/api/v1/users/' + encodeURIComponent(selected.id) + (off ? '/deactivate' : '/reactivate'), off ? 'Deactivated: tokens and sessions stop now.' : 'Reactivated.');
  });
  $('password-reset').addEventListener('click', function () {
    act('/api/v1/users/' + encodeURIComponent(selected.id) + '/password-reset', function (r) {
      return ['Password reset started. Hand this one-time code to the user (shown once, valid until ' + time(r.activationExpiresAt) + ' UTC): ', el('code', { id: 'reset-code' }, r.activationCode)];
    });
  });
  $('issue-token').addEventListener('click', function () {
    act('/api/v1/users/' + encodeURIComponent(selected.id) + '/tokens', function (r) {
      return ['Token issued (shown once; it reads and submits for the user, and never decides): ', el('code', { id: 'issued-token', class: 'wrap' }, r.token)];
    }, { label: 'issued on the users page' });
  });
  $('create-form').addEventListener('submit', async function (event) {
    event.preventDefault();
    const slot = $('create-problem');
    const form = $('create-form');
    const body = {
      name: $('u-name').value.trim(),
      email: $('u-email').value.trim(),
      roles: Array.from(document.querySelectorAll('#create-form input[name="new-role"]:checked')).map((b) => b.value),
    };
    try {
      const created = await api('/api/v1/users', { method: 'POST', body: body });
      clearProblem(slot);
      showFieldErrors(form, [], () => null);
      form.reset();
      const done = $('create-done');
      done.replaceChildren('Created ' + created.name + '. One-time activation code (shown once, valid until ' + time(created.activationExpiresAt) + ' UTC): ', el('code', { id: 'activation-code' }, created.activationCode));
      done.hidden = false;
      loadUsers();
    } catch (err) {
      showProblem(slot, err);
      showFieldErrors(form, fieldErrors(err), function (path) {
        const root = path.split('.')[0];
        const node = form.querySelector('[data-path="' + root + '"]');
        return node && node.tagName === 'FIELDSET' ? node.querySelector('input') : node;
      }, { focus: true });
    }
  });
}

startPage(run);

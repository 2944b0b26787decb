/*
 * The API client of every page. The pages are signed in by the HttpOnly session cookie the browser sends by itself
 * (no credential in script storage or a web address); every state-changing request carries the session's CSRF token
 * (from GET /api/v1/me) in the X-CSRF-Token header.
 */
import { el } from './lib-dom.js';

let csrf = null;

/** The session's CSRF token, once GET /api/v1/me has given it (lib-session.js). */
export function setCsrfToken(value) {
  csrf = value;
}

/** A refusal (or an unreachable service, status 0) with its problem+json body. */
export class ApiError extends Error {
  constructor(status, problem) {
    super((problem && (problem.detail || problem.title)) || 'HTTP ' + status);
    this.status = status;
    this.problem = problem || {};
  }
}

let onUnauthorized = function () {};

/** What to do when the session is refused (the session module goes to the sign-in page). */
export function whenUnauthorized(handler) {
  onUnauthorized = handler;
}

/**
 * fetch with the session cookie; JSON, text or a blob back; refusals become ApiError. A 401 goes to the sign-in
 * page (except for the sign-in requests themselves, `public: true`). options: method, body, headers, accept,
 * as ('json' | 'text' | 'blob'), signal, public.
 */
export async function request(path, options) {
  options = options || {};
  const method = options.method || 'GET';
  const headers = Object.assign({ accept: options.accept || 'application/json' }, options.headers || {});
  if (options.body !== undefined) headers['content-type'] = 'application/json';
  if (method !== 'GET' && method !== 'HEAD' && csrf) headers['x-csrf-token'] = csrf;
  let res;
  try {
    res = await fetch(path, {
      method: method,
      headers: headers,
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      credentials: 'same-origin',
      cache: 'no-store',
      referrerPolicy: 'no-referrer',
      signal: options.signal,
    });
  } catch (err) {
    if (err && err.name === 'AbortError') throw err;
    throw new ApiError(0, { title: 'The service could not be reached', detail: String(err && err.message ? err.message : err) });
  }
  if (!res.ok) {
    let problem = null;
    try {
      problem = await res.json();
    } catch (e) {
      problem = { title: res.statusText || 'Request refused' };
    }
    if (res.status === 401 && !options.public) onUnauthorized(problem);
    throw new ApiError(res.status, problem);
  }
  if (res.status === 204) return null;
  if (options.as === 'blob') return { blob: await res.blob(), disposition: res.headers.get('content-disposition') };
  if (options.as === 'text') return res.text();
  return res.json();
}

export function api(path, options) {
  return request(path, options);
}

/** An id for the Idempotency-Key header: one per intended submission, so a double click stores one record. */
export function newIdempotencyKey() {
  return 'page-' + crypto.randomUUID();
}

/** Downloads a file fetched with the session (saved from a blob: address). */
export async function download(path, fallbackName, status) {
  status.textContent = 'Preparing ' + fallbackName + '…';
  try {
    const file = await request(path, { as: 'blob', accept: '*/*' });
    const match = /filename="([^"]+)"/.exec(file.disposition || '');
    saveBlob(file.blob, match ? match[1] : fallbackName);
    status.textContent = 'Downloaded ' + (match ? match[1] : fallbackName) + '.';
  } catch (err) {
    status.textContent = 'Download refused: ' + err.message;
  }
}

/** Saves a blob under a file name through a temporary blob: link. */
export function saveBlob(blob, name) {
  const url = URL.createObjectURL(blob);
  const link = el('a', { href: url, download: name, hidden: true });
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(function () {
    URL.revokeObjectURL(url);
  }, 60000);
}

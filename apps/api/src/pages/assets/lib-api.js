/*
 * The API client of every page. The bearer token lives in sessionStorage (this tab only) and travels only in
 * the Authorization header: never in a cookie, a web address or a log line.
 */
import { el } from './lib-dom.js';

export const TOKEN_KEY = 'leadline.reviewToken';

/** A refusal (or an unreachable service, status 0) with its problem+json body. */
export class ApiError extends Error {
  constructor(status, problem) {
    super((problem && (problem.detail || problem.title)) || 'HTTP ' + status);
    this.status = status;
    this.problem = problem || {};
  }
}

export function token() {
  return sessionStorage.getItem(TOKEN_KEY);
}

let onUnauthorized = function () {};

/** What to do when the stored token is refused (the session module signs out). */
export function whenUnauthorized(handler) {
  onUnauthorized = handler;
}

/**
 * fetch with the stored token (or, while signing in, the candidate `bearer`); JSON, text or a blob back;
 * refusals become ApiError. A 401 on the stored token signs out. options: method, body, headers, accept,
 * as ('json' | 'text' | 'blob'), signal.
 */
export async function request(path, options, bearer) {
  options = options || {};
  const headers = Object.assign({ authorization: 'Bearer ' + (bearer || token()), accept: options.accept || 'application/json' }, options.headers || {});
  if (options.body !== undefined) headers['content-type'] = 'application/json';
  let res;
  try {
    res = await fetch(path, {
      method: options.method || 'GET',
      headers: headers,
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      credentials: 'omit',
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
    if (res.status === 401 && !bearer) onUnauthorized(problem);
    throw new ApiError(res.status, problem);
  }
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

/** Downloads a file fetched with the token (a blob: address, so the token is not in any link). */
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

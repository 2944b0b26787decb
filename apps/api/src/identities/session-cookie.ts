/**
 * The page session cookie: `<secret>.<seen>.<mac>`. The secret (32 random bytes) identifies the session (only its
 * SHA-256 is stored); `seen` is the time of the session's last request [ms], sealed with the session's own key
 * (HMAC-SHA256, RFC 2104) so that the idle time-out cannot be stretched by the client. HttpOnly, SameSite=Strict,
 * Path=/, Secure when the request came over HTTPS; no Max-Age (it ends with the browser). The CSRF token is an HMAC
 * of the same key: the page reads it from GET /api/v1/me and sends it as X-CSRF-Token.
 */
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';

export const SESSION_COOKIE = 'leadline_session';
export const CSRF_HEADER = 'x-csrf-token';

export const newSessionSecret = (): string => randomBytes(32).toString('base64url');
export const newSealKey = (): string => randomBytes(32).toString('base64url');
export const hashSecret = (secret: string): string => createHash('sha256').update(secret, 'utf8').digest('hex');

const mac = (key: string, text: string): string => createHmac('sha256', Buffer.from(key, 'base64url')).update(text, 'utf8').digest('base64url');

export function sealCookie(secret: string, seen: number, key: string): string {
  return `${secret}.${seen}.${mac(key, `${secret}.${seen}`)}`;
}

/** The cookie's parts, before the session (and so its key) is known. */
export function readCookie(value: string): { secret: string; seen: number; tag: string } | null {
  const m = /^([A-Za-z0-9_-]{43})\.(\d{1,16})\.([A-Za-z0-9_-]{43})$/.exec(value);
  return m ? { secret: m[1], seen: Number(m[2]), tag: m[3] } : null;
}

export function sameText(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

export function cookieSealedBy(cookie: { secret: string; seen: number; tag: string }, key: string): boolean {
  return sameText(mac(key, `${cookie.secret}.${cookie.seen}`), cookie.tag);
}

export function csrfToken(key: string): string {
  return mac(key, 'csrf');
}

/** One cookie's value from a Cookie header (RFC 6265 §5.4), or null. */
export function cookieValue(header: string | undefined, name: string): string | null {
  if (!header) return null;
  for (const part of header.split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim();
  }
  return null;
}

export function setCookieHeader(name: string, value: string, secure: boolean, sameSite: 'Strict' | 'Lax' = 'Strict', maxAgeSeconds?: number): string {
  return [`${name}=${value}`, 'Path=/', 'HttpOnly', `SameSite=${sameSite}`, ...(secure ? ['Secure'] : []), ...(maxAgeSeconds !== undefined ? [`Max-Age=${maxAgeSeconds}`] : [])].join('; ');
}

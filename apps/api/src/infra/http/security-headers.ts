/**
 * Headers every response carries: X-Content-Type-Options: nosniff, so a browser never reads a JSON body, a CSV
 * download or a problem+json answer as HTML or script. API answers (/api/v1/..., /health) also carry
 * Cache-Control: no-store, so no browser or proxy keeps a record, a report or a newly issued token (RFC 9111,
 * 5.2.2.5). The HTML report adds its own sandboxing policy (REPORT_CSP); the reviewer pages set theirs in pages/;
 * the OpenAPI pages under /api/docs get DOCS_CSP.
 */
import type { FastifyInstance } from 'fastify';

/**
 * The report.html policy: a static document. No script runs (sandbox without allow-scripts gives it an opaque
 * origin too), nothing loads from anywhere except data: images; its inline <style> and SVG charts render.
 */
export const REPORT_CSP = [
  "default-src 'none'",
  "style-src 'unsafe-inline'",
  'img-src data:',
  "font-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
  'sandbox',
].join('; ');

/**
 * The OpenAPI pages' policy (Swagger UI): its scripts and stylesheet from this origin only, its inline styles and
 * data: icons, fetches of the OpenAPI document from this origin; nothing else loads, nothing frames it.
 */
export const DOCS_CSP = [
  "default-src 'none'",
  "script-src 'self'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data:",
  "connect-src 'self'",
  "font-src 'self'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

const isApi = (path: string) => path.startsWith('/api/v1/') || path === '/api/v1' || path === '/health';
const isDocs = (path: string) => path === '/api/docs' || (path.startsWith('/api/docs/') && path !== '/api/docs-json');

export function addSecurityHeaders(fastify: FastifyInstance): void {
  fastify.addHook('onSend', async (request, reply, payload) => {
    if (!reply.hasHeader('x-content-type-options')) reply.header('x-content-type-options', 'nosniff');
    const path = request.url.split('?')[0];
    if (isApi(path)) reply.header('cache-control', 'no-store');
    else if (isDocs(path) && !reply.hasHeader('content-security-policy')) reply.header('content-security-policy', DOCS_CSP);
    return payload;
  });
}

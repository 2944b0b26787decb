/**
 * Headers every response carries: X-Content-Type-Options: nosniff, so a browser never reads a JSON body, a CSV
 * download or a problem+json answer as HTML or script. The HTML report adds its own sandboxing policy
 * (REPORT_CSP); the reviewer pages set theirs in pages/.
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

export function addSecurityHeaders(fastify: FastifyInstance): void {
  fastify.addHook('onSend', async (_request, reply, payload) => {
    if (!reply.hasHeader('x-content-type-options')) reply.header('x-content-type-options', 'nosniff');
    return payload;
  });
}

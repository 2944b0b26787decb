/**
 * The OpenAPI document, generated from the zod request and response schemas (zod's own JSON Schema output),
 * served at /api/docs (UI) and /api/docs-json.
 */
import type { INestApplication } from '@nestjs/common';
import { SwaggerModule, type OpenAPIObject } from '@nestjs/swagger';
import {
  calculationSchema, chainVerificationSchema, designInputSchema, evaluationResponseSchema, problemSchema, productSchema,
  revisionRecordSchema, submissionResultSchema,
} from '@leadline/contracts';
import { z, type ZodType } from 'zod';
import { addRevisionSchema, openCalculationSchema } from '../calculations/calculations.service';
import { createProductSchema } from '../products/products.service';

const json = (schema: ZodType, io: 'input' | 'output') => z.toJSONSchema(schema, { io, target: 'openapi-3.0', unrepresentable: 'any' });

interface Route {
  method: 'get' | 'post';
  path: string;
  summary: string;
  tag: string;
  request?: ZodType;
  response?: ZodType;
  status?: number;
  idempotent?: boolean;
}

export const ROUTES: Route[] = [
  { method: 'post', path: '/api/v1/evaluations', summary: 'Evaluate a design (stateless, nothing stored)', tag: 'evaluations', request: designInputSchema, response: evaluationResponseSchema, status: 200 },
  { method: 'post', path: '/api/v1/products', summary: 'Register a product', tag: 'products', request: createProductSchema, response: productSchema, status: 201 },
  { method: 'get', path: '/api/v1/products', summary: 'List products (limit, offset)', tag: 'products', response: z.object({ items: z.array(productSchema), total: z.number(), limit: z.number(), offset: z.number() }) },
  { method: 'get', path: '/api/v1/products/{id}', summary: 'One product with its calculations', tag: 'products', response: productSchema.extend({ calculations: z.array(calculationSchema) }) },
  { method: 'get', path: '/api/v1/products/{id}/verify', summary: "Recompute the product's hash chain", tag: 'records', response: chainVerificationSchema },
  { method: 'post', path: '/api/v1/products/{id}/calculations', summary: 'Open a calculation with revision 1', tag: 'calculations', request: openCalculationSchema.extend({ design: designInputSchema }), response: submissionResultSchema, status: 201, idempotent: true },
  { method: 'get', path: '/api/v1/calculations/{id}', summary: 'One calculation', tag: 'calculations', response: calculationSchema },
  { method: 'post', path: '/api/v1/calculations/{id}/revisions', summary: 'Submit the next revision', tag: 'calculations', request: addRevisionSchema.extend({ design: designInputSchema }), response: submissionResultSchema, status: 201, idempotent: true },
  { method: 'get', path: '/api/v1/calculations/{id}/revisions', summary: 'All revisions of a calculation', tag: 'calculations', response: z.object({ items: z.array(revisionRecordSchema) }) },
  { method: 'get', path: '/api/v1/revisions/{id}', summary: 'One revision: input as submitted, evaluation, findings, versions, hashes', tag: 'calculations', response: revisionRecordSchema },
  { method: 'get', path: '/api/v1/thread-sizes', summary: 'Standard thread sizes', tag: 'library' },
  { method: 'get', path: '/api/v1/friction-sources', summary: 'Friction coefficient ranges with their sources', tag: 'library' },
  { method: 'get', path: '/api/v1/materials', summary: 'Screw and nut materials', tag: 'library' },
  { method: 'get', path: '/health', summary: 'Database reachable', tag: 'health' },
];

export function buildOpenApi(routes: Route[] = ROUTES): OpenAPIObject {
  const paths: Record<string, Record<string, unknown>> = {};
  const problem = { 'application/problem+json': { schema: json(problemSchema, 'output') } };
  for (const r of routes) {
    const params = [...r.path.matchAll(/\{(\w+)\}/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string', format: 'uuid' } }));
    if (r.idempotent) params.push({ name: 'Idempotency-Key', in: 'header', required: false, schema: { type: 'string' } } as never);
    paths[r.path] ??= {};
    paths[r.path][r.method] = {
      summary: r.summary,
      tags: [r.tag],
      parameters: params,
      ...(r.request ? { requestBody: { required: true, content: { 'application/json': { schema: json(r.request, 'input') } } } } : {}),
      responses: {
        [String(r.status ?? 200)]: { description: 'success', content: { 'application/json': { schema: r.response ? json(r.response, 'output') : {} } } },
        '4XX': { description: 'problem details (RFC 9457) with the invalid field paths', content: problem },
      },
    };
  }
  return {
    openapi: '3.0.3',
    info: { title: 'Leadline API', version: '1', description: 'Power-screw design review: evaluations, immutable calculation records, rules, reviews, reports.' },
    paths: paths as OpenAPIObject['paths'],
    components: { securitySchemes: { bearer: { type: 'http', scheme: 'bearer' } } },
    security: [{ bearer: [] }],
  };
}

export function mountOpenApi(app: INestApplication, routes: Route[] = ROUTES): void {
  SwaggerModule.setup('api/docs', app, buildOpenApi(routes), { jsonDocumentUrl: 'api/docs-json' });
}

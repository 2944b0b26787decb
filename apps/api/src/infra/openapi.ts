/**
 * The OpenAPI document, generated from the zod request and response schemas (zod's own JSON Schema output),
 * served at /api/docs (UI) and /api/docs-json.
 */
import type { INestApplication } from '@nestjs/common';
import { SwaggerModule, type OpenAPIObject } from '@nestjs/swagger';
import {
  calculationSchema, chainVerificationSchema, designInputSchema, evaluationResponseSchema, identityVerificationSchema,
  problemSchema, productSchema, revisionDetailSchema, revisionReviewSchema, revisionWithChecksSchema, submissionResultSchema,
} from '@leadline/contracts';
import { sizingRequestSchema, sizingResponseSchema } from '@leadline/contracts';
import { z, type ZodType } from 'zod';
import { ruleSetDefinitionSchema } from '@leadline/rules';
import { checkpointSchema } from '../checkpoints/checkpoints.service';
import { addRevisionSchema, openCalculationSchema, reassignSchema, revisionsQuerySchema } from '../calculations/calculations.service';
import { draftSchema, saveDraftSchema } from '../calculations/drafts.service';
import { auditQuerySchema } from '../reviews/audit.service';
import { createTokenSchema, createUserSchema, identityEventsQuerySchema, setRolesSchema } from '../identities/identities.service';
import { activateSchema, signInSchema } from '../identities/accounts.service';
import { passkeySignInSchema, registerPasskeySchema } from '../identities/passkeys.service';
import { createProductSchema, productListSchema } from '../products/products.service';
import { commentSchema, decisionSchema, withdrawSchema } from '../reviews/reviews.service';
import { htmlQuerySchema } from '../reports/reports.controller';
import { impactSchema } from '../rules/impact.service';
import { recheckResponseSchema, recheckSchema } from '../rules/recheck.service';
import { adoptSchema } from '../rules/rule-sets.service';
import { mailPreferenceSchema } from '../notifications/mail.service';
import { createEndpointSchema } from '../webhooks/webhooks.service';
import { designFileAcceptedSchema, designFileJobListSchema, designFileJobSchema, designFileRequestSchema } from '../design-file/design-file-jobs.service';

const json = (schema: ZodType, io: 'input' | 'output') => z.toJSONSchema(schema, { io, target: 'openapi-3.0', unrepresentable: 'any' });

interface Route {
  method: 'get' | 'post' | 'put' | 'delete';
  path: string;
  summary: string;
  tag: string;
  request?: ZodType;
  response?: ZodType;
  status?: number;
  idempotent?: boolean;
  /** Query parameters, from a zod object schema */
  query?: z.ZodObject;
  /** Media types of the success answer (default application/json) */
  produces?: string[];
  /** Answered without a bearer token (@Public() on the handler) */
  public?: boolean;
}

/** A light revision item (GET /calculations/{id}/revisions?view=summary). */
const revisionSummarySchema = z.object({
  id: z.string().uuid(), calculationId: z.string().uuid(), revision: z.number().int(), verdict: z.enum(['blocked', 'needs-acknowledgement', 'clear']),
  author: z.object({ id: z.string(), name: z.string() }).nullable(), note: z.string().nullable(), createdAt: z.string(), hash: z.string(),
  previousHash: z.string().nullable(), review: revisionReviewSchema,
});

export const ROUTES: Route[] = [
  { method: 'post', path: '/api/v1/evaluations', summary: 'Evaluate a design (stateless, nothing stored)', tag: 'evaluations', request: designInputSchema, response: evaluationResponseSchema, status: 200 },
  { method: 'post', path: '/api/v1/sizing', summary: 'Search the standard sizes for screws that pass stated requirements, ranked, with the rules that stopped the rest (stateless)', tag: 'sizing', request: sizingRequestSchema, response: sizingResponseSchema, status: 200 },
  { method: 'post', path: '/api/v1/products', summary: 'Register a product', tag: 'products', request: createProductSchema, response: productSchema, status: 201 },
  {
    method: 'get', path: '/api/v1/products', summary: 'List and search products (limit, offset; q: code, name, calculation title, thread size or author contains; state: latest revision of a calculation in this review state)', tag: 'products',
    query: productListSchema,
    response: z.object({
      items: z.array(productSchema.extend({ matchedBy: z.array(z.enum(['code', 'name', 'calculation', 'size', 'author'])).describe('what q matched (empty without q)') })),
      total: z.number(), limit: z.number(), offset: z.number(),
    }),
  },
  { method: 'get', path: '/api/v1/products/{id}', summary: 'One product with its calculations', tag: 'products', response: productSchema.extend({ calculations: z.array(calculationSchema) }) },
  { method: 'post', path: '/api/v1/evaluations/charts', summary: "The report's torque-friction and column charts (SVG) of an unsaved design (?units=SI|US); nothing stored", tag: 'evaluations', request: designInputSchema, response: z.object({ unitSystem: z.enum(['SI', 'US']), torqueFriction: z.string(), column: z.string().nullable() }), status: 200 },
  {
    method: 'post', path: '/api/v1/products/{id}/design-files', tag: 'reports', request: designFileRequestSchema, response: designFileAcceptedSchema, status: 202,
    summary: 'Render the design file in the background (a queue worker on any instance): 202 with the job\'s address in the Location header and the body\'s status; a file of the same record (chain head hash) is reused',
  },
  { method: 'get', path: '/api/v1/products/{id}/design-files', summary: "The product's newest design-file jobs (five), newest first: state, progress, the file when done and whether it prints the record as it stands", tag: 'reports', response: designFileJobListSchema },
  { method: 'get', path: '/api/v1/jobs/{id}', summary: 'A queued design file: state, progress and, when done, the file\'s href', tag: 'reports', response: designFileJobSchema },
  { method: 'get', path: '/api/v1/products/{id}/design-files/{fileId}', summary: 'A design file a worker rendered (the href of its job\'s result)', tag: 'reports', produces: ['application/pdf'] },
  { method: 'get', path: '/api/v1/products/{id}/design-file.pdf', summary: "Design file, PDF: cover sheet, each calculation's latest approved report, audit trail, hash-chain check (?paper=A4|Letter)", tag: 'reports', produces: ['application/pdf'] },
  {
    method: 'get', path: '/api/v1/me', summary: 'The signed-in user: id, name, roles, how they authenticated, and (page sessions) the CSRF token to send as X-CSRF-Token', tag: 'identities',
    response: z.object({ id: z.string().uuid(), name: z.string(), roles: z.array(z.string()), authMethod: z.enum(['token', 'password', 'oidc']), csrfToken: z.string().nullable() }),
  },
  { method: 'get', path: '/api/v1/me/revisions', summary: "The signed-in author's revisions, newest first, with review state, decision and reviewers' comments (?state=, ?limit=)", tag: 'reviews' },
  { method: 'get', path: '/api/v1/products/{id}/verify', summary: "Recompute the product's hash chain", tag: 'records', response: chainVerificationSchema },
  { method: 'post', path: '/api/v1/products/{id}/calculations', summary: 'Open a calculation with revision 1', tag: 'calculations', request: openCalculationSchema.extend({ design: designInputSchema }), response: submissionResultSchema, status: 201, idempotent: true },
  { method: 'get', path: '/api/v1/calculations/{id}', summary: 'One calculation', tag: 'calculations', response: calculationSchema },
  { method: 'post', path: '/api/v1/calculations/{id}/revisions', summary: "Submit the next revision (409 naming the previous revision when the design equals its design)", tag: 'calculations', request: addRevisionSchema.extend({ design: designInputSchema }), response: submissionResultSchema, status: 201, idempotent: true },
  { method: 'put', path: '/api/v1/calculations/{id}/draft', summary: "Save the owner's draft of the design (validated as a submission's; stored insert-only, the newest wins; never reviewed)", tag: 'calculations', request: saveDraftSchema.extend({ design: designInputSchema }), response: draftSchema, status: 200 },
  { method: 'get', path: '/api/v1/calculations/{id}/draft', summary: "The owner's newest draft of the design, and whether it equals the latest revision's (404 when none)", tag: 'calculations', response: draftSchema },
  { method: 'post', path: '/api/v1/calculations/{id}/reassignments', summary: 'Hand a calculation to another author (admin; a chained event); only its owner may submit revisions (403 otherwise)', tag: 'calculations', request: reassignSchema, status: 201 },
  {
    method: 'get', path: '/api/v1/calculations/{id}/revisions', summary: "A calculation's revisions, oldest first, cursor-paged (after, limit; view=summary gives light items)", tag: 'calculations',
    query: revisionsQuerySchema,
    response: z.object({
      items: z.array(z.union([revisionWithChecksSchema, revisionSummarySchema])),
      nextCursor: z.number().int().nullable().describe('the last revision number of this page when more follow, else null'),
    }),
  },
  { method: 'get', path: '/api/v1/revisions/{id}', summary: 'One revision: input as submitted (and each of its fields in words), evaluation, findings, versions, hashes', tag: 'calculations', response: revisionDetailSchema },
  { method: 'get', path: '/api/v1/thread-sizes', summary: 'Standard thread sizes', tag: 'library' },
  { method: 'get', path: '/api/v1/friction-sources', summary: 'Friction coefficient ranges with their sources', tag: 'library' },
  { method: 'get', path: '/api/v1/materials', summary: 'Screw and nut materials', tag: 'library' },
  { method: 'post', path: '/api/v1/revisions/{id}/decisions', summary: "Approve or reject: an electronic signature with the decider's own credential (signature), by a reviewer who is not the author, with their own session or self-issued token; warnings acknowledged; no blocking findings", tag: 'reviews', request: decisionSchema, status: 201 },
  { method: 'post', path: '/api/v1/revisions/{id}/comments', summary: 'Comment, general or on an input field (target.field), a finding (target.finding) or a result (target.result: one of the revision\'s checks); answers the event and `on`, what the comment is on in words', tag: 'reviews', request: commentSchema, status: 201 },
  { method: 'post', path: '/api/v1/revisions/{id}/withdraw', summary: 'Withdraw by the author before a decision', tag: 'reviews', request: withdrawSchema.unwrap() },
  { method: 'get', path: '/api/v1/reviews/queue', summary: 'Revisions awaiting review, oldest first (productId, calculationId, verdict, authorId)', tag: 'reviews' },
  { method: 'get', path: '/api/v1/products/{id}/audit', summary: 'Audit trail (after, limit; format=csv|json downloads the whole trail, streamed)', tag: 'reviews', query: auditQuerySchema, produces: ['application/json', 'text/csv'] },
  { method: 'get', path: '/api/v1/revisions/{id}/diff', summary: 'What changed against ?against=<revision id>', tag: 'reviews' },
  { method: 'get', path: '/api/v1/revisions/{id}/report.html', summary: 'Calculation report, HTML: a whole document, or (part=embedded) a fragment a page puts inside itself (styles nested under .report-doc with the page\'s styleNonce, ids prefixed with idPrefix)', tag: 'reports', query: htmlQuerySchema, produces: ['text/html'] },
  { method: 'get', path: '/api/v1/revisions/{id}/report.pdf', summary: 'Calculation report, PDF (?paper=A4|Letter)', tag: 'reports', produces: ['application/pdf'] },
  { method: 'get', path: '/api/v1/rule-sets', summary: 'Rule-set versions, the current one, the rules and adoptions', tag: 'rules' },
  { method: 'post', path: '/api/v1/rule-sets', summary: 'Create a new rule-set version (never edits one)', tag: 'rules', request: ruleSetDefinitionSchema, status: 201 },
  { method: 'get', path: '/api/v1/rule-sets/{version}', summary: 'One rule-set version', tag: 'rules' },
  { method: 'post', path: '/api/v1/rule-sets/{version}/impact', summary: 'Which revisions would change verdict under this version', tag: 'rules', request: impactSchema },
  { method: 'post', path: '/api/v1/rule-sets/recheck', summary: 'Re-check latest and approved revisions with the current engine and adopted rule set (nothing is written)', tag: 'rules', request: recheckSchema, response: recheckResponseSchema },
  { method: 'post', path: '/api/v1/rule-sets/{version}/adopt', summary: 'Judge new submissions by this version', tag: 'rules', request: adoptSchema.unwrap() },
  { method: 'post', path: '/api/v1/users', summary: 'Create a user with email and roles; the answer carries a one-time activationCode, never a password (admin)', tag: 'identities', request: createUserSchema, status: 201 },
  { method: 'get', path: '/api/v1/users', summary: 'List users (admin)', tag: 'identities' },
  { method: 'post', path: '/api/v1/users/{id}/roles', summary: 'Set the roles a user holds; each grant and revocation is an identity event (admin)', tag: 'identities', request: setRolesSchema },
  { method: 'post', path: '/api/v1/users/{id}/deactivate', summary: 'Deactivate a user: tokens and sessions stop at once; never deleted or renamed (admin)', tag: 'identities' },
  { method: 'post', path: '/api/v1/users/{id}/reactivate', summary: 'Reactivate a user (admin)', tag: 'identities' },
  { method: 'post', path: '/api/v1/users/{id}/password-reset', summary: 'A one-time code with which the user sets a new password; the admin never learns it (admin)', tag: 'identities', status: 201 },
  { method: 'post', path: '/api/v1/sessions', summary: 'Sign in with {email, password}: sets the HttpOnly session cookie of the pages (no token needed)', tag: 'identities', request: signInSchema, status: 201 },
  { method: 'delete', path: '/api/v1/sessions/current', summary: 'Sign out of the current page session (X-CSRF-Token required)', tag: 'identities', status: 204 },
  { method: 'post', path: '/api/v1/account/activate', summary: 'Set your own password with the one-time {activationCode} an admin handed over (no token needed)', tag: 'identities', request: activateSchema },
  { method: 'post', path: '/api/v1/account/tokens', summary: 'Issue a token to yourself for an API client, from a signed-in page session (returned once)', tag: 'identities', request: createTokenSchema.unwrap(), status: 201 },
  { method: 'get', path: '/api/v1/account/passkeys', summary: 'Your own passkeys (label, credential id, relying party, when added)', tag: 'identities' },
  { method: 'post', path: '/api/v1/account/passkeys/options', summary: 'Options for adding a passkey, from your own page session: {challengeId, options} for navigator.credentials.create (one use, 5 minutes)', tag: 'identities', status: 201 },
  { method: 'post', path: '/api/v1/account/passkeys', summary: "Add a passkey: {challengeId, response (the authenticator's answer as JSON), label?}, from your own page session; a passkey-registered identity event", tag: 'identities', request: registerPasskeySchema, status: 201 },
  { method: 'post', path: '/api/v1/sessions/passkey/options', summary: 'Options for signing in with a passkey: {challengeId, options} for navigator.credentials.get (no token needed)', tag: 'identities', status: 201, public: true },
  { method: 'post', path: '/api/v1/sessions/passkey', summary: 'Sign in with a passkey {challengeId, response}: sets the HttpOnly session cookie of the pages (no token needed)', tag: 'identities', request: passkeySignInSchema, status: 201, public: true },
  { method: 'post', path: '/api/v1/revisions/{id}/passkey-challenges', summary: "A challenge for signing this revision with your passkey (SHA-256 of its record hash and a nonce; one use): {challengeId, revisionHash, options} (reviewer)", tag: 'reviews', status: 201 },
  { method: 'post', path: '/api/v1/users/{id}/tokens', summary: 'Issue a token, returned once (admin)', tag: 'identities', request: createTokenSchema.unwrap(), status: 201 },
  { method: 'get', path: '/api/v1/users/{id}/tokens', summary: "A user's tokens, without secrets (admin)", tag: 'identities' },
  { method: 'post', path: '/api/v1/users/{id}/tokens/{tokenId}/revoke', summary: 'Revoke a token at once (admin)', tag: 'identities' },
  { method: 'get', path: '/api/v1/identity-events', summary: 'User-level audit: users created, roles granted, tokens issued and revoked (admin)', tag: 'identities', query: identityEventsQuerySchema },
  { method: 'get', path: '/api/v1/identity-events/verify', summary: 'Recompute the identity chain and name the first link or row it does not bear out (admin)', tag: 'identities', response: identityVerificationSchema },
  { method: 'post', path: '/api/v1/products/{id}/checkpoints', summary: "Sign the product chain's current head (Ed25519 checkpoint {productId, seq, headHash, time})", tag: 'records', status: 201 },
  { method: 'post', path: '/api/v1/checkpoints/verify', summary: 'Whether the signature is ours and the current chain still contains that link with that hash', tag: 'records', request: checkpointSchema },
  { method: 'get', path: '/api/v1/checkpoints/public-key', summary: 'The Ed25519 public key that checks checkpoint signatures (no token needed)', tag: 'records', public: true },
  { method: 'post', path: '/api/v1/webhooks', summary: 'Register a webhook endpoint (admin; Standard Webhooks); the answer holds its whsec_ secret, shown once', tag: 'webhooks', request: createEndpointSchema, status: 201 },
  { method: 'get', path: '/api/v1/webhooks', summary: 'Webhook endpoints, without secrets (admin)', tag: 'webhooks' },
  { method: 'get', path: '/api/v1/webhooks/{id}', summary: 'One webhook endpoint, without its secret (admin)', tag: 'webhooks' },
  { method: 'post', path: '/api/v1/webhooks/{id}/disable', summary: 'Stop deliveries to an endpoint (admin)', tag: 'webhooks' },
  { method: 'post', path: '/api/v1/webhooks/{id}/rotate', summary: 'A new secret for an endpoint, shown once (admin)', tag: 'webhooks' },
  { method: 'get', path: '/api/v1/webhooks/{id}/attempts', summary: 'Every delivery attempt to an endpoint, newest first: status, error, outcome, next attempt (admin)', tag: 'webhooks' },
  { method: 'get', path: '/api/v1/me/notifications', summary: "The caller's mail preference (address, on or off)", tag: 'notifications' },
  { method: 'put', path: '/api/v1/me/notifications', summary: "Set the caller's mail preference: notifications go to this address when enabled", tag: 'notifications', request: mailPreferenceSchema },
  { method: 'get', path: '/health', summary: 'Database reachable (no token needed)', tag: 'health', public: true },
];

export function buildOpenApi(routes: Route[] = ROUTES): OpenAPIObject {
  const paths: Record<string, Record<string, unknown>> = {};
  const problem = { 'application/problem+json': { schema: json(problemSchema, 'output') } };
  for (const r of routes) {
    const params = [...r.path.matchAll(/\{(\w+)\}/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: m[1] === 'version' ? { type: 'string' } : { type: 'string', format: 'uuid' } }));
    for (const [name, schema] of Object.entries(r.query?.shape ?? {})) {
      params.push({ name, in: 'query', required: false, schema: json(schema as ZodType, 'input') } as never);
    }
    if (r.idempotent) params.push({ name: 'Idempotency-Key', in: 'header', required: false, schema: { type: 'string' } } as never);
    paths[r.path] ??= {};
    paths[r.path][r.method] = {
      summary: r.summary,
      tags: [r.tag],
      // OpenAPI 3.0.3, 4.7.10: an empty security list removes the document's bearer requirement for this operation
      ...(r.public ? { security: [] } : {}),
      parameters: params,
      ...(r.request ? { requestBody: { required: true, content: { 'application/json': { schema: json(r.request, 'input') } } } } : {}),
      responses: {
        [String(r.status ?? 200)]: r.status === 204 ? { description: 'done, no content' } : {
          description: 'success',
          content: Object.fromEntries((r.produces ?? ['application/json']).map((type) => [
            type,
            { schema: type === 'application/json' ? (r.response ? json(r.response, 'output') : {}) : { type: 'string', ...(type === 'application/pdf' ? { format: 'binary' } : {}) } },
          ])),
        },
        '4XX': { description: 'problem details (RFC 9457) with the invalid field paths', content: problem },
        '503': { description: 'the database cannot be reached for now: retry after the Retry-After header\'s seconds', content: problem },
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

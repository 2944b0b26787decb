/**
 * A response serializer compiled from the route's documented zod schema (the same schema the OpenAPI document shows),
 * with fast-json-stringify: fixed-shape answers are written by generated code instead of JSON.stringify's generic
 * walk (about 0.6 of its time on the evaluation answer; docs/performance.md). Every object is left open
 * (additionalProperties: true), so a field the schema does not list is still written, by JSON.stringify: the
 * serializer can make an answer cheaper, never shorter.
 */
import fastJsonStringify from 'fast-json-stringify';
import { z } from 'zod';

type JsonSchema = Record<string, unknown>;

/** Every object schema open to keys it does not list (records keep their value schema). */
function opened(schema: unknown): void {
  if (Array.isArray(schema)) {
    for (const s of schema) opened(s);
    return;
  }
  if (schema === null || typeof schema !== 'object') return;
  const s = schema as JsonSchema;
  if ((s.type === 'object' || s.properties !== undefined) && (s.additionalProperties === undefined || s.additionalProperties === false)) {
    s.additionalProperties = true;
  }
  for (const key in s) opened(s[key]);
}

/** A function writing a value of the schema's output type as JSON text (the same JSON value as JSON.stringify). */
export function compileSerializer(schema: z.ZodType): (value: unknown) => string {
  const json = z.toJSONSchema(schema, { io: 'output', unrepresentable: 'any' }) as JsonSchema;
  delete json.$schema;
  opened(json);
  return fastJsonStringify(json) as (value: unknown) => string;
}

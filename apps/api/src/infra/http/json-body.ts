/**
 * The one body parser: application/json only, refused above a nesting depth before it is parsed. Any other media
 * type with a body answers 415 (Fastify's own refusal, named "(body)" by the problem filter), so a form-encoded or
 * plain-text body never reaches a route. The depth is counted on the text, without recursion, so a 3,000-deep body
 * costs one linear scan and never reaches JSON.parse or any recursive walk of the value.
 */
import type { FastifyInstance } from 'fastify';
import { ProblemError } from './problem';

/** Whether a JSON text nests objects and arrays deeper than maxDepth (the outermost value is level 1). */
export function jsonDepthExceeds(text: string, maxDepth: number): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: the next character is escaped
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x7b || c === 0x5b) {
      if (++depth > maxDepth) return true;
    } else if (c === 0x7d || c === 0x5d) depth--;
  }
  return false;
}

export class BodyTooDeepProblem extends ProblemError {
  constructor(maxDepth: number) {
    const message = `the JSON body nests objects and arrays deeper than ${maxDepth} levels (LEADLINE_JSON_MAX_DEPTH)`;
    super(400, 'Request body nested too deeply', message, { errors: [{ path: '(body)', message }] });
  }
}

/** Replaces every body parser with one for application/json that refuses bodies nested deeper than maxDepth. */
export function registerJsonBodyParser(fastify: FastifyInstance, options: { maxDepth: number; bodyLimit: number }): void {
  const parse = fastify.getDefaultJsonParser('error', 'error');
  fastify.removeAllContentTypeParsers();
  fastify.addContentTypeParser('application/json', { parseAs: 'string', bodyLimit: options.bodyLimit }, (request, body, done) => {
    if (jsonDepthExceeds(body as string, options.maxDepth)) {
      done(new BodyTooDeepProblem(options.maxDepth), undefined);
      return;
    }
    parse(request, body as string, done);
  });
}

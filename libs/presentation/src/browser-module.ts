/**
 * The presentation module as the browser loads it (/review/assets/lib-presentation.js): an ES module made from the
 * very functions and data the server uses (presentation.ts), so the pages never keep a copy of their own.
 * Each function's compiled text is emitted as it runs on the server; the data constants are emitted as JSON and
 * also gathered in an `exports` object, which is how a compiled function refers to another export of its module.
 */
import * as presentation from './presentation';

export function browserModuleSource(): string {
  const data: string[] = [];
  const functions: string[] = [];
  const names: string[] = [];
  for (const [name, value] of Object.entries(presentation)) {
    if (name === '__esModule' || name === 'default') continue; // module-system bookkeeping of the compiled CommonJS
    if (typeof value === 'function') {
      const text = Function.prototype.toString.call(value);
      if (!text.startsWith(`function ${name}(`)) throw new Error(`presentation.${name} must be a function declaration named ${name}`);
      functions.push(`export ${text}`);
    } else {
      data.push(`export const ${name} = Object.freeze(${JSON.stringify(value)});`);
    }
    names.push(name);
  }
  return [
    '// Generated from libs/presentation/src/presentation.ts by browser-module.ts: do not edit; change the source.',
    ...data,
    ...functions,
    `const exports = { ${names.join(', ')} };`,
    '',
  ].join('\n');
}

/**
 * Lets a plain `node` child process run the service from its TypeScript sources (as Jest does, through SWC), so a
 * test can start real, separate service processes: node -r ./test/support/register-ts.js apps/api/src/main.ts
 */
const fs = require('node:fs');
const path = require('node:path');
const Module = require('node:module');
const { transformSync } = require('@swc/core');

const root = path.resolve(__dirname, '../..');
const resolve = Module._resolveFilename;
Module._resolveFilename = function (request, ...rest) {
  const lib = /^@leadline\/([a-z]+)$/.exec(request);
  return resolve.call(this, lib ? path.join(root, 'libs', lib[1], 'src', 'index.ts') : request, ...rest);
};
require.extensions['.ts'] = function (module, filename) {
  const { code } = transformSync(fs.readFileSync(filename, 'utf8'), {
    filename,
    jsc: { parser: { syntax: 'typescript', decorators: true }, transform: { legacyDecorator: true, decoratorMetadata: true }, target: 'es2022' },
    module: { type: 'commonjs', ignoreDynamic: true },
    sourceMaps: 'inline',
  });
  module._compile(code, filename);
};

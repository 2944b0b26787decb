/**
 * Two projects (DEVELOPERS.md, "Running"):
 *  - unit: pure libraries and pure app modules (libs/**, apps/** specs): no database, no browser, no network;
 *  - integration: HTTP, PostgreSQL, PGlite and Chromium (test/**): one Chromium, one migrated template database and
 *    one migrated PGlite snapshot per run, prepared by test/support/global-setup.ts and shared by every file.
 * Jest runs TypeScript through SWC (decorators + metadata for Nest); `npm run typecheck` checks the types.
 */
const swc = {
  jsc: {
    parser: { syntax: 'typescript', decorators: true },
    transform: { legacyDecorator: true, decoratorMetadata: true },
    target: 'es2022',
  },
  module: { type: 'commonjs', ignoreDynamic: true },
};
const common = {
  rootDir: __dirname,
  testEnvironment: 'node',
  // content-disposition (under @fastify/static) ships ESM only; Node 20 requires it natively, Jest needs it compiled.
  transform: { '^.+\\.ts$': ['@swc/jest', swc], '^.+/node_modules/content-disposition/.+\\.js$': ['@swc/jest', swc] },
  transformIgnorePatterns: ['/node_modules/(?!content-disposition/)'],
  moduleNameMapper: { '^@leadline/(.*)$': '<rootDir>/libs/$1/src' },
};
module.exports = {
  // a global option (Jest reads it from the top level only)
  testTimeout: 120000,
  projects: [
    { ...common, displayName: 'unit', roots: ['<rootDir>/libs', '<rootDir>/apps'], testMatch: ['**/*.spec.ts'] },
    {
      ...common,
      displayName: 'integration',
      roots: ['<rootDir>/test'],
      testMatch: ['**/*.e2e-spec.ts'],
      globalSetup: '<rootDir>/test/support/global-setup.ts',
      globalTeardown: '<rootDir>/test/support/global-teardown.ts',
    },
  ],
};

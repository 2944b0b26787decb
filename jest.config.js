/** Jest runs TypeScript through SWC (decorators + metadata for Nest). */
const swc = {
  jsc: {
    parser: { syntax: 'typescript', decorators: true },
    transform: { legacyDecorator: true, decoratorMetadata: true },
    target: 'es2022',
  },
  module: { type: 'commonjs', ignoreDynamic: true },
};
module.exports = {
  testEnvironment: 'node',
  roots: ['<rootDir>/libs', '<rootDir>/apps', '<rootDir>/test'],
  testMatch: ['**/*.spec.ts', '**/*.e2e-spec.ts'],
  // content-disposition (under @fastify/static) ships ESM only; Node 20 requires it natively, Jest needs it compiled.
  transform: { '^.+\\.ts$': ['@swc/jest', swc], '^.+/node_modules/content-disposition/.+\\.js$': ['@swc/jest', swc] },
  transformIgnorePatterns: ['/node_modules/(?!content-disposition/)'],
  moduleNameMapper: { '^@leadline/(.*)$': '<rootDir>/libs/$1/src' },
  testTimeout: 60000,
};

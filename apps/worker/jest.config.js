// Jest with @swc/jest (stack notes: decorators need legacyDecorator + decoratorMetadata).
const swc = [
  '@swc/jest',
  {
    jsc: {
      parser: { syntax: 'typescript', decorators: true },
      transform: { legacyDecorator: true, decoratorMetadata: true },
      target: 'es2022',
    },
    module: { type: 'commonjs' },
  },
];
const common = { testEnvironment: 'node', transform: { '^.+\\.ts$': swc }, moduleFileExtensions: ['ts', 'js', 'json'] };

/** @type {import('jest').Config} */
module.exports = {
  projects: [
    { ...common, displayName: 'unit', rootDir: __dirname, testMatch: ['<rootDir>/src/**/*.spec.ts'] },
    { ...common, displayName: 'e2e', rootDir: __dirname, testMatch: ['<rootDir>/test/**/*.e2e-spec.ts'], testTimeout: 20000 },
  ],
};

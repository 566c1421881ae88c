// Jest set-up shared by the NestJS apps: @swc/jest (stack notes: decorators need legacyDecorator + decoratorMetadata).
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
// @gltf-transform/core (through @psiform/meshing) requires the ESM-only property-graph and d3-contour (d3-array, internmap), which Jest cannot
// load as is on Node 20: swc compiles those packages to CommonJS.
const common = {
  testEnvironment: 'node',
  transform: { '^.+\\.ts$': swc, '^.+/node_modules/(property-graph|d3-[a-z]+|internmap)/.+\\.m?js$': swc },
  transformIgnorePatterns: ['/node_modules/(?!(property-graph|d3-[a-z]+|internmap)/)'],
  moduleFileExtensions: ['ts', 'js', 'mjs', 'json'],
};

/** Two projects per app: unit specs beside the code (fakes only) and e2e specs on the real services. */
function nestJestConfig(rootDir, { e2eTimeout }) {
  return {
    // Jest reads testTimeout from the top level only: set inside a project it was silently ignored (5 s default),
    // and e2e specs timed out whenever the shared cores were busy.
    testTimeout: e2eTimeout,
    projects: [
      { ...common, displayName: 'unit', rootDir, testMatch: ['<rootDir>/src/**/*.spec.ts'] },
      { ...common, displayName: 'e2e', rootDir, testMatch: ['<rootDir>/test/**/*.e2e-spec.ts'], testTimeout: e2eTimeout },
    ],
  };
}

module.exports = { nestJestConfig };

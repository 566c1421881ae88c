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
    // testTimeout is a global option: inside `projects` Jest ignores it (measured: e2e hooks and tests stopped at the
    // 5 s default), so it is set here for both projects (unit specs mesh real, tiny grids on busy shared cores too).
    testTimeout: e2eTimeout,
    projects: [
      { ...common, displayName: 'unit', rootDir, testMatch: ['<rootDir>/src/**/*.spec.ts'] },
      // testTimeout is a global Jest option and is ignored inside `projects`, so the e2e project sets it in a set-up file.
      {
        ...common,
        displayName: 'e2e',
        rootDir,
        testMatch: ['<rootDir>/test/**/*.e2e-spec.ts'],
        globals: { PSIFORM_E2E_TIMEOUT_MS: e2eTimeout },
        setupFilesAfterEnv: [require.resolve('./jest.e2e-setup.js')],
      },
    ],
  };
}

module.exports = { nestJestConfig };

// The e2e project's timeout (see jest.base.js): spawning services and browsers on a loaded 2-core machine takes seconds.
jest.setTimeout(globalThis.PSIFORM_E2E_TIMEOUT_MS);

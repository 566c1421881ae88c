import { defineConfig } from 'vitest/config';

// The tests spawn the built bin (bin/psiform.js -> dist/main.js); `npm test` builds first.
export default defineConfig({
  test: { include: ['test/**/*.test.ts'], testTimeout: 120000, hookTimeout: 120000 },
});

/// <reference types="vitest/config" />
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

const lib = (name: string) => fileURLToPath(new URL(`../../libs/${name}/src/index.ts`, import.meta.url));

// The client compiles the shared libs from their TypeScript sources (no prior lib build needed).
export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: {
      '@psiform/contracts': lib('contracts'),
      '@psiform/orbitals': lib('orbitals'),
      '@psiform/meshing': lib('meshing'),
      '@psiform/print': lib('print'),
      '@psiform/colour': lib('colour'),
    },
  },
  server: {
    port: 5173,
    proxy: {
      // The API in development; PSIFORM_API_URL overrides it (e.g. another port).
      '/api': { target: process.env.PSIFORM_API_URL ?? 'http://127.0.0.1:3000', changeOrigin: false },
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    sourcemap: true,
    // Two pages: the app, and the headless render page the worker drives for print exports.
    rollupOptions: {
      input: {
        main: fileURLToPath(new URL('./index.html', import.meta.url)),
        render: fileURLToPath(new URL('./render.html', import.meta.url)),
      },
    },
  },
  worker: { format: 'es' },
  test: {
    environment: 'jsdom',
    // globals: true lets Testing Library register its afterEach clean-up.
    globals: true,
    setupFiles: ['./src/test/setup.ts'],
    include: ['src/**/*.test.{ts,tsx}'],
    css: false,
    // Component tests with Blueprint and the Composer take seconds on a loaded 2-core machine: 5 s is too tight.
    testTimeout: 20000,
  },
});

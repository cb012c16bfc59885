import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';

const here = fileURLToPath(new URL('.', import.meta.url));
const apiTarget = `http://127.0.0.1:${process.env.PORT ?? '8080'}`;

// One config: the web app build (root apps/web, output apps/web/dist) and the test projects.
export default defineConfig({
  root: 'apps/web',
  plugins: [react(), tailwindcss()],
  build: { outDir: 'dist', emptyOutDir: true, chunkSizeWarningLimit: 1200 },
  // The browser's Host goes through to the API (changeOrigin off), so its same-origin and
  // host checks accept sign-in through the proxy (npm run dev: apps/server/src/dev-vite.ts).
  server: {
    host: '127.0.0.1',
    port: 5173,
    proxy: { '/api': { target: apiTarget, changeOrigin: false } },
  },
  test: {
    root: here,
    projects: [
      {
        test: {
          name: 'unit',
          root: here,
          include: [
            'packages/**/src/**/*.test.ts',
            'apps/**/src/**/*.test.ts',
            'tests/reference/**/*.test.ts',
            'tests/property/**/*.test.ts',
            'tests/structure/**/*.test.ts',
          ],
        },
      },
      {
        // The same signal-processing checks on the fft.js path (runtimes without WebAssembly
        // SIMD), so both FFT paths stay proven against the same references.
        test: {
          name: 'unit-fft-js',
          root: here,
          include: ['packages/dsp/src/**/*.test.ts', 'tests/reference/scipy-spectra.test.ts'],
          // The kernel's own tests: TURNSTONE_FFT=js switches the kernel off, so there they
          // would test nothing (the project `unit` runs them).
          exclude: ['packages/dsp/src/fft-kernel.test.ts'],
          env: { TURNSTONE_FFT: 'js' },
        },
      },
      {
        test: {
          name: 'api',
          root: here,
          include: ['tests/api/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'faults',
          root: here,
          include: ['tests/faults/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 300_000,
          hookTimeout: 120_000,
        },
      },
      {
        test: {
          name: 'browser',
          root: here,
          include: ['tests/browser/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});

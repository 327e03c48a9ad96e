import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';

const apiPort = process.env.API_PORT ?? '3000';

export default defineConfig({
  plugins: [react(), tailwindcss()],
  build: { outDir: 'dist', sourcemap: false, chunkSizeWarningLimit: 900 },
  server: { proxy: { '/api': `http://127.0.0.1:${apiPort}` } },
  test: {
    // Each project is one stage of `npm test`; the bootstrap runs them in order and times them.
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: ['tests/analysis/**/*.test.ts', 'tests/shared/**/*.test.ts', 'tests/client/**/*.test.{ts,tsx}'] },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/server/**/*.test.ts'],
          globalSetup: ['tests/setup/api-global-setup.ts'],
          setupFiles: ['tests/setup/per-file-db.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          name: 'browser',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/setup/api-global-setup.ts'],
          setupFiles: ['tests/setup/per-file-db.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});

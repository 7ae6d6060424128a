import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';

// One config for the client build (vite) and the test suite (vitest projects).
export default defineConfig({
  plugins: [react(), tailwindcss()],
  server: { proxy: { '/api': 'http://127.0.0.1:3000' } }, // dev: vite :5173 -> express :3000
  worker: { format: 'es' },
  build: { chunkSizeWarningLimit: 900 },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'shared',
          environment: 'node',
          include: ['tests/shared/**/*.test.ts'],
          testTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'server',
          environment: 'node',
          include: ['tests/server/**/*.test.ts'],
          exclude: ['tests/server/pg/**'],
          globalSetup: ['tests/server/global-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        // The server tests that open a database, run again against a real PostgreSQL server (a
        // throwaway cluster started by the global setup; DATABASE_URL mode). The CLI, work-pool and
        // pure service tests touch no database and run once, in project server.
        extends: true,
        test: {
          name: 'server-pg',
          environment: 'node',
          include: ['tests/server/*.test.ts', 'tests/server/{jobs,mail,storage,pg}/**/*.test.ts'],
          globalSetup: ['tests/server/pg-global-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'client',
          environment: 'happy-dom',
          include: ['tests/src/**/*.test.{ts,tsx}'],
          setupFiles: ['tests/src/setup-dom.ts'],
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 240_000,
        },
      },
    ],
  },
});

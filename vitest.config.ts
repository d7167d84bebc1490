import { defineConfig } from 'vitest/config';

// Three projects: unit (pure code), api (supertest on createApp with a temp DATA_DIR),
// e2e (headless Chromium against a real server). `npm test` runs the first two.
export default defineConfig({
  test: {
    // Vitest's default is one worker fewer than the CPUs: one worker on CI's two cores. The API tests spend
    // much of their time waiting (bcrypt, sharp, child servers, sockets), so two workers use both cores.
    maxWorkers: 2,
    projects: [
      { test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          // With DATABASE_URL set, migrates one PostgreSQL template database for the run's test apps.
          globalSetup: ['tests/support/pg-template.ts'],
          // Each worker loads the app's modules once, not once per file (about two minutes of imports a run).
          // Every test file starts its own app (createApp) on its own database, so no state is shared; a test
          // that fakes timers or spies restores them in afterEach.
          isolate: false,
          testTimeout: 20_000,
          hookTimeout: 30_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});

import { defineConfig } from 'vitest/config';

// Two projects: `unit` runs pure code (the numerical core, readers, engine) in-process;
// `app` talks to a real built server and a real browser (see tests/setup/).
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          // The route inventory reads files only (no server): it runs here.
          include: ['tests/unit/**/*.test.ts', 'src/**/*.test.ts', 'tests/api/route-inventory.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'app',
          include: ['tests/api/**/*.test.ts', 'tests/browser/**/*.test.ts'],
          exclude: ['tests/api/route-inventory.test.ts'],
          environment: 'node',
          // One built server (dist/) on a free loopback port, with its own SQLite file, migrated
          // and seeded; the files share it one after another (one fork) so their data do not
          // interleave.
          globalSetup: ['tests/setup/app-server.ts'],
          pool: 'forks',
          poolOptions: { forks: { singleFork: true } },
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});

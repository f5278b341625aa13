import { defineConfig } from 'vitest/config';

// Two projects: `unit` runs pure code (the numerical core, readers, engine) in-process;
// `app` talks to a real built server and a real browser (see tests/setup/).
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts', 'src/**/*.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
        },
      },
    ],
  },
});

import { defineConfig } from 'vitest/config'

// The planner's property tests (fast-check over hundreds of random rigs) are CPU-bound: on a
// busy machine one of them can take longer than vitest's 5 s default, so they run as a
// project of their own with an explicit, generous timeout.
const propertyTests = [
  'tests/unit/planner/properties.test.ts',
  'tests/unit/planner/numerics.test.ts',
]

// Three projects: `unit` is plain Node over pure code (shared/utils, server helpers);
// `properties` is the slow part of it; `server` runs the API and browser tests against one
// built app, one test MariaDB and one fake SMTP server, all started once by
// tests/setup/global.ts.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          exclude: propertyTests,
          environment: 'node',
        },
      },
      {
        test: {
          name: 'properties',
          include: propertyTests,
          environment: 'node',
          testTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'server',
          include: ['tests/api/**/*.test.ts', 'tests/browser/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/global.ts'],
          testTimeout: 60_000,
          hookTimeout: 240_000,
          fileParallelism: false,
        },
      },
    ],
  },
})

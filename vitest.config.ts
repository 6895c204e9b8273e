import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

// Two projects: `unit` is plain Node over pure code (shared/utils, server helpers);
// `server` runs the API and browser tests against one built app, one test MariaDB and
// one fake SMTP server, all started once by tests/setup/global.ts.
export default defineConfig({
  test: {
    projects: [
      {
        // The stores import shared code through Nuxt's alias, as the app builds them.
        resolve: { alias: { '~~': fileURLToPath(new URL('.', import.meta.url)) } },
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
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

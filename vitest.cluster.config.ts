import { defineConfig } from 'vitest/config'

// `npm run test:cluster` (not part of `npm test`): two app instances on a three-node MariaDB
// Galera cluster, started once by tests/cluster/global.ts (docs/scaling.md).
export default defineConfig({
  test: {
    include: ['tests/cluster/**/*.test.ts'],
    environment: 'node',
    globalSetup: ['tests/cluster/global.ts'],
    testTimeout: 120_000,
    hookTimeout: 400_000,
    fileParallelism: false,
  },
})

import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

const shared = fileURLToPath(new URL('./shared', import.meta.url))

// Three layers, routed by folder: unit (pure code, no server), e2e (built server + real
// Postgres), browser (Chromium through playwright-core). scripts/test.sh runs them in order.
export default defineConfig({
  resolve: { alias: { '#shared': shared } },
  test: {
    projects: [
      { extends: true, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      {
        extends: true,
        test: {
          name: 'e2e', include: ['tests/e2e/**/*.test.ts'], environment: 'node',
          hookTimeout: 180_000, testTimeout: 120_000, fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          name: 'browser', include: ['tests/browser/**/*.spec.ts'], environment: 'node',
          hookTimeout: 180_000, testTimeout: 120_000, fileParallelism: false,
        },
      },
    ],
  },
})

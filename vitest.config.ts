import { defineVitestProject } from '@nuxt/test-utils/config'
import { defineConfig } from 'vitest/config'
import { fileURLToPath } from 'node:url'

const root = fileURLToPath(new URL('.', import.meta.url))
const alias = { '#shared': `${root}shared`, '~~': root }

// Five projects: pure math (unit), components and stores in the Nuxt runtime (nuxt), the built server
// against real PostgreSQL (e2e; e2e-s3 runs the file-storage ones again against a local S3 server) and
// Chromium driving that server (browser).
export default defineConfig({
  test: {
    projects: [
      { resolve: { alias }, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      await defineVitestProject({
        // IndexedDB (the device outbox) from a general-purpose in-memory implementation
        // starting the Nuxt runtime takes more than the default 10 s on a busy 2-core machine
        test: { name: 'nuxt', include: ['tests/nuxt/**/*.test.ts'], environment: 'nuxt', setupFiles: ['fake-indexeddb/auto'], hookTimeout: 60_000 },
      }),
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        // The upload, certificate, photo and job-file tests again, with the servers keeping files in a
        // local S3-compatible server (s3rver on a free port) instead of on disk; after the rest.
        resolve: { alias },
        test: {
          name: 'e2e-s3',
          include: ['tests/e2e/fuel-emissions-uploads.test.ts', 'tests/e2e/review-findings.test.ts', 'tests/e2e/tags.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts', 'tests/support/s3-global-setup.ts'],
          setupFiles: ['tests/support/s3-env.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
          sequence: { groupOrder: 1 },
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
})

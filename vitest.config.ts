import { defineConfig } from 'vitest/config'

// Three kinds of test, each its own project:
//   unit — pure modules in shared/ (no server, no browser)
//   integration — server modules against a temporary SQLite database (and a local SMTP server), no HTTP
//   api  — HTTP against the built server (started by scripts/test-server.ts)
//   e2e  — real Chromium (Debian's /usr/bin/chromium) against the same server
//   cluster — two built servers on one throw-away PostgreSQL (started by scripts/test-cluster.ts)
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          environment: 'node',
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'cluster',
          include: ['tests/cluster/**/*.test.ts'],
          environment: 'node',
          testTimeout: 120_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
    ],
  },
})

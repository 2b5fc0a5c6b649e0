import { defineConfig } from 'vitest/config'

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // builds the command line first, so tests of `motebench` run the current source (test/global-setup.ts)
    globalSetup: ['test/global-setup.ts'],
    testTimeout: 30_000,
    pool: 'threads'
  }
})

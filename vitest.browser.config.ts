import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

// Browser tests: the built dashboard served by the real API, driven by Debian's Chromium.
// One file at a time: each starts its own server and browser.
export default defineConfig({
  resolve: { alias: { '@shared': fileURLToPath(new URL('./shared', import.meta.url)) } },
  test: {
    include: ['tests/browser/**/*.test.ts'],
    environment: 'node',
    fileParallelism: false,
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
})

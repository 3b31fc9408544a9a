import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

// Unit and API tests. Browser tests have their own config (vitest.browser.config.ts)
// because they need the built dashboard and run one file at a time.
export default defineConfig({
  resolve: { alias: { '@shared': fileURLToPath(new URL('./shared', import.meta.url)) } },
  test: {
    include: ['tests/**/*.test.ts'],
    exclude: ['tests/browser/**', 'node_modules/**'],
    environment: 'node',
    testTimeout: 20_000,
    hookTimeout: 30_000,
  },
})

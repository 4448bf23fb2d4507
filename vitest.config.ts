import { defineConfig } from 'vitest/config'
import { fileURLToPath } from 'node:url'

const alias = { '#shared': fileURLToPath(new URL('./shared', import.meta.url)) }

// Four projects: pure numerics, unit (server helpers without a database),
// integration (real PostgreSQL from DATABASE_URL), e2e (built app in Chromium).
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      { resolve: { alias }, test: { name: 'numerics', include: ['tests/numerics/**/*.test.ts'], environment: 'node', testTimeout: 60_000 } },
      { resolve: { alias }, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      { resolve: { alias }, test: { name: 'integration', include: ['tests/integration/**/*.test.ts'], environment: 'node', fileParallelism: false, testTimeout: 60_000, hookTimeout: 120_000 } },
      { resolve: { alias }, test: { name: 'e2e', include: ['tests/e2e/**/*.test.ts'], environment: 'node', fileParallelism: false, testTimeout: 120_000, hookTimeout: 300_000 } },
    ],
  },
})

import { defineConfig } from 'vitest/config'
import vue from '@vitejs/plugin-vue'
import { quasar, transformAssetUrls } from '@quasar/vite-plugin'

// One config for the client build and for the three test projects.
// unit: pure code (engine, shared rules), no database. api: supertest against a fresh PostgreSQL database.
// e2e: Debian's chromium driven by playwright-core against the built client.
export default defineConfig({
  plugins: [vue({ template: { transformAssetUrls } }), quasar()],
  build: { outDir: 'dist', chunkSizeWarningLimit: 2000 },
  server: { proxy: { '/api': 'http://127.0.0.1:3000' } },
  test: {
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts', 'tests/engine/**/*.test.ts'], testTimeout: 60_000 },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 180_000,
          hookTimeout: 120_000,
          // A page under a loaded CI machine can take seconds to settle; the 1 s default made waits flaky.
          expect: { poll: { timeout: 15_000, interval: 100 } },
        },
      },
    ],
  },
})

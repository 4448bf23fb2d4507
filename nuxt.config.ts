import { fileURLToPath } from 'node:url'

// Tessera: root-level Nuxt 4 layout (srcDir '.' keeps it so even if an app/ folder appears).
export default defineNuxtConfig({
  srcDir: '.',
  compatibilityDate: '2026-11-01',
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  css: ['~/assets/css/main.css'],
  tailwindcss: { cssPath: '~/assets/css/main.css' },
  typescript: { strict: true },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Tessera',
      meta: [{ name: 'description', content: 'Kilometre-scale probabilities from coarse ensemble forecasts.' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  runtimeConfig: {
    databaseUrl: '',
    /** Sessions older than this are refused even if the cookie is still valid (seconds). */
    sessionMaxAgeSeconds: 12 * 3600,
    /** Enables the demo-only helpers (seeded accounts are listed on the sign-in page). */
    demoMode: false,
    publicBaseUrl: 'http://localhost:3000',
    session: {
      maxAge: 12 * 3600,
      cookie: { sameSite: 'lax', httpOnly: true, secure: true },
    },
    public: { demoMode: false },
  },
  nitro: {
    // The PDF fonts travel inside the build (pdfmake needs full TTFs; see server/utils/pdfFonts.ts).
    serverAssets: [{ baseName: 'fonts', dir: fileURLToPath(new URL('./node_modules/@expo-google-fonts/atkinson-hyperlegible', import.meta.url)), pattern: '**/*.ttf' }],
    // Node-only packages used by server code: keep them external instead of bundling.
    externals: { external: ['pg', 'pg-boss', 'h5wasm', 'netcdfjs', 'geotiff', 'pdfmake'] },
  },
  vite: { build: { chunkSizeWarningLimit: 2000 } },
})

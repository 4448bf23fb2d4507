export default defineNuxtConfig({ srcDir: ".", compatibilityDate: "2026-11-01" })

// Conservative headers on every response; identity is attached by nuxt-auth-utils, and each
// API route enforces access itself with requireRole.
export default defineEventHandler((event) => {
  setResponseHeaders(event, {
    'X-Content-Type-Options': 'nosniff',
    'X-Frame-Options': 'DENY',
    'Referrer-Policy': 'same-origin',
    'Permissions-Policy': 'camera=(), microphone=(), geolocation=()',
  })
  if (event.path.startsWith('/api/')) setResponseHeader(event, 'Cache-Control', 'no-store')
})

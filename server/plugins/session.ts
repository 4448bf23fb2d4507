// Keeps the browser's view of the session honest: a deactivated, changed or expired account
// gets an empty session from /api/_auth/session instead of a stale user.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    await validateSession(event, session)
  })
})

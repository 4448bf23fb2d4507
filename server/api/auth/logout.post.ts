export default defineEventHandler(async (event) => {
  const session = await getUserSession(event)
  if (session.user) await recordAudit({ actor: session.user, action: 'auth.sign_out', entityType: 'user', entityId: session.user.id }, event)
  await clearUserSession(event)
  setResponseStatus(event, 204)
  return null
})

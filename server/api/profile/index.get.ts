export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { email, displayName, role, lastSignInAt, createdAt } = await findUserById(user.id)
  return { user: { id: user.id, email, displayName, role, lastSignInAt, createdAt } }
})

import { changePasswordSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { currentPassword, newPassword } = await readValidatedBody(event, changePasswordSchema.parse)
  return changeOwnPassword(event, user.id, currentPassword, newPassword)
})

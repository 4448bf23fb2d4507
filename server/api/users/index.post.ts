import { createUserSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const input = await readValidatedBody(event, createUserSchema.parse)
  setResponseStatus(event, 201)
  return inviteUser(event, actor, input)
})

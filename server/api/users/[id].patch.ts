import { idParamSchema, updateUserSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const patch = await readValidatedBody(event, updateUserSchema.parse)
  return updateUser(event, actor, id, patch)
})

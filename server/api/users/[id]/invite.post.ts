import { idParamSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  return reissueInvite(event, actor, id)
})

import { idParamSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  return deleteOrganisation(event, actor, id)
})

import { idParamSchema } from '#shared/schemas/auth'
import { organisationUpdateSchema } from '#shared/schemas/distribution'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const patch = await readValidatedBody(event, organisationUpdateSchema.parse)
  return { organisation: await updateOrganisation(event, actor, id, patch) }
})

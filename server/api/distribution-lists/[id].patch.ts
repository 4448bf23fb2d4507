import { idParamSchema } from '#shared/schemas/auth'
import { distributionListUpdateSchema } from '#shared/schemas/distribution'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const patch = await readValidatedBody(event, distributionListUpdateSchema.parse)
  return { list: await updateDistributionList(event, actor, id, patch) }
})

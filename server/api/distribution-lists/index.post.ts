import { distributionListSchema } from '#shared/schemas/distribution'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const input = await readValidatedBody(event, distributionListSchema.parse)
  setResponseStatus(event, 201)
  return { list: await createDistributionList(event, actor, input) }
})

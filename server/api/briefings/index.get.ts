import { briefingListQuerySchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const query = await getValidatedQuery(event, briefingListQuerySchema.parse)
  return { briefings: await listBriefings(user, query) }
})

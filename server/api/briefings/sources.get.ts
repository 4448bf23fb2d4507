import { briefingSourcesQuerySchema } from '#shared/schemas/briefings'

/** What the builder can choose from for one run. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { runId } = await getValidatedQuery(event, briefingSourcesQuerySchema.parse)
  return briefingSources(runId)
})

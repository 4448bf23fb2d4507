import { archiveQuerySchema } from '#shared/schemas/distribution'

/** Full-text and filtered search over every issued briefing version (staff). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const query = await getValidatedQuery(event, archiveQuerySchema.parse)
  return searchArchive(query)
})

import { pageQuerySchema } from '#shared/schemas/distribution'

/** Outgoing messages, newest first, with their delivery state. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead')
  const { limit, offset } = await getValidatedQuery(event, pageQuerySchema.parse)
  return recentOutbox(limit, offset)
})

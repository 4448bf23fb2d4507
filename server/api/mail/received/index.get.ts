import { pageQuerySchema } from '#shared/schemas/distribution'

/** What the local SMTP stand-in received, newest first. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead')
  const { limit, offset } = await getValidatedQuery(event, pageQuerySchema.parse)
  return listReceivedMail(limit, offset)
})

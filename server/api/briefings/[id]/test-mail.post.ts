import { idParamSchema } from '#shared/schemas/auth'

/** "Send a test to myself": the briefing as it would arrive, marked TEST, to the signed-in person. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const queued = await queueTestMail(user, id, baseUrl(event))
  if (!queued) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no briefing ${id}.` })
  setResponseStatus(event, 202)
  return queued
})

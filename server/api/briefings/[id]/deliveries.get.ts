import { idParamSchema } from '#shared/schemas/auth'

/** Delivery state per recipient of one briefing version (the briefing page shows it). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  await assertBriefingExists(id)
  return briefingDeliveries(id)
})

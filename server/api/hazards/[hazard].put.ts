import { hazardParamSchema, thresholdSetSchema } from '#shared/schemas/products'

/** Replaces one hazard's threshold set (audited). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { hazard } = await getValidatedRouterParams(event, hazardParamSchema.parse)
  const input = await readValidatedBody(event, thresholdSetSchema.parse)
  return { hazard: await replaceHazardThresholds(event, user, hazard, input) }
})

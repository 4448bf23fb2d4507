import { idParamSchema } from '#shared/schemas/auth'
import { exportQuerySchema } from '#shared/schemas/methodChecks'

/** ?format=json (default) or csv (one row per case), as a download. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const { format } = await getValidatedQuery(event, exportQuerySchema.parse)
  return exportMethodCheckBatch(event, id, format)
})

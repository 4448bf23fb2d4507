import { runTaskParamsSchema } from '#shared/schemas/runs'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id, taskId } = await getValidatedRouterParams(event, runTaskParamsSchema.parse)
  return getTaskFit(id, taskId)
})

import { idParamSchema } from '#shared/schemas/auth'

/** Deletes the batch and its checks. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  await deleteMethodCheckBatch(event, user, id)
  setResponseStatus(event, 204)
  return null
})

import { idParamSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  await deleteMethodCheck(event, user, id)
  setResponseStatus(event, 204)
  return null
})

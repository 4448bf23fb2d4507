import { idParamSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  await deleteRun(event, user, id)
  setResponseStatus(event, 204)
  return null
})

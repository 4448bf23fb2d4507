import { idParamSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const area = await getArea(id)
  return { area: { ...area, canEdit: canEditArea(user, area) } }
})

import { idParamSchema } from '#shared/schemas/auth'
import { updateAreaSchema } from '#shared/schemas/areas'

/** Renames, re-tags or reshapes an area (its owner, a duty lead or an administrator). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const patch = await readValidatedBody(event, updateAreaSchema.parse)
  const area = await updateArea(event, user, id, patch)
  return { area: { ...area, canEdit: true } }
})

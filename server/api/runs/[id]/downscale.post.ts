import { idParamSchema } from '#shared/schemas/auth'
import { downscaleSettingsSchema } from '#shared/schemas/runs'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const settings = await readValidatedBody(event, downscaleSettingsSchema.parse)
  return startDownscaling(event, user, id, settings)
})

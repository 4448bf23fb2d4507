import { idParamSchema } from '#shared/schemas/auth'
import { confirmRunSchema } from '#shared/schemas/runs'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'forecaster')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const { name } = await readValidatedBody(event, confirmRunSchema.parse)
  return confirmRun(event, user, id, name)
})

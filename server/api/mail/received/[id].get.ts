import { idParamSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  return { message: await receivedMailById(id) }
})

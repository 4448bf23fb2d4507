import { caveatIdSchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'duty_lead', 'admin')
  const { id } = await getValidatedRouterParams(event, caveatIdSchema.parse)
  await deleteCaveat(event, user, id)
  setResponseStatus(event, 204)
  return null
})

import { caveatIdSchema, caveatUpdateSchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'duty_lead', 'admin')
  const { id } = await getValidatedRouterParams(event, caveatIdSchema.parse)
  const patch = await readValidatedBody(event, caveatUpdateSchema.parse)
  return { caveat: await updateCaveat(event, user, id, patch) }
})

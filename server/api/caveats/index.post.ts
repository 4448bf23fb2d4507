import { caveatSchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'duty_lead', 'admin')
  const input = await readValidatedBody(event, caveatSchema.parse)
  setResponseStatus(event, 201)
  return { caveat: await createCaveat(event, user, input) }
})

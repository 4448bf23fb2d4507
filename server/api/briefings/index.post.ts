import { createBriefingSchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'forecaster', 'duty_lead')
  const input = await readValidatedBody(event, createBriefingSchema.parse)
  const created = await createBriefing(event, user, input)
  setResponseStatus(event, 201)
  return { briefing: { id: created.id, lockVersion: created.lockVersion } }
})

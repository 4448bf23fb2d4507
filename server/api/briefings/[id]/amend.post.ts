import { briefingIdSchema, lockOnlySchema } from '#shared/schemas/briefings'

/** Starts a new draft version that will supersede this issued one. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'forecaster', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  const { lockVersion } = await readValidatedBody(event, lockOnlySchema.parse)
  const created = await amendBriefing(event, user, id, lockVersion)
  setResponseStatus(event, 201)
  return { briefing: { id: created.id, version: created.version, lockVersion: created.lockVersion } }
})

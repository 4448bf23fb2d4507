import { idParamSchema } from '#shared/schemas/auth'

/** One briefing version sent to the stakeholder, with its statements and the versions of its series. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'stakeholder')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  return { briefing: await portalBriefing(user.id, id) }
})

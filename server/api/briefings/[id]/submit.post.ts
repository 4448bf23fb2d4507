import { briefingIdSchema, lockOnlySchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'forecaster', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  const { lockVersion } = await readValidatedBody(event, lockOnlySchema.parse)
  await submitBriefing(event, user, id, lockVersion)
  return briefingView(user, id)
})

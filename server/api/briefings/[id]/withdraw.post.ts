import { briefingIdSchema, withdrawBriefingSchema } from '#shared/schemas/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'duty_lead')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  const { lockVersion, reason } = await readValidatedBody(event, withdrawBriefingSchema.parse)
  await withdrawBriefing(event, user, id, lockVersion, reason)
  return briefingView(user, id)
})

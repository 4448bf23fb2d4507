import { briefingIdSchema, returnBriefingSchema } from '#shared/schemas/briefings'

/** Returned for changes, with the duty lead's comment. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'duty_lead')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  const { lockVersion, comment } = await readValidatedBody(event, returnBriefingSchema.parse)
  await returnBriefing(event, user, id, lockVersion, comment)
  return briefingView(user, id)
})

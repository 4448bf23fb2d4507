import { briefingIdSchema, updateBriefingSchema } from '#shared/schemas/briefings'

/** Autosave and edits; any edit takes the briefing back to draft. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'forecaster', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  const input = await readValidatedBody(event, updateBriefingSchema.parse)
  await updateBriefing(event, user, id, input)
  return briefingView(user, id)
})

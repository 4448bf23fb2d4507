import { approveBriefingSchema, briefingIdSchema } from '#shared/schemas/briefings'

/** Four-eyes approval of the PDF whose SHA-256 the duty lead reviewed. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'duty_lead')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  const { lockVersion, pdfSha256 } = await readValidatedBody(event, approveBriefingSchema.parse)
  await approveBriefing(event, user, id, lockVersion, pdfSha256)
  return briefingView(user, id)
})

import { runLeadParamsSchema, sampleFieldQuerySchema } from '#shared/schemas/products'

/** One downscaled sample of one member, on the same value classes as the coarse member. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, runLeadParamsSchema.parse)
  const q = await getValidatedQuery(event, sampleFieldQuerySchema.parse)
  const { run, placement, entry } = await productContext(id, q.lead)
  const k = loadedMemberSlot(entry, q.member)
  const count = entry.sampleStart[k + 1]! - entry.sampleStart[k]!
  if (q.sample >= count) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `Member ${q.member} has ${count} samples (0–${count - 1}); there is no sample ${q.sample}.` })
  const image = renderFieldImage(run, entry, placement, { fine: entry.plan.stack.members[entry.sampleStart[k]! + q.sample]! }, q.width)
  setResponseHeaders(event, imageHeaders(image.frame, `Sample ${q.sample + 1} of member ${q.member + 1}, ${validTimeText(run, q.lead)} (${run.displayUnits})`, image.classes))
  return image.png
})

import { coarseFieldQuerySchema, runLeadParamsSchema } from '#shared/schemas/products'

/** One coarse member as read from the file, on the lead time's value classes (same scale as its samples). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, runLeadParamsSchema.parse)
  const q = await getValidatedQuery(event, coarseFieldQuerySchema.parse)
  const { run, placement, entry } = await productContext(id, q.lead)
  const k = loadedMemberSlot(entry, q.member)
  const image = renderFieldImage(run, entry, placement, { coarse: entry.coarse[k]! }, q.width)
  setResponseHeaders(event, imageHeaders(image.frame, `Coarse member ${q.member + 1}, ${validTimeText(run, q.lead)} (${run.displayUnits})`, image.classes))
  return image.png
})

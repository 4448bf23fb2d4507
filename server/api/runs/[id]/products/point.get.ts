import { pointQuerySchema, runLeadParamsSchema } from '#shared/schemas/products'

/** Hover/tap readout at one place: sample statistics, probability, members agreeing, NEP/NMEP. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, runLeadParamsSchema.parse)
  const q = await getValidatedQuery(event, pointQuerySchema.parse)
  const { run, placement, entry } = await productContext(id, q.lead, { to: q.windowTo, direction: q.direction })
  return {
    lead: leadDescription(run, entry),
    event: eventPhrase(run, q.threshold, q.direction),
    ...pointReadout(run, entry, placement, q.lon, q.lat, q.threshold, q.direction, q.radius),
  }
})

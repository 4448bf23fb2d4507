import { areaProductsParamsSchema, areaProductsQuerySchema } from '#shared/schemas/products'

/** Area products of a run per lead time (and over a time window) from the joint samples. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id, areaId } = await getValidatedRouterParams(event, areaProductsParamsSchema.parse)
  const q = await getValidatedQuery(event, areaProductsQuerySchema.parse)
  const run = await runForProducts(id)
  const area = await getArea(areaId)
  const placement = runPlacement(run)
  const result = await areaProductsForRun(run, placement, area.geometry, q.threshold, q.direction, { from: q.windowFrom, to: q.windowTo })
  return { area: { id: area.id, name: area.name }, run: { id: run.id, name: run.name, leadTimes: run.leadTimes }, threshold: q.threshold, direction: q.direction, units: run.displayUnits, ...result }
})

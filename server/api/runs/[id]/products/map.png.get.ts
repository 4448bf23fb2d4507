import { mapQuerySchema, runLeadParamsSchema } from '#shared/schemas/products'

/** The product as a PNG on a Web-Mercator pixel grid over the run's extent (corners in X-Tessera-Corners). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, runLeadParamsSchema.parse)
  const q = await getValidatedQuery(event, mapQuerySchema.parse)
  const { run, placement, entry } = await productContext(id, q.lead, { to: q.windowTo, direction: q.direction })
  const image = renderProductImage(run, entry, placement,
    { product: q.product, threshold: q.threshold, direction: q.direction, radiusKm: q.radius },
    { width: q.width, boundaries: q.boundaries === '1' })
  setResponseHeaders(event, { ...imageHeaders(image.frame, image.legend.title, image.legend.classes), 'x-tessera-render-ms': String(image.renderMs) })
  return image.png
})

import { exportParamsSchema } from '#shared/schemas/distribution'

const TYPES = { cap: 'application/xml; charset=utf-8', geojson: 'application/geo+json; charset=utf-8', csv: 'text/csv; charset=utf-8; header=present' } as const
const EXTENSIONS = { cap: 'cap.xml', geojson: 'geojson', csv: 'csv' } as const

/** CAP 1.2 XML, GeoJSON of the areas, or CSV of the statements of an issued briefing version. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id, format } = await getValidatedRouterParams(event, exportParamsSchema.parse)
  let b
  try {
    b = await loadExportBriefing(id, baseUrl(event))
  } catch (err) {
    if (err instanceof ExportRefusal) throw createError({ statusCode: err.status, statusMessage: err.status === 404 ? 'Not Found' : 'Conflict', message: err.message })
    throw err
  }
  const body = format === 'cap' ? briefingCapXml(b) : format === 'csv' ? briefingStatementsCsv(b) : JSON.stringify(briefingGeoJson(b), null, 1)
  setResponseHeaders(event, {
    'content-type': TYPES[format],
    'content-disposition': `attachment; filename="tessera-briefing-${b.seriesId}-v${b.version}.${EXTENSIONS[format]}"`,
  })
  return body
})

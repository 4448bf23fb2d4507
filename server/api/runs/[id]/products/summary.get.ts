import { runLeadParamsSchema, summaryQuerySchema } from '#shared/schemas/products'

/** What a product map shows (one lead time, or a window with windowTo): legend sentence, classes with colours, scenario counts, value range, image placement, timing. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, runLeadParamsSchema.parse)
  const q = await getValidatedQuery(event, summaryQuerySchema.parse)
  const started = performance.now()
  const { run, placement, entry } = await productContext(id, q.lead, { to: q.windowTo, direction: q.direction })
  const loadedMs = performance.now() - started
  const request = { product: q.product, threshold: q.threshold, direction: q.direction, radiusKm: q.radius }
  const values = productValues(entry, placement, request)
  const legend = productLegend(run, entry, placement, request, values)
  const classOfCell = classifyCells(values, legend, entry.missing)
  const classCounts = new Array<number>(legend.classes.length).fill(0)
  let missingCells = 0
  let max = -Infinity
  for (let k = 0; k < classOfCell.length; k++) {
    const c = classOfCell[k]!
    if (c < 0) { missingCells++; continue }
    classCounts[c] = classCounts[c]! + 1
    if (values[k]! > max) max = values[k]!
  }
  const computeMs = performance.now() - started - loadedMs
  const { frame } = placementFrame(placement)
  const structure = await leadStructure(run, placement, q.lead)
  return {
    run: { id: run.id, name: run.name, isDemo: run.isDemo, displayUnits: run.displayUnits, standardName: run.standardName, leadTimes: run.leadTimes },
    lead: leadDescription(run, entry),
    scenarios: { members: entry.memberIndices.length, of: run.members, samplesPerMember: entry.samplesPerMember, samples: entry.plan.n },
    request: { ...request, radiusCells: radiusInCells(q.radius, placement.geometry) },
    event: eventPhrase(run, q.threshold, q.direction),
    legend,
    classCounts,
    missingCells,
    maximum: Number.isFinite(max) ? max : null,
    valueRange: entry.valueRange,
    grid: {
      kind: placement.geometry.kind, nx: placement.geometry.nx, ny: placement.geometry.ny, factor: placement.geometry.factor,
      fineSpacingKm: placement.geometry.spacingKm, outline: placement.outline, bounds: placement.bounds,
    },
    image: { corners: frame.corners, width: frame.width, height: frame.height },
    /** Median fitted correlation shape of the (first) lead time's members, for the map glyph. */
    structure,
    timing: { loadMs: entry.loadMs, requestLoadMs: Math.round(loadedMs), computeMs: Math.round(computeMs) },
  }
})

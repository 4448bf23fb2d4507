/**
 * Map products of a downscaled run: which grid to draw for a request, its display classes and
 * colours, the sentence that says exactly what is shown, and the point readout. All numbers
 * come from the joint samples through shared/numerics/ensemble (ProductPlan, probability classes).
 *
 * Conventions (as in `tessera products`): 'above' means x ≥ T, 'below' x ≤ T; the neighbourhood
 * of a cell is every cell whose centre lies within R (Euclidean) of its centre, R = radius km /
 * fine spacing km, truncated at the grid edge; percentiles are type 7; spread divides by N − 1.
 */
import { createError } from 'h3'
import { diskChords } from '../../shared/numerics/ensemble/disk'
import { probabilityClasses, type ProbabilityClasses } from '../../shared/numerics/ensemble/probabilityClasses'
import { samplePercentiles } from '../../shared/numerics/ensemble/areaProducts'
import type { Direction } from '../../shared/numerics/ensemble/stack'
import {
  hexColour, labelTextColour, NO_SCENARIO_HATCH, niceSteps, probabilityClassColour, valueClassColour, type Rgb, type Rgba,
} from '../../shared/utils/colourScale'
import { isProbabilityProduct, NEP_NMEP_EXPLANATION, type DisplayClass, type PointReadout, type ProductName } from '../../shared/schemas/products'

export type { DisplayClass, PointReadout }
import { cachedProbabilityMaps, leadSamples, runForProducts, runPlacement, type LeadSamples, type RunPlacement, type RunRow } from './runSamples'
import { locateFineCell, parentCoarseCell, type FineGeometry } from './runGeometry'
import { windowLeadSamples } from './windowSamples'
import { encodePng, mercatorFrame, pixelCellTable, renderClasses, type ImageLine, type ImagePalette, type MercatorFrame } from './productImage'

export interface ProductRequest {
  product: ProductName
  threshold: number
  direction: Direction
  radiusKm: number
}

export interface ProductLegend {
  kind: 'probability' | 'value'
  /** The full sentence: what, where, when, from how many scenarios. */
  title: string
  units: string
  classes: DisplayClass[]
  /** Shown with NEP and NMEP. */
  explanation?: string
  /** For a time window: how "any time" is counted and how the scenarios link in time. */
  windowNote?: string
  missingNote?: string
}

/** Fine cells of the neighbourhood radius: km over the fine spacing (the disk includes centres within it). */
export function radiusInCells(radiusKm: number, geometry: FineGeometry): number {
  return radiusKm > 0 ? radiusKm / geometry.spacingKm : 0
}

/**
 * Probability classes no finer than one member: with M members, bins are at least 1/M wide
 * (bin width 1/min(10, M)), whatever the number of samples N (probabilities are multiples of 1/N).
 */
export function classesForEnsemble(samples: number, members: number): ProbabilityClasses {
  return probabilityClasses(samples, 1 / Math.max(1, Math.min(10, members)))
}

function formatNumber(v: number): string {
  const r = Math.round(v * 100) / 100
  return (Object.is(r, -0) ? 0 : r).toString().replace('-', '−')
}

// --- Wording ---------------------------------------------------------------------------------

/** How the quantity is named in sentences, and whether it takes a plural verb. */
export function quantityName(run: Pick<RunRow, 'standardName' | 'variable' | 'heightM'>): { noun: string; plural: boolean } {
  switch (run.standardName) {
    case 'wind_speed_of_gust': return { noun: 'gusts', plural: true }
    case 'wind_speed': return { noun: 'the wind speed', plural: false }
    case 'air_temperature': return { noun: run.heightM != null ? `the ${formatNumber(run.heightM)} m temperature` : 'the air temperature', plural: false }
    case 'surface_temperature': return { noun: 'the surface temperature', plural: false }
    case 'precipitation_amount':
    case 'lwe_thickness_of_precipitation_amount': return { noun: 'precipitation', plural: false }
    case 'rainfall_amount':
    case 'thickness_of_rainfall_amount': return { noun: 'rainfall', plural: false }
    default: return { noun: run.variable, plural: false }
  }
}

/** "gusts reach 20 m/s or more" / "the 2 m temperature falls to −3 °C or lower" (inclusive, as computed). */
export function eventPhrase(run: Pick<RunRow, 'standardName' | 'variable' | 'heightM' | 'displayUnits'>, threshold: number, direction: Direction): string {
  const { noun, plural } = quantityName(run)
  const value = `${formatNumber(threshold)} ${run.displayUnits}`
  return direction === 'above'
    ? `${noun} ${plural ? 'reach' : 'reaches'} ${value} or more`
    : `${noun} ${plural ? 'fall' : 'falls'} to ${value} or lower`
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']

function utcHour(d: Date): string {
  const hh = String(d.getUTCHours()).padStart(2, '0')
  return d.getUTCMinutes() ? `${hh}:${String(d.getUTCMinutes()).padStart(2, '0')}` : hh
}

/** "12 UTC 14 Nov 2031", or for an accumulation/extreme over a period "06–12 UTC 14 Nov 2031". */
export function validTimeText(run: Pick<RunRow, 'leadTimes' | 'cellMethods' | 'forecastPeriodsHours'>, leadIndex: number): string {
  const end = new Date(run.leadTimes[leadIndex]!)
  const day = `${end.getUTCDate()} ${MONTHS[end.getUTCMonth()]} ${end.getUTCFullYear()}`
  const period = /time:\s*(sum|mean|maximum|minimum)/.test(run.cellMethods ?? '') ? periodHours(run, leadIndex) : null
  if (period) {
    const start = new Date(end.getTime() - period * 3600_000)
    const sameDay = start.getUTCDate() === end.getUTCDate()
    return sameDay ? `${utcHour(start)}–${utcHour(end)} UTC ${day}` : `${utcHour(start)} UTC ${start.getUTCDate()} ${MONTHS[start.getUTCMonth()]} – ${utcHour(end)} UTC ${day}`
  }
  return `valid ${utcHour(end)} UTC ${day}`
}

/**
 * A time window in words: 'any' for events ("at any of the 4 valid times from 06 UTC 14 Nov 2031
 * to 00 UTC 15 Nov 2031"), 'over' for the window's extreme values ("over the 4 valid times …").
 * Accumulations and other period values name the span the periods cover ("in any of the 4
 * periods of 6 h between 00 UTC 14 Nov 2031 and 00 UTC 15 Nov 2031").
 */
export function windowTimeText(run: Pick<RunRow, 'leadTimes' | 'cellMethods' | 'forecastPeriodsHours'>, from: number, to: number, kind: 'any' | 'over'): string {
  const count = to - from + 1
  if (/time:\s*(sum|mean|maximum|minimum)/.test(run.cellMethods ?? '')) {
    const hours = periodHours(run, from)
    const end = new Date(run.leadTimes[to]!)
    const start = new Date(Date.parse(run.leadTimes[from]!) - (hours ?? 0) * 3600_000)
    const length = hours && [from, to].every((l) => periodHours(run, l) === hours) ? ` of ${formatNumber(hours)} h` : ''
    return `${kind === 'any' ? 'in any of' : 'over'} the ${count} periods${length} between ${utcDay(start)} and ${utcDay(end)}`
  }
  const first = validTimeText(run, from).replace(/^valid /, ''), last = validTimeText(run, to).replace(/^valid /, '')
  return `${kind === 'any' ? 'at any of' : 'over'} the ${count} valid times from ${first} to ${last}`
}

/** "06 UTC 14 Nov 2031". */
function utcDay(d: Date): string {
  return `${utcHour(d)} UTC ${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`
}

function periodHours(run: Pick<RunRow, 'leadTimes' | 'forecastPeriodsHours'>, leadIndex: number): number | null {
  if (leadIndex > 0) return (Date.parse(run.leadTimes[leadIndex]!) - Date.parse(run.leadTimes[leadIndex - 1]!)) / 3600_000
  if (run.leadTimes.length > 1) return (Date.parse(run.leadTimes[1]!) - Date.parse(run.leadTimes[0]!)) / 3600_000
  return run.forecastPeriodsHours[0] ?? null
}

function scenarioText(entry: LeadSamples): string {
  const m = entry.memberIndices.length, n = entry.plan.n
  return entry.samplesPerMember ? `${m} members × ${entry.samplesPerMember} samples` : `${m} members, ${n} samples`
}

/** The sentence naming exactly what a map shows. */
export function legendTitle(run: RunRow, entry: LeadSamples, placement: RunPlacement, request: ProductRequest): string {
  const valueProduct = !isProbabilityProduct(request.product)
  const when = entry.window ? windowTimeText(run, entry.window.from, entry.window.to, valueProduct ? 'over' : 'any') : validTimeText(run, entry.leadIndex)
  const event = eventPhrase(run, request.threshold, request.direction)
  const noun = entry.window ? `the ${entry.window.extreme === 'max' ? 'highest' : 'lowest'} value of ${quantityName(run).noun}` : quantityName(run).noun
  const radius = `${formatNumber(request.radiusKm)} km`
  const cell = `${formatNumber(placement.geometry.spacingKm)} km`
  const what = (() => {
    switch (request.product) {
      case 'probability': return `Probability that ${event}, per ${cell} cell`
      case 'nmep': return request.radiusKm > 0 ? `Probability that ${event} somewhere within ${radius} (NMEP)` : `Probability that ${event}, per ${cell} cell (radius 0: NMEP is the per-cell probability)`
      case 'nep': return request.radiusKm > 0 ? `Expected share of the area within ${radius} where ${event} (NEP)` : `Probability that ${event}, per ${cell} cell (radius 0: NEP is the per-cell probability)`
      case 'mean': return `Ensemble mean of ${noun} (${run.displayUnits})`
      case 'spread': return `Ensemble spread (standard deviation) of ${noun} (${run.displayUnits})`
      case 'p10': return `10th percentile of ${noun} (${run.displayUnits}): 9 in 10 scenarios are higher`
      case 'p50': return `Median of ${noun} (${run.displayUnits}): half the scenarios are higher`
      case 'p90': return `90th percentile of ${noun} (${run.displayUnits}): 1 in 10 scenarios is higher`
    }
  })()
  return `${what}, ${when} — ${scenarioText(entry)}`
}

// --- Grids and classes -----------------------------------------------------------------------

/** The grid a product shows (row-major fine grid): probabilities in [0, 1] or values in the run's units. */
export function productValues(entry: LeadSamples, placement: RunPlacement, request: ProductRequest): Float64Array {
  const plan = entry.plan
  switch (request.product) {
    case 'probability': return cachedProbabilityMaps(entry, request.threshold, request.direction, 0).probability
    case 'nep': return cachedProbabilityMaps(entry, request.threshold, request.direction, radiusInCells(request.radiusKm, placement.geometry)).nep
    case 'nmep': return cachedProbabilityMaps(entry, request.threshold, request.direction, radiusInCells(request.radiusKm, placement.geometry)).nmep
    case 'mean': return plan.mean()
    case 'spread': return plan.spread()
    case 'p10': return plan.percentiles([10])[0]!
    case 'p50': return plan.percentiles([50])[0]!
    case 'p90': return plan.percentiles([90])[0]!
  }
}

/** Probability display classes with colours; class 0 is "no scenario" (hatched). */
export function probabilityDisplayClasses(classes: ProbabilityClasses): DisplayClass[] {
  return classes.classes.map((c) => {
    const rgb: Rgb = c.noScenario ? [255, 255, 255] : probabilityClassColour(c.lower, c.upper)
    return {
      index: c.index, label: c.label, lower: c.lower, upper: c.upper, colour: hexColour(rgb), textColour: hexColour(labelTextColour(rgb)),
      hatched: c.noScenario, noScenario: c.noScenario, minCount: c.minCount, maxCount: c.maxCount,
    }
  })
}

/** Value classes over round steps of [min, max]; the label gives each class's range. */
export function valueDisplayClasses(min: number, max: number, units: string): DisplayClass[] {
  const edges = niceSteps(min, max, 8)
  const count = edges.length - 1
  return Array.from({ length: count }, (_, k) => {
    const rgb = valueClassColour(k, count)
    return {
      index: k, label: `${formatNumber(edges[k]!)} to ${formatNumber(edges[k + 1]!)} ${units}`, lower: edges[k]!, upper: edges[k + 1]!,
      colour: hexColour(rgb), textColour: hexColour(labelTextColour(rgb)), hatched: false, noScenario: false,
    }
  })
}

/**
 * Class of a probability: 0 for exactly 0 ("no scenario"), else the class with lower < p ≤ upper.
 * Works for continuous NEP values too: any p > 0 is at least class 1, never "no scenario".
 */
export function probabilityClassOf(p: number, classes: DisplayClass[]): number {
  if (!(p > 1e-12)) return 0
  for (let c = 1; c < classes.length; c++) if (p <= classes[c]!.upper + 1e-9) return c
  return classes.length - 1
}

/** Class of a value: the k with edges[k] ≤ v < edges[k + 1], clamped to the first and last class. */
export function valueClassOf(v: number, classes: DisplayClass[]): number {
  let c = 0
  while (c + 1 < classes.length && v >= classes[c + 1]!.lower) c++
  return c
}

/** The classes and colour legend of a request, from the lead time's samples. */
export function productLegend(run: RunRow, entry: LeadSamples, placement: RunPlacement, request: ProductRequest, values?: Float64Array): ProductLegend {
  const title = legendTitle(run, entry, placement, request)
  const missingNote = entry.missing ? 'Cells left clear inside the grid had no coarse value in at least one member.' : undefined
  const windowNote = entry.window?.meaning
  if (isProbabilityProduct(request.product)) {
    const classes = probabilityDisplayClasses(classesForEnsemble(entry.plan.n, entry.memberIndices.length))
    const explanation = request.product === 'probability' ? undefined : NEP_NMEP_EXPLANATION
    return { kind: 'probability', title, units: '%', classes, explanation, missingNote, windowNote }
  }
  let [min, max] = entry.valueRange
  if (request.product === 'spread') {
    const spread = values ?? entry.plan.spread()
    min = 0
    max = 0
    for (let k = 0; k < spread.length; k++) if (spread[k]! > max) max = spread[k]!
  }
  return { kind: 'value', title, units: run.displayUnits, classes: valueDisplayClasses(min, max, run.displayUnits), missingNote, windowNote }
}

/** Class index per fine cell (−1 where the cell is missing). */
export function classifyCells(values: ArrayLike<number>, legend: ProductLegend, missing: Uint8Array | null): Int16Array {
  const out = new Int16Array(values.length)
  const classOf = legend.kind === 'probability' ? probabilityClassOf : valueClassOf
  for (let k = 0; k < values.length; k++) {
    const v = values[k]!
    out[k] = (missing && missing[k]) || !Number.isFinite(v) ? -1 : classOf(v, legend.classes)
  }
  return out
}

export function paletteOf(legend: ProductLegend): ImagePalette {
  const rgba = (hex: string): Rgba => [parseInt(hex.slice(1, 3), 16), parseInt(hex.slice(3, 5), 16), parseInt(hex.slice(5, 7), 16), 255]
  const hatched = new Map<number, Rgba>()
  for (const c of legend.classes) if (c.hatched) hatched.set(c.index, [...NO_SCENARIO_HATCH.colour, Math.round(NO_SCENARIO_HATCH.alpha * 255)])
  return { colours: legend.classes.map((c) => rgba(c.colour)), hatched, hatchSpacingPx: NO_SCENARIO_HATCH.spacingPx }
}

// --- Images ----------------------------------------------------------------------------------

const frameTables = new Map<string, { frame: MercatorFrame; table: Int32Array }>()

/** Default image width: about two pixels per fine cell across, between 256 and 1024. */
export function defaultImageWidth(geometry: FineGeometry): number {
  return Math.max(256, Math.min(1024, 2 * geometry.nx))
}

/** The Mercator frame and pixel → fine cell table of a run at a width (cached: geometry only). */
export function placementFrame(placement: RunPlacement, width?: number): { frame: MercatorFrame; table: Int32Array } {
  const w = width ?? defaultImageWidth(placement.geometry)
  const key = `${placement.key}:${w}`
  let hit = frameTables.get(key)
  if (!hit) {
    const frame = mercatorFrame(placement.bounds, w)
    hit = { frame, table: pixelCellTable(frame, (lon, lat) => locateFineCell(placement.geometry, lon, lat)) }
    frameTables.set(key, hit)
    while (frameTables.size > 24) frameTables.delete(frameTables.keys().next().value!)
  }
  return hit
}

export interface RenderedImage { png: Buffer; frame: MercatorFrame; legend: ProductLegend; renderMs: number }

/**
 * A product as a PNG on the run's Mercator frame. For briefing pictures pass `background` and
 * `lines` (coastlines, the grid outline, areas) to have them drawn in.
 */
export function renderProductImage(run: RunRow, entry: LeadSamples, placement: RunPlacement, request: ProductRequest,
  options: { width?: number; boundaries?: boolean; background?: Rgb; lines?: ImageLine[] } = {}): RenderedImage {
  const started = performance.now()
  const values = productValues(entry, placement, request)
  const legend = productLegend(run, entry, placement, request, values)
  const { frame, table } = placementFrame(placement, options.width)
  const data = renderClasses({
    frame, table, classOfCell: classifyCells(values, legend, entry.missing), palette: paletteOf(legend),
    boundaries: options.boundaries ?? true, background: options.background, lines: options.lines,
  })
  return { png: encodePng(data, frame.width, frame.height), frame, legend, renderMs: Math.round(performance.now() - started) }
}

/** Position of `member` among the lead time's loaded members; 404 when it has no finished samples there. */
export function loadedMemberSlot(entry: LeadSamples, member: number): number {
  const k = entry.memberIndices.indexOf(member)
  if (k < 0) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `Member ${member} has no finished samples at lead time ${entry.leadIndex + 1}.` })
  return k
}

/** A single field (coarse member or one sample) on the lead time's value classes, as a PNG. */
export function renderFieldImage(run: RunRow, entry: LeadSamples, placement: RunPlacement, field: { fine?: ArrayLike<number>; coarse?: ArrayLike<number> },
  width?: number): { png: Buffer; frame: MercatorFrame; classes: DisplayClass[] } {
  const classes = valueDisplayClasses(entry.valueRange[0], entry.valueRange[1], run.displayUnits)
  const { frame, table } = placementFrame(placement, width)
  const cells = placement.geometry.nx * placement.geometry.ny
  const classOfCell = new Int16Array(cells)
  for (let k = 0; k < cells; k++) {
    const v = field.fine ? field.fine[k]! : field.coarse![parentCoarseCell(placement.geometry, k)]!
    classOfCell[k] = !Number.isFinite(v) || (field.fine && entry.missing?.[k]) ? -1 : valueClassOf(v, classes)
  }
  const legend: ProductLegend = { kind: 'value', title: '', units: run.displayUnits, classes }
  const data = renderClasses({ frame, table, classOfCell, palette: paletteOf(legend), boundaries: false })
  return { png: encodePng(data, frame.width, frame.height), frame, classes }
}

// --- Point readout ---------------------------------------------------------------------------

/**
 * Everything known at one place: sample statistics of its fine cell, the probability and how many
 * members agree, and NEP/NMEP there (computed locally with the same disk and edge rules as the maps).
 */
export function pointReadout(run: RunRow, entry: LeadSamples, placement: RunPlacement, lon: number, lat: number,
  threshold: number, direction: Direction, radiusKm: number): PointReadout {
  const geometry = placement.geometry
  const k = locateFineCell(geometry, lon, lat)
  if (k < 0) return { inside: false, lon, lat }
  const i = k % geometry.nx, j = Math.floor(k / geometry.nx)
  const [clon, clat] = geometry.toLonLat(geometry.xCentres[i]!, geometry.yCentres[j]!)
  const base = { inside: true, lon, lat, cell: { i, j, lon: clon, lat: clat } }
  if (entry.missing?.[k]) return { ...base, missing: true }
  const members = entry.plan.stack.members
  const n = members.length
  const crossesAt = direction === 'above' ? (v: number) => v >= threshold : (v: number) => v <= threshold
  const values = new Float64Array(n)
  let sum = 0, count = 0
  for (let m = 0; m < n; m++) { const v = members[m]![k]!; values[m] = v; sum += v; if (crossesAt(v)) count++ }
  const [p10, p50, p90] = samplePercentiles(values, [10, 50, 90]) as [number, number, number]
  let agreeing = 0
  for (let g = 0; g + 1 < entry.sampleStart.length; g++) {
    for (let m = entry.sampleStart[g]!; m < entry.sampleStart[g + 1]!; m++) if (crossesAt(members[m]![k]!)) { agreeing++; break }
  }
  const coarseCell = parentCoarseCell(geometry, k)
  const coarse = entry.coarse.map((f) => f[coarseCell]!).filter(Number.isFinite)
  // Neighbourhood: cells whose centre is within R (in cells) of this one, inside the grid.
  const chords = diskChords(radiusInCells(radiusKm, geometry))
  const disk: number[] = []
  for (let d = -chords.reach; d <= chords.reach; d++) {
    const jj = j + d
    if (jj < 0 || jj >= geometry.ny) continue
    const h = chords.halfWidth[Math.abs(d)]!
    for (let ii = Math.max(0, i - h); ii <= Math.min(geometry.nx - 1, i + h); ii++) disk.push(jj * geometry.nx + ii)
  }
  let eventCells = 0, nmepCount = 0, membersWithin = 0
  const sampleHit = new Uint8Array(n)
  for (let m = 0; m < n; m++) {
    const g = members[m]!
    for (const c of disk) if (crossesAt(g[c]!)) { eventCells++; sampleHit[m] = 1 }
    nmepCount += sampleHit[m]!
  }
  for (let g = 0; g + 1 < entry.sampleStart.length; g++) {
    for (let m = entry.sampleStart[g]!; m < entry.sampleStart[g + 1]!; m++) if (sampleHit[m]) { membersWithin++; break }
  }
  let lo = Infinity, hi = -Infinity
  for (const v of values) { if (v < lo) lo = v; if (v > hi) hi = v }
  return {
    ...base,
    samples: n,
    members: entry.memberIndices.length,
    value: { mean: sum / n, min: lo, max: hi, p10, p50, p90, units: run.displayUnits },
    coarse: coarse.length ? { mean: coarse.reduce((a, b) => a + b, 0) / coarse.length, min: Math.min(...coarse), max: Math.max(...coarse) } : undefined,
    probability: { value: count / n, count },
    membersAgreeing: {
      count: agreeing, of: entry.memberIndices.length,
      rule: `members with at least one of their ${entry.samplesPerMember ?? ''} samples crossing the threshold at this cell`.replace('  ', ' '),
    },
    neighbourhood: { radiusKm, cells: disk.length, nep: eventCells / (n * disk.length), nmep: nmepCount / n, nmepCount, membersWithin },
  }
}

// --- Request context -------------------------------------------------------------------------

/**
 * The run, its fine-grid placement and the samples of one lead time — or, with windowTo after the
 * lead, of the time window lead..windowTo (each scenario's extreme in the event's direction).
 */
export async function productContext(runId: number, leadIndex: number, window?: { to?: number; direction: Direction }) {
  const run = await runForProducts(runId)
  const placement = runPlacement(run)
  const entry = window ? await windowLeadSamples(run, leadIndex, window.to, window.direction) : await leadSamples(run, leadIndex)
  return { run, placement, entry }
}

/** The "lead" part of a products answer: the lead time, or the window with its words. */
export function leadDescription(run: RunRow, entry: LeadSamples) {
  const w = entry.window
  return {
    index: entry.leadIndex, validTime: run.leadTimes[entry.leadIndex]!, when: w ? windowTimeText(run, w.from, w.to, 'any') : validTimeText(run, entry.leadIndex),
    /** The first (or only) lead time alone, for what stays at one time (coarse members, single samples). */
    leadWhen: validTimeText(run, entry.leadIndex),
    window: w ? { from: w.from, to: w.to, extreme: w.extreme, validTimes: run.leadTimes.slice(w.from, w.to + 1), timeCoherent: entry.timeCoherent, meaning: w.meaning } : null,
  }
}

/** Response headers that say what an image shows (percent-encoded UTF-8 where text). */
export function imageHeaders(frame: MercatorFrame, legendTitle: string, classes: DisplayClass[]): Record<string, string> {
  return {
    'content-type': 'image/png',
    'x-tessera-legend': encodeURIComponent(legendTitle),
    'x-tessera-corners': JSON.stringify(frame.corners),
    'x-tessera-classes': encodeURIComponent(classes.map((c) => `${c.label}=${c.hatched ? 'hatched' : c.colour}`).join('; ')),
    'x-tessera-size': `${frame.width}x${frame.height}`,
  }
}

/**
 * Lines for a briefing picture drawn by renderProductImage: the grid outline, the areas of
 * interest, and for demo runs the invented coastline (basemap coastlines can be added the same way).
 */
export function pictureLines(placement: RunPlacement, areas: { geometry: { coordinates: number[][][][] } }[], demoCoast?: [number, number][]): ImageLine[] {
  const lines: ImageLine[] = []
  if (demoCoast) lines.push({ lines: [demoCoast], colour: [51, 57, 62, 255], widthPx: 1.5 })
  lines.push({ lines: [placement.outline], colour: [19, 95, 90, 255], widthPx: 2 })
  const rings = areas.flatMap((a) => a.geometry.coordinates.flatMap((polygon) => polygon.map((ring) => ring.map((p) => [p[0]!, p[1]!] as [number, number]))))
  if (rings.length) lines.push({ lines: rings, colour: [14, 24, 36, 255], widthPx: 2.5 })
  return lines
}

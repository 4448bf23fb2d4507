/**
 * Area-of-interest products of a run, per lead time and over a time window, from the joint
 * samples (GUIDE §4): P(threshold crossed anywhere in the area), P(area mean crosses it),
 * the expected fraction of the area affected, and percentiles of the area maximum and minimum.
 * The area is rasterised onto the fine grid by cell centres; cells without coarse data are left out.
 */
import type { MultiPolygon } from 'geojson'
import { areaMask, type AreaMask } from '../../shared/numerics/ensemble/areaMask'
import { areaProducts } from '../../shared/numerics/ensemble/areaProducts'
import { areaSamples, windowAreaSamples, type AreaSamples } from '../../shared/numerics/ensemble/areaSamples'
import type { Direction, EnsembleStack } from '../../shared/numerics/ensemble/stack'
import { rasteriseOnAxes, rasteriseOnCells } from '../../shared/numerics/geo/rasterise'
import { fineCellCentresLonLat, locateFineCell } from './runGeometry'
import { leadSamples, type LeadSamples, type RunPlacement, type RunRow } from './runSamples'
import { eventPhrase, validTimeText } from './products'
import { samplesAligned, windowMeaning } from './windowSamples'
import type { AreaRowProducts } from '../../shared/schemas/products'

export interface AreaOnGrid {
  /** Fine cells of the area (row-major indices), ascending; empty when the area misses the grid. */
  cells: Int32Array
  note?: string
}

const centresCache = new Map<string, { lon: Float64Array; lat: Float64Array }>()

function wrap180(lon: number): number { return ((((lon + 180) % 360) + 360) % 360) - 180 }

/**
 * The fine cells whose centre lies inside the area (even-odd rule, holes excluded), minus cells
 * without coarse data. An area smaller than a cell that contains no centre uses the cell under the
 * mean of its outer-ring vertices, so a small circle around a town still gets numbers.
 */
export function areaCellsOnGrid(placement: RunPlacement, geometry: MultiPolygon, missing: Uint8Array | null): AreaOnGrid {
  const g = placement.geometry
  let inside: Uint8Array
  const axesInRange = g.xCentres[0]! >= -180 && g.xCentres[g.nx - 1]! <= 180
  if (g.kind === 'latlon' && axesInRange) inside = rasteriseOnAxes(geometry, g.xCentres, g.yCentres)
  else {
    let centres = centresCache.get(placement.key)
    if (!centres) {
      centres = fineCellCentresLonLat(g)
      centres.lon = centres.lon.map(wrap180)
      centresCache.set(placement.key, centres)
      while (centresCache.size > 8) centresCache.delete(centresCache.keys().next().value!)
    }
    inside = rasteriseOnCells(geometry, centres.lon, centres.lat)
  }
  const cells: number[] = []
  let dropped = 0
  for (let k = 0; k < inside.length; k++) if (inside[k]) { if (missing?.[k]) dropped++; else cells.push(k) }
  if (cells.length > 0) {
    return { cells: Int32Array.from(cells), note: dropped ? `${dropped} cells of the area have no coarse data in some member and are left out.` : undefined }
  }
  const ring = geometry.coordinates[0]![0]!
  const vertices = ring.slice(0, -1)
  const lon = vertices.reduce((s, p) => s + p[0]!, 0) / vertices.length
  const lat = vertices.reduce((s, p) => s + p[1]!, 0) / vertices.length
  const k = locateFineCell(g, lon, lat)
  if (k >= 0 && !missing?.[k]) return { cells: Int32Array.of(k), note: 'The area is smaller than one grid cell: the cell under its centre is used.' }
  return { cells: new Int32Array(0), note: dropped ? 'Every cell of the area lacks coarse data.' : 'The area lies outside this run\'s grid.' }
}

/** The stack restricted to the area's cells (nx = cell count, ny = 1): area statistics need nothing else. */
function gather(stack: EnsembleStack, cells: Int32Array): EnsembleStack {
  return {
    nx: cells.length, ny: 1,
    members: stack.members.map((grid) => { const out = new Float32Array(cells.length); for (let c = 0; c < cells.length; c++) out[c] = grid[cells[c]!]!; return out }),
  }
}

/** Members with at least one sample whose area maximum (or minimum, for 'below') crosses T. */
function membersCrossing(samples: AreaSamples, sampleStart: number[], threshold: number, direction: Direction): number {
  let count = 0
  for (let g = 0; g + 1 < sampleStart.length; g++) {
    for (let m = sampleStart[g]!; m < sampleStart[g + 1]!; m++) {
      if (direction === 'above' ? samples.max[m]! >= threshold : samples.min[m]! <= threshold) { count++; break }
    }
  }
  return count
}

export interface AreaLeadProducts extends AreaRowProducts {
  leadIndex: number
  validTime: string
  when: string
}

function named(q: number[]) { return { p10: q[0]!, p50: q[1]!, p90: q[2]! } }

function productsOf(subs: EnsembleStack[], mask: AreaMask, entries: LeadSamples[], threshold: number, direction: Direction): AreaRowProducts {
  const a = areaProducts(subs.length === 1 ? subs[0]! : subs, mask, threshold, direction, { percents: [10, 50, 90] })
  const n = subs[0]!.members.length
  const samples = windowAreaSamples(subs.map((s) => areaSamples(s, mask)))
  return {
    samples: n, members: entries[0]!.memberIndices.length,
    anywhere: a.anywhere, anywhereCount: Math.round(a.anywhere * n),
    areaMean: a.areaMean, areaMeanCount: Math.round(a.areaMean * n),
    fractionExpected: a.fractionExpected,
    membersAnywhere: membersCrossing(samples, entries[0]!.sampleStart, threshold, direction),
    areaMax: named(a.maxPercentiles), areaMin: named(a.minPercentiles),
  }
}

/**
 * Area products for every lead time with samples, and for the window [windowFrom, windowTo]
 * ("at one or more of its valid times") when the samples are aligned across those lead times.
 */
export async function areaProductsForRun(run: RunRow, placement: RunPlacement, geometry: MultiPolygon, threshold: number, direction: Direction,
  window: { from?: number; to?: number } = {}) {
  const started = performance.now()
  const entries: LeadSamples[] = []
  const skipped: number[] = []
  for (let l = 0; l < run.leadTimes.length; l++) {
    try { entries.push(await leadSamples(run, l)) } catch (err) {
      if ((err as { statusCode?: number }).statusCode === 409) skipped.push(l)
      else throw err
    }
  }
  if (entries.length === 0) return { cells: 0, note: 'No lead time of this run has finished samples yet.', leads: [], window: null, skipped, computeMs: 0 }
  // Cells lacking coarse data at any lead time are left out at every lead time, so rows compare like with like.
  let missing: Uint8Array | null = null
  for (const e of entries) if (e.missing) { missing ??= new Uint8Array(e.missing.length); for (let k = 0; k < missing.length; k++) missing[k]! |= e.missing[k]! }
  const onGrid = areaCellsOnGrid(placement, geometry, missing)
  if (onGrid.cells.length === 0) return { cells: 0, note: onGrid.note, leads: [], window: null, skipped, computeMs: 0 }
  const mask = areaMask(new Float64Array(onGrid.cells.length).fill(1), onGrid.cells.length, 1)
  const subs = entries.map((e) => gather(e.plan.stack, onGrid.cells))
  const leads: AreaLeadProducts[] = entries.map((e, k) => ({
    leadIndex: e.leadIndex, validTime: run.leadTimes[e.leadIndex]!, when: validTimeText(run, e.leadIndex),
    ...productsOf([subs[k]!], mask, [e], threshold, direction),
  }))
  const from = Math.max(0, window.from ?? 0), to = Math.min(run.leadTimes.length - 1, window.to ?? run.leadTimes.length - 1)
  const inWindow = entries.map((e, k) => ({ e, k })).filter(({ e }) => e.leadIndex >= from && e.leadIndex <= to)
  let windowResult = null
  let windowNote: string | undefined
  if (inWindow.length < 2) windowNote = 'The time window needs at least two lead times with samples.'
  else if (!samplesAligned(inWindow.map((x) => x.e))) windowNote = 'The lead times of the window do not hold the same members and samples, so no window probability is given.'
  else {
    windowResult = {
      from: inWindow[0]!.e.leadIndex, to: inWindow[inWindow.length - 1]!.e.leadIndex,
      validTimes: inWindow.map(({ e }) => run.leadTimes[e.leadIndex]!),
      ...productsOf(inWindow.map(({ k }) => subs[k]!), mask, inWindow.map((x) => x.e), threshold, direction),
    }
  }
  return {
    cells: onGrid.cells.length,
    areaKm2: Math.round(onGrid.cells.length * placement.geometry.spacingKm ** 2),
    note: onGrid.note,
    event: eventPhrase(run, threshold, direction),
    leads, window: windowResult, windowNote,
    windowMeaning: windowMeaning(run, inWindow.map((x) => x.e)),
    skipped,
    computeMs: Math.round(performance.now() - started),
  }
}

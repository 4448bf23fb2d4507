/**
 * The map workspace's server path at the operational size, without HTTP or the database:
 * 18 members × 10 samples on a 256² fine grid (32² coarse, factor 8) over the demo region.
 * Measures unpacking the stored int16 samples, building the plan, and what a threshold change
 * costs end to end (probability maps + classes + Web-Mercator PNG), plus the point readout and
 * the area products for four lead times, and the "any time in the window" map over all four.
 * Target: a new map in under 300 ms.
 */
import { ProductPlan } from '../shared/numerics/ensemble/productPlan'
import { packInt16, unpackInt16 } from '../shared/numerics/io/packInt16'
import { circlePolygon } from '../shared/numerics/geo/shapes'
import { DEMO_GRID } from '../shared/demo/region'
import type { RunGrid } from '../server/db/schema/runs'
import { runPlacement, type LeadSamples, type RunRow } from '../server/utils/runSamples'
import { classifyCells, pointReadout, productLegend, productValues, renderProductImage, type ProductRequest } from '../server/utils/products'
import { areaCellsOnGrid } from '../server/utils/areaProducts'
import { areaMask } from '../shared/numerics/ensemble/areaMask'
import { areaProducts } from '../shared/numerics/ensemble/areaProducts'
import { timeExtremeStack } from '../shared/numerics/ensemble/stack'

function lcg(seed: number) { let a = seed >>> 0; return () => { a = (Math.imul(a, 1664525) + 1013904223) >>> 0; return a / 4294967296 } }

function time<T>(fn: () => T): [T, number] { const t0 = performance.now(); const out = fn(); return [out, performance.now() - t0] }
const median = (xs: number[]) => [...xs].sort((p, q) => p - q)[Math.floor(xs.length / 2)]!

export async function bench(): Promise<Record<string, number | string | boolean>> {
  const { nx, ny, west, south, dlon, dlat } = DEMO_GRID
  const factor = 8, members = 18, perMember = 10, leads = 4
  const grid: RunGrid = {
    nx, ny, spacingKm: 20.5, dxKm: 20.4, dyKm: 21.1, crs: 'EPSG:4326', proj4: '+proj=longlat +datum=WGS84 +no_defs',
    x: Array.from({ length: nx }, (_, i) => west + dlon * i), y: Array.from({ length: ny }, (_, j) => south + dlat * j), xUnits: 'degrees_east', yUnits: 'degrees_north',
  }
  const run = {
    id: 424242, grid, settings: { factor, samplesPerMember: perMember, kernel: 'se', seed: 1 }, standardName: 'wind_speed_of_gust', variable: 'gust',
    heightM: 10, displayUnits: 'm/s', cellMethods: null, forecastPeriodsHours: [6, 12, 18, 24],
    leadTimes: ['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z', '2031-11-14T18:00:00Z', '2031-11-15T00:00:00Z'],
  } as unknown as RunRow
  const placement = runPlacement(run)
  const fnx = nx * factor, fny = ny * factor, cells = fnx * fny
  const u = lcg(7)
  // Smooth synthetic gust fields (a few waves plus noise), packed as the worker stores them.
  const packedLeads = Array.from({ length: leads }, () => Array.from({ length: members }, () => {
    const fields = Array.from({ length: perMember }, () => {
      const w = Array.from({ length: 3 }, () => ({ kx: u() * 0.05, ky: u() * 0.05, ph: u() * 6.28, amp: 2 + 4 * u() }))
      return Float32Array.from({ length: cells }, (_, k) => {
        const i = k % fnx, j = Math.floor(k / fnx)
        let v = 18
        for (const x of w) v += x.amp * Math.sin(x.kx * i + x.ky * j + x.ph)
        return v + 1.5 * (u() - 0.5)
      })
    })
    return packInt16(fields)
  }))

  const entries: LeadSamples[] = []
  let unpackMs = 0, planMs = 0
  for (let t = 0; t < leads; t++) {
    const [grids, ms] = time(() => packedLeads[t]!.flatMap((p) => Array.from({ length: perMember }, (_, s) => unpackInt16(p.data, p.offset, p.scale, s, cells))))
    unpackMs += ms
    const [plan, pms] = time(() => new ProductPlan({ nx: fnx, ny: fny, members: grids }))
    planMs += pms
    entries.push({
      runId: run.id, leadIndex: t, fingerprint: 'bench', plan, memberIndices: Array.from({ length: members }, (_, m) => m),
      sampleStart: Array.from({ length: members + 1 }, (_, m) => m * perMember), samplesPerMember: perMember, timeCoherent: false,
      coarse: Array.from({ length: members }, () => new Float32Array(nx * ny).fill(18)), missing: null, valueRange: [5, 30], loadMs: 0, maps: new Map(),
    })
  }
  const entry = entries[1]!
  const request = (threshold: number, radiusKm = 10): ProductRequest => ({ product: 'nmep', threshold, direction: 'above', radiusKm })
  const thresholds = [20.05, 21.05, 22.05, 23.05, 24.05]

  // A threshold change as the page makes it: the summary (maps, legend, classes), then the PNG (maps cached by then).
  const [first] = time(() => renderProductImage(run, entry, placement, request(19.05)))
  const summaryMs: number[] = [], pngMs: number[] = []
  for (const t of thresholds) {
    summaryMs.push(time(() => {
      const values = productValues(entry, placement, request(t))
      classifyCells(values, productLegend(run, entry, placement, request(t), values), null)
    })[1])
    pngMs.push(time(() => renderProductImage(run, entry, placement, request(t)))[1])
  }
  const changeMs = summaryMs.map((ms, k) => ms + pngMs[k]!)
  const radiusMs = [5, 15, 25].map((km) => time(() => renderProductImage(run, entry, placement, request(22.05, km)))[1])
  const pointMs = median(Array.from({ length: 9 }, (_, k) => time(() => pointReadout(run, entry, placement, -23.7 + 0.05 * k, -44.7, 22.05, 'above', 10))[1]))
  const [, percentileMs] = time(() => renderProductImage(run, entry, placement, { product: 'p90', threshold: 0, direction: 'above', radiusKm: 0 }))
  // Area products over four lead times and the window (the area table of one area).
  const circle = circlePolygon([-23.7, -44.7], 25)
  const [onGrid, rasterMs] = time(() => areaCellsOnGrid(placement, { type: 'MultiPolygon', coordinates: [circle.coordinates] }, null))
  const [, areaMs] = time(() => {
    const mask = areaMask(new Float64Array(onGrid.cells.length).fill(1), onGrid.cells.length, 1)
    const subs = entries.map((e) => ({ nx: onGrid.cells.length, ny: 1, members: e.plan.stack.members.map((g) => Float32Array.from(onGrid.cells, (c) => g[c]!)) }))
    for (const s of subs) areaProducts(s, mask, 22.05, 'above')
    areaProducts(subs, mask, 22.05, 'above')
  })

  // A time window over the four lead times, as windowSamples.ts builds it: each scenario's per-cell
  // maximum, then the same threshold change as above on it.
  const [windowEntry, windowBuildMs] = time((): LeadSamples => ({
    ...entries[0]!, plan: new ProductPlan(timeExtremeStack(entries.map((e) => e.plan.stack), 'max')), maps: new Map(),
    window: { from: 0, to: leads - 1, extreme: 'max', meaning: '' },
  }))
  renderProductImage(run, windowEntry, placement, request(19.05))
  const windowChangeMs = thresholds.map((t) => time(() => {
    const values = productValues(windowEntry, placement, request(t))
    classifyCells(values, productLegend(run, windowEntry, placement, request(t), values), null)
    renderProductImage(run, windowEntry, placement, request(t))
  })[1])

  const figures = {
    fineGrid: `${fnx}x${fny}`,
    samples: members * perMember,
    imagePixels: `${first.frame.width}x${first.frame.height}`,
    unpackPerLeadMs: Math.round(unpackMs / leads),
    planPerLeadMs: Math.round(planMs / leads),
    summaryNewThresholdMs: Math.round(median(summaryMs)),
    pngCachedMapsMs: Math.round(median(pngMs)),
    newThresholdEndToEndMs: Math.round(median(changeMs)),
    newRadiusEndToEndMs: Math.round(median(radiusMs)),
    newMapUnder300ms: median(changeMs) < 300 && median(radiusMs) < 300,
    pointReadoutMs: Math.round(pointMs * 10) / 10,
    firstPercentileMapMs: Math.round(percentileMs),
    areaCells: onGrid.cells.length,
    areaRasteriseMs: Math.round(rasterMs * 10) / 10,
    areaFourLeadsAndWindowMs: Math.round(areaMs),
    windowBuildFourLeadsMs: Math.round(windowBuildMs),
    windowNewThresholdEndToEndMs: Math.round(median(windowChangeMs)),
    windowOverSingleLeadRatio: Math.round((median(windowChangeMs) / median(changeMs)) * 100) / 100,
  }
  console.log('workspace benchmark (server path, no HTTP or database)')
  console.log(`  fine grid / samples / image            ${figures.fineGrid} / ${figures.samples} / ${figures.imagePixels} px`)
  console.log(`  unpack int16 + plan, per lead time     ${figures.unpackPerLeadMs} + ${figures.planPerLeadMs} ms`)
  console.log(`  new threshold: summary + PNG = total    ${figures.summaryNewThresholdMs} + ${figures.pngCachedMapsMs} = ${figures.newThresholdEndToEndMs} ms (median of 5)`)
  console.log(`  new radius, end to end                 ${figures.newRadiusEndToEndMs} ms (median of 3)`)
  console.log(`  point readout (R = 10 km)              ${figures.pointReadoutMs} ms`)
  console.log(`  first percentile map (sorts pixels)    ${figures.firstPercentileMapMs} ms`)
  console.log(`  area of ${figures.areaCells} cells: rasterise, 4 leads + window  ${figures.areaRasteriseMs} / ${figures.areaFourLeadsAndWindowMs} ms`)
  console.log(`  4-lead window map: build once / new threshold  ${figures.windowBuildFourLeadsMs} / ${figures.windowNewThresholdEndToEndMs} ms (${figures.windowOverSingleLeadRatio}× one lead time)`)
  return figures
}

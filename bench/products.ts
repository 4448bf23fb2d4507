/**
 * Ensemble products at the operational size: 18 members × 10 samples (N = 180) on a 256² grid.
 * Measures the one-off preparation (per-pixel sort; disk-extreme stack per radius) and the cost
 * of a new probability map (per-pixel exceedance + NEP + NMEP at R = 5 cells) after a threshold
 * change, with and without the prepared radius. Target: a new map in under 300 ms.
 */
import { ProductPlan } from '../shared/numerics/ensemble/productPlan'
import { pixelPercentiles } from '../shared/numerics/ensemble/percentiles'
import { areaMask } from '../shared/numerics/ensemble/areaMask'
import { areaProducts } from '../shared/numerics/ensemble/areaProducts'
import type { EnsembleStack } from '../shared/numerics/ensemble/stack'

/** Smooth-ish seeded synthetic fields (sum of a few random waves plus noise), Float32 like stored samples. */
function syntheticStack(nx: number, ny: number, n: number, seed: number): EnsembleStack {
  let a = seed >>> 0
  const u = () => { a = (Math.imul(a, 1664525) + 1013904223) >>> 0; return a / 4294967296 }
  const members: Float32Array[] = []
  for (let m = 0; m < n; m++) {
    const g = new Float32Array(nx * ny)
    const waves = Array.from({ length: 4 }, () => ({ kx: u() * 0.15, ky: u() * 0.15, ph: u() * 6.283, amp: 2 + 4 * u() }))
    for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      let v = 15
      for (const w of waves) v += w.amp * Math.sin(w.kx * i + w.ky * j + w.ph)
      g[j * nx + i] = v + 2 * (u() - 0.5)
    }
    members.push(g)
  }
  return { nx, ny, members }
}

function time<T>(fn: () => T): [T, number] {
  const t0 = performance.now()
  const out = fn()
  return [out, performance.now() - t0]
}

function median(xs: number[]): number {
  const s = [...xs].sort((p, q) => p - q)
  return s[Math.floor(s.length / 2)]!
}

export async function bench(): Promise<Record<string, number | string | boolean>> {
  const nx = 256
  const ny = 256
  const n = 180
  const radius = 5
  const stack = syntheticStack(nx, ny, n, 2024)
  const thresholds = [18, 20, 22, 24, 26]

  const [plan, createMs] = time(() => new ProductPlan(stack))
  const unsortedMs = median(thresholds.map((t) => time(() => plan.exceedance(t, 'above'))[1]))
  const [, prepareSortMs] = time(() => plan.sortPixels())
  const sortedMs = median(thresholds.map((t) => time(() => plan.exceedance(t, 'above'))[1]))
  // Before the radius is prepared: NMEP straight from the members (what a radius change costs).
  const directMs = median(thresholds.map((t) => time(() => plan.probabilityMaps(t, 'above', radius))[1]))
  const [, prepareRadiusMs] = time(() => plan.prepareNeighbourhood(radius, 'above'))
  const preparedMs = median(thresholds.map((t) => time(() => plan.probabilityMaps(t, 'above', radius))[1]))
  const [, percentilesMs] = time(() => pixelPercentiles(plan.sorted))
  const [, meanSpreadMs] = time(() => plan.spread())
  const mask = areaMask(Float64Array.from({ length: nx * ny }, (_, k) => ((k % nx) - 128) ** 2 + (Math.floor(k / nx) - 100) ** 2 <= 40 ** 2 ? 1 : 0), nx, ny)
  const [, areaMs] = time(() => areaProducts(stack, mask, 22, 'above'))

  const figures = {
    grid: `${nx}x${ny}`,
    members: n,
    radiusCells: radius,
    createPlanMs: Math.round(createMs),
    prepareSortMs: Math.round(prepareSortMs),
    exceedanceUnsortedMs: Math.round(unsortedMs * 10) / 10,
    exceedanceSortedMs: Math.round(sortedMs * 10) / 10,
    prepareRadiusMs: Math.round(prepareRadiusMs),
    newMapPreparedMs: Math.round(preparedMs * 10) / 10,
    newMapDirectMs: Math.round(directMs * 10) / 10,
    newMapUnder300ms: preparedMs < 300 && directMs < 300,
    directOverPrepared: Math.round((directMs / preparedMs) * 10) / 10,
    sortOverPreparedMap: Math.round((prepareSortMs / preparedMs) * 10) / 10,
    percentiles3Ms: Math.round(percentilesMs),
    meanSpreadMs: Math.round(meanSpreadMs),
    areaProductsMs: Math.round(areaMs * 10) / 10,
  }
  const rows: [string, string][] = [
    ['stack', `${n} members, ${nx}×${ny}, Float32`],
    ['create plan (checks every value)', `${figures.createPlanMs} ms`],
    ['per-pixel P alone, before / after sorting', `${figures.exceedanceUnsortedMs} / ${figures.exceedanceSortedMs} ms`],
    ['one-off: sort every pixel', `${figures.prepareSortMs} ms`],
    [`one-off: disk-max stack, R = ${radius}`, `${figures.prepareRadiusMs} ms`],
    ['new map (P + NEP + NMEP), prepared radius', `${figures.newMapPreparedMs} ms (median of ${thresholds.length}, sorted)`],
    ['new map (P + NEP + NMEP), direct NMEP', `${figures.newMapDirectMs} ms (median of ${thresholds.length}, sorted)`],
    ['p10/p50/p90 grids', `${figures.percentiles3Ms} ms`],
    ['mean + spread', `${figures.meanSpreadMs} ms`],
    ['area products (disk of 40 cells)', `${figures.areaProductsMs} ms`],
  ]
  process.stdout.write('products benchmark\n' + rows.map(([k, v]) => `  ${k.padEnd(44)} ${v}`).join('\n') + '\n')
  return figures
}

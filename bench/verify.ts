// Verification scores and interpolation baselines: wall-clock figures from one run, reported
// with ratios to one real FFT-based spectrum of the same grid (the natural unit of this work).
import { upsample } from '../shared/numerics/interp/upsample'
import { blockAverage } from '../shared/numerics/interp/blockAverage'
import { crpsOfSorted } from '../shared/numerics/verify/crps'
import { radialSpectrum } from '../shared/numerics/verify/radialSpectrum'
import { scoreEnsemble } from '../shared/numerics/verify/scoreEnsemble'
import { fillStandardNormal } from '../shared/numerics/random/normal'
import { Xoshiro128 } from '../shared/numerics/random/xoshiro128'

function time(fn: () => unknown, repeat = 1): number {
  fn() // warm-up
  const t0 = performance.now()
  for (let r = 0; r < repeat; r++) fn()
  return (performance.now() - t0) / repeat
}

function noise(n: number, seed: number): Float64Array {
  return fillStandardNormal(new Xoshiro128(seed), new Float64Array(n))
}

export async function bench(): Promise<Record<string, number | string | boolean>> {
  const n = 512, members = 20
  const truth = noise(n * n, 1)
  const stack = { nx: n, ny: n, members: Array.from({ length: members }, (_, k) => noise(n * n, 10 + k)) }
  const psdMs = time(() => radialSpectrum(truth, n, n), 3)
  const scoreMs = time(() => scoreEnsemble(truth, stack, { threshold: 1, neighbourhoods: [1, 3, 5, 9, 17, 33] }))

  // CRPS per cell: sorting formula vs the O(N²) double sum, N = 100 members, 20 000 cells.
  const big = 100, cells = 20000
  const values = noise(big * cells, 3)
  const scratch = new Float64Array(big)
  // Includes the per-cell sort (copy + sort + the O(N) sum).
  const sortedMs = time(() => {
    let s = 0
    for (let c = 0; c < cells; c++) { scratch.set(values.subarray(c * big, (c + 1) * big)); scratch.sort(); s += crpsOfSorted(scratch, 0, big, 0, 'fair') }
    return s
  })
  const pairMs = time(() => {
    let s = 0
    for (let c = 0; c < cells; c++) {
      let d = 0, a = 0
      for (let i = 0; i < big; i++) { const x = values[c * big + i]!; a += Math.abs(x); for (let j = 0; j < big; j++) d += Math.abs(x - values[c * big + j]!) }
      s += a / big - d / (2 * big * (big - 1))
    }
    return s
  })

  // Baselines: 128² coarse → 1024² fine (b = 8).
  const b = 8, m = 128
  const coarse = blockAverage(noise(m * b * m * b, 4), m * b, m * b, b)
  const up = (method: 'nearest' | 'bilinear' | 'bicubic', preserveBlockMeans: boolean) => time(() => upsample(coarse, m, m, b, { method, preserveBlockMeans }), 3)
  const fig = {
    grid: `${n}x${n}`, members,
    spectrumMs: psdMs,
    scoreAllMs: scoreMs,
    scoreOverSpectrum: scoreMs / psdMs,
    crpsSortedMs: sortedMs, crpsPairsMs: pairMs, crpsPairsOverSorted: pairMs / sortedMs,
    upsampleGrid: `${m}x${m} -> ${m * b}x${m * b}`,
    nearestMs: up('nearest', false), bilinearMs: up('bilinear', false), bicubicMs: up('bicubic', false),
    bilinearPreservingMs: up('bilinear', true), bicubicPreservingMs: up('bicubic', true),
  }
  console.table(Object.entries(fig).map(([k, v]) => ({ figure: k, value: typeof v === 'number' ? Number(v.toFixed(2)) : v })))
  return fig
}

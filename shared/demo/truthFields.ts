/**
 * Invented high-resolution "truth" fields for the method check, on an 8× finer grid over the demo
 * region (256×256 cells of about 2.6 km). Two are weather-like: the large-scale structure of a demo
 * ensemble member (shared/demo/synthesise.ts, bicubic-interpolated to the fine grid) plus fine-scale
 * detail drawn as an unconditional Gaussian random field by circulant embedding (the engine's own
 * sampler, grf/downscaler.ts). The third is a pure Matérn-3/2 field whose covariance is known
 * exactly, where the method's assumptions hold. Everything is synthetic and deterministic. Pure.
 */
import { createDownscaler } from '../numerics/grf/downscaler'
import type { KernelParams } from '../numerics/grf/kernels'
import { upsample } from '../numerics/interp/upsample'
import { DEMO_GRID } from './region'
import { synthesiseDemoEnsembles, type DemoEnsemble, type DemoVariable } from './synthesise'

/** Keys of the demo truth fields, in the order synthesiseDemoTruths returns them. */
export const DEMO_TRUTH_KEYS = ['serevan-gust-front', 'serevan-temperature-range', 'synthetic-matern32'] as const

/** Fine cells per demo coarse cell along each axis. */
export const DEMO_TRUTH_REFINEMENT = 8

/** A fine truth field; grid and variable fields as for the demo ensembles (lon/lat: fine cell centres, degrees, ascending). */
export interface DemoTruth extends Pick<DemoEnsemble, 'variable' | 'standardName' | 'units' | 'nx' | 'ny' | 'lon' | 'lat'> {
  /** Stable identifier (kept in the database, used to avoid seeding twice). */
  key: string
  name: string
  description: string
  validTime: string
  /** Row-major ny×nx, j = 0 the southernmost row. */
  values: Float32Array
  /** The fine-scale detail that was added: what a method check should recover. */
  detail: { kernel: KernelParams['kernel']; lengthScaleCells: number; sigma: number }
}

/** Zero-mean unconditional GRF on the demo's fine grid (circulant embedding), reproducible from the seed. */
function fineDetail(kernel: KernelParams, seed: number): Float64Array {
  const { nx, ny } = DEMO_GRID
  const b = DEMO_TRUTH_REFINEMENT
  // The downscaler's set-up provides the embedding; the coarse values do not affect unconditional draws.
  const sampler = createDownscaler({ coarse: new Float64Array(nx * ny), nx, ny, factor: b, kernel, mean: 0 })
  return sampler.unconditional(seed)
}

/** The three demo truth fields. */
export function synthesiseDemoTruths(): DemoTruth[] {
  const { nx, ny, west, south, dlon, dlat } = DEMO_GRID
  const b = DEMO_TRUTH_REFINEMENT
  const fnx = nx * b, fny = ny * b
  const lon = Float64Array.from({ length: fnx }, (_, i) => west - dlon / 2 + ((i + 0.5) * dlon) / b)
  const lat = Float64Array.from({ length: fny }, (_, j) => south - dlat / 2 + ((j + 0.5) * dlat) / b)
  // One member, the third lead time: the front lies across the middle of the region.
  const lead = 2
  const ensembles = synthesiseDemoEnsembles({ members: 1, leadTimes: lead + 1, seed: 20311203 })
  const largeScale = (variable: DemoVariable) => {
    const e = ensembles.find((x) => x.variable === variable)!
    return { field: upsample(Float64Array.from(e.fields[lead]!), nx, ny, b, { method: 'bicubic' }), validTime: e.leadTimes[lead]! }
  }
  const common = { nx: fnx, ny: fny, lon, lat }

  const gust = largeScale('gust')
  const gustDetail = { kernel: 'matern32' as const, lengthScaleCells: 8, sigma: 2.2 }
  const gd = fineDetail({ kernel: gustDetail.kernel, lengthScale: gustDetail.lengthScaleCells, variance: gustDetail.sigma ** 2 }, 101)
  const temperature = largeScale('temperature')
  const tempDetail = { kernel: 'matern52' as const, lengthScaleCells: 12, sigma: 0.9 }
  const td = fineDetail({ kernel: tempDetail.kernel, lengthScale: tempDetail.lengthScaleCells, variance: tempDetail.sigma ** 2 }, 202)
  const knownDetail = { kernel: 'matern32' as const, lengthScaleCells: 16, sigma: 2.5 }
  const kd = fineDetail({ kernel: knownDetail.kernel, lengthScale: knownDetail.lengthScaleCells, variance: knownDetail.sigma ** 2 }, 303)

  return [
    {
      key: DEMO_TRUTH_KEYS[0],
      name: 'Serevan Coast — gusts along a front, fine truth (invented demo)',
      description: 'Invented: a demo gust field with Matérn-3/2 detail (ℓ ≈ 21 km, σ 2.2 m/s) added on the fine grid.',
      variable: 'gust', standardName: 'wind_speed_of_gust', units: 'm s-1', validTime: gust.validTime, ...common,
      // Gusts are never below 0.5 m/s in the demo (as for the coarse ensembles).
      values: Float32Array.from(gust.field, (v, k) => Math.max(0.5, v + gd[k]!)),
      detail: gustDetail,
    },
    {
      key: DEMO_TRUTH_KEYS[1],
      name: 'Serevan Coast — 2 m temperature over the Kaldor Range, fine truth (invented demo)',
      description: 'Invented: a demo 2 m temperature field with Matérn-5/2 detail (ℓ ≈ 31 km, σ 0.9 °C) added on the fine grid.',
      variable: 'temperature', standardName: 'air_temperature', units: 'degC', validTime: temperature.validTime, ...common,
      values: Float32Array.from(temperature.field, (v, k) => v + td[k]!),
      detail: tempDetail,
    },
    {
      key: DEMO_TRUTH_KEYS[2],
      name: 'Synthetic Matérn-3/2 field with known covariance (invented demo)',
      description: 'Synthetic, not a weather situation: 8 °C plus a Matérn-3/2 random field (ℓ ≈ 41 km, σ 2.5 °C) exactly as the method assumes.',
      variable: 'temperature', standardName: 'air_temperature', units: 'degC', validTime: temperature.validTime, ...common,
      values: Float32Array.from(kd, (v) => 8 + v),
      detail: knownDetail,
    },
  ]
}

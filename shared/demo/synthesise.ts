/**
 * Synthetic coarse ensembles for the invented demo region, built with Tessera's own numerics:
 * a physically plausible mean state (land–sea contrast, orography, a front crossing the region)
 * plus correlated member perturbations drawn from a Matérn-3/2 Gaussian random field by dense
 * Cholesky factorisation. Deterministic from the seed. Pure; no I/O.
 */
import { choleskyFactor } from '../numerics/linalg/cholesky'
import { correlationAt } from '../numerics/grf/kernels'
import { Xoshiro128 } from '../numerics/random/xoshiro128'
import { fillStandardNormal } from '../numerics/random/normal'
import { DEMO_GRID, KALDOR_RIDGE, SEREVAN_COAST } from './region'

export type DemoVariable = 'gust' | 'temperature' | 'precipitation'

export interface DemoEnsemble {
  variable: DemoVariable
  /** CF standard name and canonical units of the fields. */
  standardName: string
  units: string
  nx: number
  ny: number
  lon: Float64Array
  lat: Float64Array
  referenceTime: string
  leadTimes: string[]
  forecastPeriodsHours: number[]
  members: number
  /** fields[t·members + m], row-major ny×nx, j = 0 the southernmost row. */
  fields: Float32Array[]
}

function pointInPolygon(lon: number, lat: number, ring: [number, number][]): boolean {
  let inside = false
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i]!, [xj, yj] = ring[j]!
    if ((yi > lat) !== (yj > lat) && lon < ((xj - xi) * (lat - yi)) / (yj - yi) + xi) inside = !inside
  }
  return inside
}

function distanceToPolylineKm(lon: number, lat: number, line: [number, number][]): number {
  const kx = 111.32 * Math.cos((lat * Math.PI) / 180), ky = 110.57
  let best = Infinity
  for (let k = 0; k + 1 < line.length; k++) {
    const [x0, y0] = line[k]!, [x1, y1] = line[k + 1]!
    const ax = (x1 - x0) * kx, ay = (y1 - y0) * ky, px = (lon - x0) * kx, py = (lat - y0) * ky
    const t = Math.max(0, Math.min(1, (px * ax + py * ay) / (ax * ax + ay * ay)))
    best = Math.min(best, Math.hypot(px - t * ax, py - t * ay))
  }
  return best
}

/** Land fraction (smoothed 0…1) and orography (m) on the coarse grid. */
export function demoSurface(): { land: Float64Array; height: Float64Array; lon: Float64Array; lat: Float64Array } {
  const { nx, ny, west, south, dlon, dlat } = DEMO_GRID
  const lon = Float64Array.from({ length: nx }, (_, i) => west + i * dlon)
  const lat = Float64Array.from({ length: ny }, (_, j) => south + j * dlat)
  const land = new Float64Array(nx * ny), height = new Float64Array(nx * ny)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const k = j * nx + i
    // Average a 3×3 sub-sampling of the cell so the coast is a fraction, as a model's land mask is.
    let inside = 0
    for (let a = -1; a <= 1; a++) for (let b = -1; b <= 1; b++) inside += pointInPolygon(lon[i]! + a * dlon / 3, lat[j]! + b * dlat / 3, SEREVAN_COAST) ? 1 : 0
    land[k] = inside / 9
    const d = distanceToPolylineKm(lon[i]!, lat[j]!, KALDOR_RIDGE)
    height[k] = land[k]! * (1900 * Math.exp(-(d * d) / (2 * 28 * 28)) + 180)
  }
  return { land, height, lon, lat }
}

/** Correlated N(0,1) fields on the coarse grid: Matérn-3/2 with length scale ℓ in coarse cells. */
function perturbationSampler(nx: number, ny: number, lengthScale: number) {
  const n = nx * ny
  const cov = new Float64Array(n * n)
  for (let a = 0; a < n; a++) for (let b = 0; b <= a; b++) {
    const r = Math.hypot((a % nx) - (b % nx), Math.floor(a / nx) - Math.floor(b / nx))
    const c = correlationAt({ kernel: 'matern32', lengthScale, variance: 1 }, r) + (a === b ? 1e-8 : 0)
    cov[a * n + b] = c
    cov[b * n + a] = c
  }
  const L = choleskyFactor(cov, n)
  return (rng: Xoshiro128): Float64Array => {
    const z = fillStandardNormal(rng, new Float64Array(n))
    const out = new Float64Array(n)
    for (let a = 0; a < n; a++) { let s = 0; const row = a * n; for (let b = 0; b <= a; b++) s += L[row + b]! * z[b]!; out[a] = s }
    return out
  }
}

export interface DemoOptions { members?: number; leadTimes?: number; seed?: number; referenceTime?: string }

/** Lag-one (6-hour) correlation of each member's small-scale anomalies. */
const NOISE_PERSISTENCE = 0.8

/** Builds the three demo ensembles (gusts, 2 m temperature, 6-hour precipitation). */
export function synthesiseDemoEnsembles(opts: DemoOptions = {}): DemoEnsemble[] {
  const members = opts.members ?? 18
  const leads = opts.leadTimes ?? 4
  const seed = opts.seed ?? 20311114
  const referenceTime = opts.referenceTime ?? '2031-11-14T00:00:00Z'
  const { nx, ny } = DEMO_GRID
  const { land, height, lon, lat } = demoSurface()
  const periods = Array.from({ length: leads }, (_, t) => 6 * (t + 1))
  const leadTimes = periods.map((h) => new Date(Date.parse(referenceTime) + h * 3600_000).toISOString().replace('.000Z', 'Z'))
  const sample = perturbationSampler(nx, ny, 3)
  const rng = new Xoshiro128(seed)
  const out: DemoEnsemble[] = []
  // Each member's storm/front is displaced and timed slightly differently (the ensemble's spread).
  const memberShift = Array.from({ length: members }, () => ({ dx: (rng.nextDouble() - 0.5) * 6, dy: (rng.nextDouble() - 0.5) * 5, amp: 0.75 + 0.5 * rng.nextDouble(), temp: (rng.nextDouble() - 0.5) * 2.4 }))
  const frontPosition = (t: number, m: number, i: number, j: number) => {
    // A front moving from south-west to north-east, about 5 coarse cells per 6 h.
    const s = memberShift[m]!
    return ((i - s.dx) + (j - s.dy)) / Math.SQRT2 - (4 + 5.2 * t)
  }
  for (const variable of ['gust', 'temperature', 'precipitation'] as DemoVariable[]) {
    const fields: Float32Array[] = []
    // A member's small-scale anomalies persist from one 6-hour step to the next (AR(1), correlation
    // NOISE_PERSISTENCE), as a model trajectory's do, rather than being redrawn at each lead time.
    const previous: [Float64Array, Float64Array][] = []
    for (let t = 0; t < leads; t++) for (let m = 0; m < members; m++) {
      let noise = sample(rng), noise2 = sample(rng)
      const before = previous[m]
      if (before) {
        const keep = NOISE_PERSISTENCE, fresh = Math.sqrt(1 - NOISE_PERSISTENCE ** 2)
        noise = noise.map((v, k) => keep * before[0][k]! + fresh * v)
        noise2 = noise2.map((v, k) => keep * before[1][k]! + fresh * v)
      }
      previous[m] = [noise, noise2]
      const s = memberShift[m]!
      const f = new Float32Array(nx * ny)
      for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
        const k = j * nx + i
        const sea = 1 - land[k]!, h = height[k]!
        const d = frontPosition(t, m, i, j)
        if (variable === 'gust') {
          const storm = 13 * s.amp * Math.exp(-(d * d) / (2 * 3.2 * 3.2))
          const v = 11 + 7 * sea + 5.5 * (h / 1000) + storm + 2.2 * noise[k]!
          f[k] = Math.max(0.5, v)
        } else if (variable === 'temperature') {
          const behindFront = 1 / (1 + Math.exp(d / 1.5))
          f[k] = 7.5 - 0.0065 * h + 1.5 * sea - 5.5 * behindFront + s.temp + 1.1 * noise[k]! - 0.6 * t
        } else {
          const band = 2.1 * s.amp * Math.exp(-(d * d) / (2 * 2.4 * 2.4))
          const uplift = 0.9 * (h / 1000) * Math.exp(-(d * d) / (2 * 6 * 6))
          const latent = -0.7 + band + uplift + 0.75 * noise2[k]!
          f[k] = latent > 0 ? 4.5 * Math.pow(latent, 1.4) : 0
        }
      }
      fields.push(f)
    }
    out.push({
      variable,
      standardName: variable === 'gust' ? 'wind_speed_of_gust' : variable === 'temperature' ? 'air_temperature' : 'precipitation_amount',
      units: variable === 'gust' ? 'm s-1' : variable === 'temperature' ? 'degC' : 'mm',
      nx, ny, lon, lat, referenceTime, leadTimes, forecastPeriodsHours: periods, members, fields,
    })
  }
  return out
}

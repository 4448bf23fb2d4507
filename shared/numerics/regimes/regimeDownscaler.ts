/**
 * Conditional simulation of a non-stationary field by blending local conditional simulations
 * (windows and weights: regimeWindows.ts; local priors: fitRegimes.ts). Each window i is downscaled on
 * its domain (support + halo) by the exact engine (grf/downscaler.ts) with its own prior, giving a
 * conditional mean mᵢ and independent samples xᵢ (own seeds); with the block-constant partition of unity
 * wᵢ(B) (Σᵢ wᵢ = 1 on every block), the blended sample is
 *     x = Σᵢ wᵢ mᵢ + Σᵢ wᵢ (xᵢ − mᵢ) / √(Σᵢ wᵢ²).
 * Exactness: every window conditions on every block where it has weight, so A mᵢ = y and A(xᵢ − mᵢ) = 0
 * there; weights constant on a block pass through the block mean, hence A x = Σᵢ wᵢ y = y on every
 * observed block (to rounding; a final uniform projection removes the rounding and is reported).
 * Variance: the residuals are independent, so Var x = Σᵢ wᵢ² vᵢ / Σᵢ wᵢ² — the weighted mean of the local
 * conditional variances vᵢ (exactly vᵢ where one window has all the weight); `std()` returns this exactly.
 * This is the moving-window approach of Fuentes (2002) used generatively (local stationary models, mixed
 * by smooth weights); the blend is a valid Gaussian field (a sum of independent ones), though not the
 * exact posterior of one global non-stationary prior. Where the weights change from block to block, the
 * residual weights wᵢ/√Σw² step slightly at block edges (ramp of T blocks: steps of about 1/T).
 *
 * Fine arrays: row-major (b·nx)×(b·ny) as in the engine. Window models are rebuilt on demand unless their
 * tori fit the cache budget.
 */
import { blockMeans, createDownscaler, type Downscaler, type DownscalerOptions, type WhiteNoiseSource } from '../grf/downscaler'
import type { KernelParams } from '../grf/kernels'
import { cropCoarse, type RegimeLayout, type RegimeWindow } from './regimeWindows'

export interface RegimeDownscalerSpec {
  /** Coarse field y, row-major nx×ny, NaN = missing. */
  coarse: Float64Array
  nx: number
  ny: number
  factor: number
  layout: RegimeLayout
  /** Prior of each window of the layout (same order). */
  priors: { kernel: KernelParams; mean: number }[]
  options?: DownscalerOptions
  /** Largest total torus size (points) of window models kept between calls (default 2^22). */
  cachePoints?: number
}

export interface RegimeDiagnostics {
  windows: number
  /** Per window: solver, torus, added nugget (from the engine's diagnostics). */
  perWindow: { index: number; solver: string; torus: [number, number]; addedNugget: number; blockMeanError: number }[]
  /** Largest |block mean − y| before the final projection (rounding of the blend), and after it. */
  blockMeanCorrection: number
  blockMeanError: number
  /** Window-model builds so far (more than `windows` when the cache budget is exceeded). */
  builds: number
}

export interface RegimeDownscaler {
  /** Fine grid size. */
  readonly nx: number
  readonly ny: number
  mean(): Float64Array
  /** Pointwise std of the blend, √(Σ wᵢ² vᵢ / Σ wᵢ²) with the engine's posterior std of each window. */
  std(): Float64Array
  /** Samples 0…count−1; window i uses seed windowSeed(seed, i). */
  samples(count: number, seed: number): Float64Array[]
  sample(seed: number, index?: number): Float64Array
  /** Samples from supplied white noise, one independent source per window (e.g. time-coherent streams). */
  samplesFromNoise(count: number, noiseFor: (window: number) => WhiteNoiseSource): Float64Array[]
  /** x' = x + Σᵢ wᵢ Kᵢ Aᵀ Cᵢ⁻¹ Δ: re-conditioning to changed block-mean targets (A x' = A x + Δ on observed blocks). */
  recondition(fields: Float64Array[], changes: Float64Array[]): Float64Array[]
  readonly diagnostics: RegimeDiagnostics
}

/** Seed of window i's residuals for a sample seed (splitmix-style mixing; distinct windows give independent streams). */
export function windowSeed(seed: number, window: number): number {
  let h = (seed ^ Math.imul(window + 1, 0x9e3779b1)) >>> 0
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b) >>> 0
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35) >>> 0
  return (h ^ (h >>> 16)) >>> 0
}

/** Builds the blended sampler; window models are built lazily (see the module comment). Throws if a window has no observed cell. */
export function createRegimeDownscaler(spec: RegimeDownscalerSpec): RegimeDownscaler {
  return new BlendedDownscaler(spec)
}

class BlendedDownscaler implements RegimeDownscaler {
  readonly nx: number
  readonly ny: number
  readonly diagnostics: RegimeDiagnostics
  /** Σᵢ wᵢ(B)² per coarse block. */
  private readonly sumSquares: Float64Array
  private readonly cache = new Map<number, Downscaler>()
  private cachedPoints = 0
  private cachedMean?: Float64Array

  constructor(private readonly spec: RegimeDownscalerSpec) {
    const { nx, ny, factor, layout, priors, coarse } = spec
    if (layout.nx !== nx || layout.ny !== ny) throw new Error(`layout is for ${layout.nx}×${layout.ny}, field is ${nx}×${ny}`)
    if (priors.length !== layout.windows.length) throw new Error(`${priors.length} priors for ${layout.windows.length} windows`)
    if (coarse.length !== nx * ny) throw new Error(`coarse field has ${coarse.length} values, expected ${nx * ny}`)
    for (const w of layout.windows) {
      if (!cropCoarse(coarse, nx, w.domain).some(Number.isFinite)) throw new Error(`regime window ${w.index} has no observed coarse cell to condition on`)
    }
    this.nx = nx * factor
    this.ny = ny * factor
    this.sumSquares = new Float64Array(nx * ny)
    for (const w of layout.windows) this.forSupport(w, (B, weight) => { this.sumSquares[B]! += weight * weight })
    this.diagnostics = { windows: layout.windows.length, perWindow: [], blockMeanCorrection: 0, blockMeanError: 0, builds: 0 }
  }

  mean(): Float64Array {
    if (!this.cachedMean) {
      const out = new Float64Array(this.nx * this.ny)
      this.eachWindow((d, w) => this.accumulate(out, d.mean(), w, 'mean'))
      this.project(out)
      this.cachedMean = out
    }
    return Float64Array.from(this.cachedMean)
  }

  std(): Float64Array {
    const variance = new Float64Array(this.nx * this.ny)
    this.eachWindow((d, w) => this.accumulate(variance, d.std().map((s) => s * s), w, 'variance'))
    return variance.map((v) => Math.sqrt(Math.max(v, 0)))
  }

  samples(count: number, seed: number): Float64Array[] {
    return this.blend(count, (d, w) => d.samples(count, windowSeed(seed, w.index)))
  }

  sample(seed: number, index = 0): Float64Array {
    return this.blend(1, (d, w) => [d.sample(windowSeed(seed, w.index), index)])[0]!
  }

  samplesFromNoise(count: number, noiseFor: (window: number) => WhiteNoiseSource): Float64Array[] {
    return this.blend(count, (d, w) => d.samplesFromNoise(count, noiseFor(w.index)))
  }

  recondition(fields: Float64Array[], changes: Float64Array[]): Float64Array[] {
    if (fields.length !== changes.length) throw new Error(`recondition needs one change per field, got ${changes.length} for ${fields.length}`)
    const out = fields.map((f) => {
      if (f.length !== this.nx * this.ny) throw new Error(`field has ${f.length} values, expected ${this.nx * this.ny}`)
      return Float64Array.from(f)
    })
    if (fields.length === 0) return out
    const { nx } = this.spec
    this.eachWindow((d, w) => {
      const zero = new Float64Array(d.nx * d.ny)
      const corrections = d.recondition(changes.map(() => zero), changes.map((c) => cropCoarse(c, nx, w.domain)))
      corrections.forEach((c, q) => this.accumulate(out[q]!, c, w, 'mean'))
    })
    return out
  }

  /** Blended samples from each window's draws (count fields per window, same index = same sample). */
  private blend(count: number, draw: (d: Downscaler, w: RegimeWindow) => Float64Array[]): Float64Array[] {
    const mean = new Float64Array(this.nx * this.ny)
    const out = Array.from({ length: count }, () => new Float64Array(this.nx * this.ny))
    this.eachWindow((d, w) => {
      const m = d.mean()
      this.accumulate(mean, m, w, 'mean')
      const xs = draw(d, w)
      for (let s = 0; s < count; s++) {
        const x = xs[s]!
        for (let k = 0; k < x.length; k++) x[k]! -= m[k]!
        this.accumulate(out[s]!, x, w, 'residual')
      }
    })
    for (const x of out) { for (let k = 0; k < x.length; k++) x[k]! += mean[k]!; this.project(x) }
    if (!this.cachedMean) { this.project(mean); this.cachedMean = mean }
    return out
  }

  /** Calls fn(block index, weight) for every block of a window's support. */
  private forSupport(w: RegimeWindow, fn: (block: number, weight: number) => void): void {
    const { x0, x1, y0, y1 } = w.support, width = x1 - x0
    for (let J = y0; J < y1; J++) for (let I = x0; I < x1; I++) fn(J * this.spec.nx + I, w.weights[(J - y0) * width + I - x0]!)
  }

  /**
   * target += coefficient · local on the window's support blocks, local being a field on the window's domain.
   * Coefficients: 'mean' wᵢ, 'residual' wᵢ/√Σw², 'variance' wᵢ²/Σw².
   */
  private accumulate(target: Float64Array, local: Float64Array, w: RegimeWindow, kind: 'mean' | 'residual' | 'variance'): void {
    const b = this.spec.factor, fineNx = this.nx
    const localNx = (w.domain.x1 - w.domain.x0) * b
    this.forSupport(w, (B, weight) => {
      if (weight === 0) return
      const s2 = this.sumSquares[B]!
      const c = kind === 'mean' ? weight : kind === 'residual' ? weight / Math.sqrt(s2) : (weight * weight) / s2
      const I = B % this.spec.nx, J = (B - I) / this.spec.nx
      for (let q = 0; q < b; q++) {
        const row = (J * b + q) * fineNx + I * b
        const localRow = ((J - w.domain.y0) * b + q) * localNx + (I - w.domain.x0) * b
        for (let p = 0; p < b; p++) target[row + p]! += c * local[localRow + p]!
      }
    })
  }

  /** Visits every window with its model (cached while the budget allows, else built and dropped). */
  private eachWindow(fn: (d: Downscaler, w: RegimeWindow) => void): void {
    for (const w of this.spec.layout.windows) {
      let d = this.cache.get(w.index)
      if (!d) {
        d = this.build(w)
        const points = d.model.embedding.nx * d.model.embedding.ny
        if (this.cachedPoints + points <= (this.spec.cachePoints ?? 2 ** 22)) { this.cache.set(w.index, d); this.cachedPoints += points }
      }
      fn(d, w)
      this.recordWindow(d, w)
    }
  }

  private build(w: RegimeWindow): Downscaler {
    const { coarse, nx, factor, options } = this.spec
    const prior = this.spec.priors[w.index]!
    this.diagnostics.builds++
    const { domain } = w
    return createDownscaler({
      coarse: cropCoarse(coarse, nx, domain), nx: domain.x1 - domain.x0, ny: domain.y1 - domain.y0, factor,
      kernel: prior.kernel, mean: prior.mean, ...(options ? { options } : {}),
    })
  }

  private recordWindow(d: Downscaler, w: RegimeWindow): void {
    const g = d.diagnostics
    const entry = { index: w.index, solver: g.solver, torus: g.torus, addedNugget: g.addedNugget, blockMeanError: g.blockMeanError }
    const list = this.diagnostics.perWindow
    const at = list.findIndex((e) => e.index === w.index)
    if (at >= 0) list[at] = entry
    else list.push(entry)
  }

  /** Adds each observed block's remaining deficit y − (block mean) uniformly (rounding only), and records it. */
  private project(field: Float64Array): void {
    const { nx, ny, factor: b, coarse } = this.spec
    const before = blockMeans(field, this.nx, nx, ny, b)
    let correction = this.diagnostics.blockMeanCorrection
    for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
      const k = J * nx + I
      if (!Number.isFinite(coarse[k]!)) continue
      const delta = coarse[k]! - before[k]!
      correction = Math.max(correction, Math.abs(delta))
      for (let q = 0; q < b; q++) {
        const row = (J * b + q) * this.nx + I * b
        for (let p = 0; p < b; p++) field[row + p]! += delta
      }
    }
    this.diagnostics.blockMeanCorrection = correction
    const after = blockMeans(field, this.nx, nx, ny, b)
    let err = this.diagnostics.blockMeanError
    for (let k = 0; k < after.length; k++) if (Number.isFinite(coarse[k]!)) err = Math.max(err, Math.abs(after[k]! - coarse[k]!))
    this.diagnostics.blockMeanError = err
  }
}

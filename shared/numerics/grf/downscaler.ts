/**
 * Conditional simulation of a fine Gaussian random field given its exact b×b block means, by
 * conditioning by kriging (Journel 1974; Hoffman & Ribak 1991, ApJ 380:L5):
 *   z_c = m + z + K Aᵀ C⁻¹ (y − A m − A z),   mean = m + K Aᵀ C⁻¹ (y − A m),
 * with z an unconditional zero-mean sample drawn by circulant embedding on a padded torus
 * (Dietrich & Newsam 1997). Everything after the noise is done in the Fourier domain: the sample's
 * spectrum is drawn directly, its block means are read by folding the spectrum onto the coarse torus,
 * the coarse system is solved, and the correction K Aᵀ w (a convolution) is added to the spectrum, so a
 * conditional sample costs one fine inverse FFT; one complex FFT carries two independent samples
 * (real and imaginary parts). Fine arrays are row-major (b·nx)×(b·ny), index j·(b·nx) + i.
 *
 * In exact arithmetic every result averages back to y on every observed block. In floating point the
 * residual is ε·‖C‖·‖C⁻¹r‖, tiny for well-conditioned C but up to ~1e-7·|y| when C is near the
 * condition bound (smooth kernels, data rougher than the prior). A final projection adds each block's
 * residual uniformly to its cells, so block means hold to rounding unconditionally; the largest
 * correction applied is reported (`blockMeanCorrection`) so it is never hidden.
 */
import { fft2d, fft2dRowPruned } from '../fft/fft2d'
import { Xoshiro128 } from '../random/xoshiro128'
import { fillStandardNormal } from '../random/normal'
import { buildConditioningModel, type ConditioningModel, type ConditioningSpec } from './conditioningModel'
import { posteriorStd, type PosteriorStdOptions, type PosteriorStdResult } from './posteriorStd'

export type { ConditioningSpec as DownscalerSpec, LinearTrend, ConditioningOptions as DownscalerOptions } from './conditioningModel'

export interface DownscalerDiagnostics {
  solver: 'kronecker' | 'dense' | 'pcg'
  /** Set when the solver changed route on its own (PCG → dense, or PCG preconditioner → torus inverse). */
  solverNote?: string
  /** PCG only: the preconditioner in use (see pcgCoarseSolver.ts). */
  preconditioner?: string
  /** Largest PCG iteration count of any solve so far (0 for direct solvers). */
  iterations: number
  /** Largest relative residual ‖r − C w‖/‖r‖ reported by the solver (NaN for direct solvers). */
  residual: number
  /** Fine torus and coarse torus sizes. */
  torus: [number, number]
  coarseTorus: [number, number]
  paddingEnlargements: number
  minEigenvalue: number
  maxEigenvalue: number
  /** Bound on the covariance change from clamping negative embedding eigenvalues (field units²). */
  clampBound: number
  /** Nugget variances (fine cells): from the kernel, and added to keep cond(C) ≤ `conditionBound`. */
  kernelNugget: number
  addedNugget: number
  conditionBound: number
  /** Largest |block mean − y| before the final block projection (the kriging solve's own accuracy). */
  blockMeanCorrection: number
  /** Largest |block mean − y| of the returned mean and samples so far (observed blocks). */
  blockMeanError: number
  /** Filled by std(): method and a bound on |std − exact std| (0 = exact to rounding). */
  stdMethod?: PosteriorStdResult['method']
  stdErrorBound?: number
  /** Window method: certified bound away from the grid edges. */
  stdInteriorErrorBound?: number
  stdWindow?: number
}

/**
 * Fills two planes (re, im) of independent standard normal white noise on the sampling torus
 * (torusNx × torusNy, row-major; the fine window is the top-left windowNx × windowNy corner) for
 * sample pair `pair` (samples 2·pair and 2·pair + 1).
 */
export type WhiteNoiseSource = (pair: number, re: Float64Array, im: Float64Array, torusNx: number, torusNy: number, windowNx: number, windowNy: number) => void

/**
 * Fills (re, im) with the torus spectrum's white noise for sample pair `pair`: independent standard
 * normals per Fourier mode and plane, as the seeded draw uses (torusNx × torusNy, row-major). The
 * DFT of circular complex white noise is again circular complex white noise, so this is the same in
 * law as transforming spatial noise, without the forward FFT.
 */
export type SpectralNoiseSource = (pair: number, re: Float64Array, im: Float64Array, torusNx: number, torusNy: number) => void

export interface Downscaler {
  /** Fine grid size (b·nx × b·ny). */
  readonly nx: number
  readonly ny: number
  /** Conditional mean on the fine grid. */
  mean(): Float64Array
  /** Pointwise conditional standard deviation (exact or with a certified bound, see diagnostics). */
  std(options?: PosteriorStdOptions): Float64Array
  /** Conditional sample number `index` (default 0) of `seed`; reproducible on its own. */
  sample(seed: number, index?: number): Float64Array
  /** Samples 0…count−1 of `seed` (the same as sample(seed, k)), two per complex FFT. */
  samples(count: number, seed: number): Float64Array[]
  /** The zero-mean unconditional field that sample(seed, index) conditions (for checks). */
  unconditional(seed: number, index?: number): Float64Array
  /** Conditions a given zero-mean unconditional fine field z in the spatial domain: m + z + K Aᵀ C⁻¹(y − A m − A z). */
  condition(z: Float64Array): Float64Array
  /**
   * Conditional samples 0…count−1 coloured from supplied spatial white noise instead of the seeded
   * spectrum: the unconditional field of pair p is K^{1/2} w with w the two planes `noise` fills
   * (circulant square root on the torus, one extra forward FFT per pair). For time-coherent streams.
   */
  samplesFromNoise(count: number, noise: WhiteNoiseSource): Float64Array[]
  /** Conditional samples 0…count−1 from supplied spectral white noise (no forward FFT). For time-coherent streams on a fixed torus. */
  samplesFromSpectralNoise(count: number, noise: SpectralNoiseSource): Float64Array[]
  /**
   * Re-conditions fields to changed block-mean targets: x' = x + K Aᵀ C⁻¹ Δ for each field x and its
   * coarse change Δ (row-major nx×ny, missing cells ignored). Linear, so A x' = A x + Δ on observed
   * blocks; costs one coarse solve and one fine FFT per two fields. Results are new arrays.
   */
  recondition(fields: Float64Array[], changes: Float64Array[]): Float64Array[]
  readonly diagnostics: DownscalerDiagnostics
  /** The set-up, for the posterior-std module and tests. */
  readonly model: ConditioningModel
}

/** Builds the set-up once; mean, std and samples reuse it. Throws a clear Error on invalid input. */
export function createDownscaler(spec: ConditioningSpec): Downscaler {
  const model = buildConditioningModel(spec)
  return new TorusDownscaler(model)
}

class TorusDownscaler implements Downscaler {
  readonly nx: number
  readonly ny: number
  readonly diagnostics: DownscalerDiagnostics
  private readonly sqrtScaledLambda: Float64Array
  private readonly re: Float64Array
  private readonly im: Float64Array
  private readonly coarseRe: Float64Array
  private readonly coarseIm: Float64Array
  private cachedMean?: Float64Array
  private cachedStd?: Float64Array

  constructor(readonly model: ConditioningModel) {
    this.nx = model.fineNx
    this.ny = model.fineNy
    const { embedding: e, lambda, blocks } = model
    const M = lambda.length
    this.sqrtScaledLambda = new Float64Array(M)
    // z = IFFT(√(M λ) ξ), ξ complex with independent N(0,1) parts: Re z and Im z each have covariance K.
    for (let k = 0; k < M; k++) this.sqrtScaledLambda[k] = Math.sqrt(M * lambda[k]!)
    this.re = new Float64Array(M)
    this.im = new Float64Array(M)
    this.coarseRe = new Float64Array(blocks.coarseNx * blocks.coarseNy)
    this.coarseIm = new Float64Array(blocks.coarseNx * blocks.coarseNy)
    this.diagnostics = {
      solver: model.solver.method, iterations: 0, residual: NaN,
      torus: [e.nx, e.ny], coarseTorus: [blocks.coarseNx, blocks.coarseNy], paddingEnlargements: e.enlargements,
      minEigenvalue: e.minEigenvalue, maxEigenvalue: e.maxEigenvalue, clampBound: e.clampBound,
      kernelNugget: model.kernelNugget, addedNugget: model.addedNugget, conditionBound: model.conditionBound,
      blockMeanCorrection: 0, blockMeanError: 0,
    }
  }

  mean(): Float64Array {
    if (!this.cachedMean) {
      const [w] = this.solve([this.model.baseResidual])
      const [corr] = this.krigingCorrection([w!])
      const m = this.model.priorFine
      this.cachedMean = corr!.map((v, k) => v + m[k]!)
      this.enforceBlockMeans(this.cachedMean)
    }
    return Float64Array.from(this.cachedMean)
  }

  std(options?: PosteriorStdOptions): Float64Array {
    if (!this.cachedStd || options) {
      const result = posteriorStd(this.model, options)
      this.diagnostics.stdMethod = result.method
      this.diagnostics.stdErrorBound = result.errorBound
      this.diagnostics.stdWindow = result.window
      this.diagnostics.stdInteriorErrorBound = result.interiorErrorBound
      if (options) return result.std
      this.cachedStd = result.std
    }
    return Float64Array.from(this.cachedStd)
  }

  sample(seed: number, index = 0): Float64Array {
    checkIndex(index)
    const pair = this.conditionalPair(seed, Math.floor(index / 2))
    return pair[index % 2]!
  }

  samples(count: number, seed: number): Float64Array[] {
    if (!Number.isInteger(count) || count < 0) throw new Error(`sample count must be a non-negative integer, got ${count}`)
    const out: Float64Array[] = []
    for (let p = 0; 2 * p < count; p++) {
      const [a, b] = this.conditionalPair(seed, p)
      out.push(a!)
      if (2 * p + 1 < count) out.push(b!)
    }
    return out
  }

  unconditional(seed: number, index = 0): Float64Array {
    checkIndex(index)
    this.drawSpectrum(seed, Math.floor(index / 2))
    this.inverseToWindow()
    return this.window(index % 2 === 0 ? this.re : this.im)
  }

  condition(z: Float64Array): Float64Array {
    if (z.length !== this.nx * this.ny) throw new Error(`field has ${z.length} values, expected ${this.nx * this.ny}`)
    const { spec, baseResidual, covariance } = this.model
    const means = blockMeans(z, this.nx, spec.nx, spec.ny, spec.factor)
    const r = baseResidual.map((v, k) => (covariance.observed[k] ? v - means[k]! : 0))
    const [w] = this.solve([r])
    const [corr] = this.krigingCorrection([w!])
    const m = this.model.priorFine
    const out = corr!.map((v, k) => v + z[k]! + m[k]!)
    this.enforceBlockMeans(out)
    return out
  }

  /** Draws the spectrum of a pair of unconditional samples into (re, im). Stream = pair index. */
  private drawSpectrum(seed: number, pair: number): void {
    const rng = new Xoshiro128(seed, pair)
    fillStandardNormal(rng, this.re)
    fillStandardNormal(rng, this.im)
    const s = this.sqrtScaledLambda, re = this.re, im = this.im
    for (let k = 0; k < s.length; k++) { re[k]! *= s[k]!; im[k]! *= s[k]! }
  }

  /** Draws the spectrum of pair `pair` from spatial white noise: √λ · FFT(w₁ + i w₂). */
  private drawSpectrumFromNoise(noise: WhiteNoiseSource, pair: number): void {
    const { embedding: e } = this.model
    this.re.fill(0); this.im.fill(0)
    noise(pair, this.re, this.im, e.nx, e.ny, this.nx, this.ny)
    fft2d(this.re, this.im, e.nx, e.ny)
    // √(Mλ)/√M = √λ: C^{1/2} w = IFFT(√λ FFT(w)) has covariance IFFT diag(λ) FFT = C.
    const s = this.sqrtScaledLambda, re = this.re, im = this.im, inv = 1 / Math.sqrt(s.length)
    for (let k = 0; k < s.length; k++) { const f = s[k]! * inv; re[k]! *= f; im[k]! *= f }
  }

  samplesFromNoise(count: number, noise: WhiteNoiseSource): Float64Array[] {
    return this.pairsDrawnBy(count, (p) => this.drawSpectrumFromNoise(noise, p))
  }

  samplesFromSpectralNoise(count: number, noise: SpectralNoiseSource): Float64Array[] {
    return this.pairsDrawnBy(count, (p) => {
      const { embedding: e } = this.model
      noise(p, this.re, this.im, e.nx, e.ny)
      const s = this.sqrtScaledLambda, re = this.re, im = this.im
      for (let k = 0; k < s.length; k++) { re[k]! *= s[k]!; im[k]! *= s[k]! }
    })
  }

  /** Samples 0…count−1, pair p's spectrum put into (re, im) by draw(p). */
  private pairsDrawnBy(count: number, draw: (pair: number) => void): Float64Array[] {
    if (!Number.isInteger(count) || count < 0) throw new Error(`sample count must be a non-negative integer, got ${count}`)
    const out: Float64Array[] = []
    for (let p = 0; 2 * p < count; p++) {
      draw(p)
      const [a, b] = this.conditionDrawnPair()
      out.push(a)
      if (2 * p + 1 < count) out.push(b)
    }
    return out
  }

  recondition(fields: Float64Array[], changes: Float64Array[]): Float64Array[] {
    const { spec, covariance } = this.model
    const m = spec.nx * spec.ny, n = this.nx * this.ny
    if (fields.length !== changes.length) throw new Error(`recondition needs one change per field, got ${changes.length} for ${fields.length}`)
    const out: Float64Array[] = []
    for (let p = 0; p < fields.length; p += 2) {
      const rhs = changes.slice(p, p + 2).map((d) => {
        if (d.length !== m) throw new Error(`target change has ${d.length} values, expected ${m}`)
        return d.map((v, k) => (covariance.observed[k] ? v : 0))
      })
      const corrections = this.krigingCorrection(this.solve(rhs))
      corrections.forEach((c, q) => {
        const x = fields[p + q]!
        if (x.length !== n) throw new Error(`field has ${x.length} values, expected ${n}`)
        for (let k = 0; k < n; k++) c[k]! += x[k]!
        out.push(c)
      })
    }
    return out
  }

  /** Conditional samples 2p and 2p+1 of `seed`, with one fine inverse FFT. */
  private conditionalPair(seed: number, pair: number): [Float64Array, Float64Array] {
    this.drawSpectrum(seed, pair)
    return this.conditionDrawnPair()
  }

  /** Conditions the unconditional pair whose spectrum is in (re, im): one fine inverse FFT. */
  private conditionDrawnPair(): [Float64Array, Float64Array] {
    const { blocks, spec, baseResidual, covariance, priorFine } = this.model
    // Block means of both samples at once: fold onto the coarse torus, one small inverse FFT.
    blocks.foldBlockMeans(this.re, this.im, this.coarseRe, this.coarseIm)
    fft2d(this.coarseRe, this.coarseIm, blocks.coarseNx, blocks.coarseNy, true)
    const m = spec.nx * spec.ny
    const r1 = new Float64Array(m), r2 = new Float64Array(m)
    for (let J = 0; J < spec.ny; J++) for (let I = 0; I < spec.nx; I++) {
      const k = J * spec.nx + I
      if (!covariance.observed[k]) continue
      r1[k] = baseResidual[k]! - this.coarseRe[J * blocks.coarseNx + I]!
      r2[k] = baseResidual[k]! - this.coarseIm[J * blocks.coarseNx + I]!
    }
    const [w1, w2] = this.solve([r1, r2])
    this.coarseSpectrum(w1!, w2!)
    blocks.addLiftedCoarse(this.re, this.im, this.model.lambda, this.coarseRe, this.coarseIm)
    this.inverseToWindow()
    const a = this.window(this.re), b = this.window(this.im)
    for (let k = 0; k < a.length; k++) { a[k]! += priorFine[k]!; b[k]! += priorFine[k]! }
    this.enforceBlockMeans(a)
    this.enforceBlockMeans(b)
    return [a, b]
  }

  /** Fine-window fields K Aᵀ wⱼ for one or two coarse weight vectors (one complex FFT). */
  private krigingCorrection(ws: Float64Array[]): Float64Array[] {
    const { blocks, lambda } = this.model
    this.coarseSpectrum(ws[0]!, ws[1])
    this.re.fill(0); this.im.fill(0)
    blocks.addLiftedCoarse(this.re, this.im, lambda, this.coarseRe, this.coarseIm)
    this.inverseToWindow()
    return ws.length > 1 ? [this.window(this.re), this.window(this.im)] : [this.window(this.re)]
  }

  /** (coarseRe, coarseIm) ← DFT on the coarse torus of w1 + i·w2 (zero outside the window). */
  private coarseSpectrum(w1: Float64Array, w2?: Float64Array): void {
    const { spec, blocks } = this.model
    this.coarseRe.fill(0); this.coarseIm.fill(0)
    for (let J = 0; J < spec.ny; J++) for (let I = 0; I < spec.nx; I++) {
      this.coarseRe[J * blocks.coarseNx + I] = w1[J * spec.nx + I]!
      if (w2) this.coarseIm[J * blocks.coarseNx + I] = w2[J * spec.nx + I]!
    }
    fft2d(this.coarseRe, this.coarseIm, blocks.coarseNx, blocks.coarseNy)
  }

  private solve(rhs: Float64Array[]): Float64Array[] {
    const result = this.model.solver.solve(rhs)
    const d = this.diagnostics
    d.solver = this.model.solver.method
    if (this.model.solver.note) d.solverNote = this.model.solver.note
    d.preconditioner = this.model.solver.preconditioner
    d.iterations = Math.max(d.iterations, result.iterations)
    if (!Number.isNaN(result.residual)) d.residual = Number.isNaN(d.residual) ? result.residual : Math.max(d.residual, result.residual)
    return result.solutions
  }

  /** Inverse fine FFT of (re, im), exact on the window rows only (the rows below are never read): a quarter fewer row transforms. */
  private inverseToWindow(): void {
    const { embedding: e } = this.model
    fft2dRowPruned(this.re, this.im, e.nx, e.ny, this.ny, true)
  }

  /** Fine window (top-left corner of the torus) of a torus plane. */
  private window(plane: Float64Array): Float64Array {
    const tx = this.model.embedding.nx
    const out = new Float64Array(this.nx * this.ny)
    for (let j = 0; j < this.ny; j++) out.set(plane.subarray(j * tx, j * tx + this.nx), j * this.nx)
    return out
  }

  /** Adds y − (block mean) to every cell of each observed block, then records the remaining error. */
  private enforceBlockMeans(field: Float64Array): void {
    const { spec, covariance } = this.model
    const b = spec.factor
    const before = blockMeans(field, this.nx, spec.nx, spec.ny, b)
    let correction = this.diagnostics.blockMeanCorrection
    for (let J = 0; J < spec.ny; J++) for (let I = 0; I < spec.nx; I++) {
      const k = J * spec.nx + I
      if (!covariance.observed[k]) continue
      const delta = spec.coarse[k]! - before[k]!
      correction = Math.max(correction, Math.abs(delta))
      for (let q = 0; q < b; q++) {
        const row = (J * b + q) * this.nx + I * b
        for (let p = 0; p < b; p++) field[row + p]! += delta
      }
    }
    this.diagnostics.blockMeanCorrection = correction
    const after = blockMeans(field, this.nx, spec.nx, spec.ny, b)
    let err = this.diagnostics.blockMeanError
    for (let k = 0; k < after.length; k++) if (covariance.observed[k]) err = Math.max(err, Math.abs(after[k]! - spec.coarse[k]!))
    this.diagnostics.blockMeanError = err
  }
}

function checkIndex(index: number): void {
  if (!Number.isInteger(index) || index < 0) throw new Error(`sample index must be a non-negative integer, got ${index}`)
}

/** Means of each b×b block of a fine field (fine width fineNx), as a row-major nx×ny coarse field. */
export function blockMeans(field: Float64Array, fineNx: number, nx: number, ny: number, b: number): Float64Array {
  const out = new Float64Array(nx * ny)
  for (let J = 0; J < ny; J++) for (let q = 0; q < b; q++) {
    const row = (J * b + q) * fineNx
    for (let I = 0; I < nx; I++) {
      let s = 0
      const o = row + I * b
      for (let p = 0; p < b; p++) s += field[o + p]!
      out[J * nx + I]! += s
    }
  }
  const inv = 1 / (b * b)
  for (let k = 0; k < out.length; k++) out[k]! *= inv
  return out
}

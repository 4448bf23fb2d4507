/**
 * Set-up shared by the conditional mean, standard deviation and samples of a fine Gaussian random
 * field given exact b×b block means: the torus embedding of the prior covariance, the coarse
 * covariance C = A K Aᵀ of the observed blocks, a solver for C, and a numerical nugget when C is too
 * ill-conditioned to be solved to rounding.
 *
 * Conditioning number policy: by interlacing, the eigenvalues of C lie in [min γ, max γ] of the
 * coarse torus symbol γ. When max γ / min γ exceeds `maxCondition` (default 1e10), a white-noise
 * nugget τ is added to the fine kernel (k ← k + τ·δ), the smallest that brings the bound to
 * `maxCondition`; the model stays consistent (samples, C and the kriging correction all include it),
 * so block means are still reproduced to rounding. τ is reported in the diagnostics. For the
 * squared-exponential with ℓ of a few coarse cells this is typically 1e-8…1e-6 of σ².
 */
import { axisAlignedLengthScales, checkAnisotropy, covarianceFunction, decayRadius, type KernelParams } from './kernels'
import './maternGeneral' // installs the general-ν Matérn used by kernel 'matern'
import { embedCovariance, embedSeparableCovariance, type CirculantEmbedding, type EmbeddingOptions } from './circulantEmbedding'
import { coarseSymbol1d, TorusBlockOperator } from './torusBlockOperator'
import { CoarseCovariance, type CoarseSolver } from './coarseCovariance'
import { DenseCoarseSolver } from './denseCoarseSolver'
import { KroneckerCoarseSolver } from './kroneckerCoarseSolver'
import { PcgCoarseSolver, type PcgSolverOptions } from './pcgCoarseSolver'

/** Linear prior mean b0 + b1·x + b2·y with x = i, y = j the fine column and row index. */
export interface LinearTrend { b0: number; b1: number; b2: number }

export interface ConditioningOptions {
  /** Kernel decay tolerance defining the padding radius R (default 1e-12 of k(0)). */
  decayTolerance?: number
  embedding?: EmbeddingOptions
  /** Largest accepted bound on cond(C) before a numerical nugget is added (default 1e10). */
  maxCondition?: number
  /** Coarse solver: 'auto' (Kronecker for axis-aligned se on a complete grid, dense up to `denseLimit` cells, else PCG). */
  solver?: 'auto' | 'kronecker' | 'dense' | 'pcg'
  /** Observed-cell count up to which 'auto' uses the dense Cholesky (default 600). */
  denseLimit?: number
  /** Cell count up to which a failed PCG falls back to dense Cholesky (default 3000). */
  denseFallbackLimit?: number
  pcg?: PcgSolverOptions
}

export interface ConditioningSpec {
  /** Coarse field y, row-major nx×ny, NaN = missing (not conditioned on). */
  coarse: Float64Array
  nx: number
  ny: number
  /** Block factor b (integer 2…16): the fine grid is b·nx × b·ny. */
  factor: number
  kernel: KernelParams
  /** Prior mean: a constant or a linear trend in fine-cell coordinates. */
  mean: number | LinearTrend
  options?: ConditioningOptions
}

export interface ConditioningModel {
  spec: ConditioningSpec
  /** Fine window size. */
  fineNx: number
  fineNy: number
  embedding: CirculantEmbedding
  /** Torus spectrum including every nugget (λ ≥ 0, Nx×Ny). */
  lambda: Float64Array
  blocks: TorusBlockOperator
  covariance: CoarseCovariance
  solver: CoarseSolver
  /** Nugget variances: as given in the kernel, and added for conditioning (fine-cell variance). */
  kernelNugget: number
  addedNugget: number
  /** Bound on cond(C) after the nugget. */
  conditionBound: number
  /** Prior mean on the fine window and on the coarse blocks. */
  priorFine: Float64Array
  priorCoarse: Float64Array
  /** y − A m on observed cells, 0 at missing cells. */
  baseResidual: Float64Array
  /** For the separable (se) route: 1-D coarse symbols and the kernel scale. */
  separable?: { gammaX: Float64Array; gammaY: Float64Array; scale: number }
  /** k(0) of the model (variance + all nuggets). */
  pointVariance: number
}

function validate(spec: ConditioningSpec): void {
  const { nx, ny, factor, coarse, kernel } = spec
  if (!Number.isInteger(factor) || factor < 2 || factor > 16) throw new Error(`block factor must be an integer from 2 to 16, got ${factor}`)
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 1 || ny < 1) throw new Error(`coarse grid must be at least 1×1 cells, got ${nx}×${ny}`)
  if (coarse.length !== nx * ny) throw new Error(`coarse field has ${coarse.length} values, expected nx·ny = ${nx * ny}`)
  if (!(kernel.lengthScale > 0) || !Number.isFinite(kernel.lengthScale)) throw new Error(`length scale must be a positive number of fine cells, got ${kernel.lengthScale}`)
  if (!(kernel.variance > 0) || !Number.isFinite(kernel.variance)) throw new Error(`variance must be positive, got ${kernel.variance}`)
  if (kernel.nugget !== undefined && !(kernel.nugget >= 0)) throw new Error(`nugget must be ≥ 0, got ${kernel.nugget}`)
  checkAnisotropy(kernel.anisotropy)
  let observed = 0
  for (const v of coarse) {
    if (Number.isFinite(v)) observed++
    else if (!Number.isNaN(v)) throw new Error('coarse field contains an infinite value')
  }
  if (observed === 0) throw new Error('coarse field has no observed cells: nothing to condition on')
  const m = spec.mean
  if (typeof m === 'number' ? !Number.isFinite(m) : ![m.b0, m.b1, m.b2].every(Number.isFinite)) throw new Error('prior mean must be finite')
}

function priorMeans(spec: ConditioningSpec, fineNx: number, fineNy: number): { fine: Float64Array; coarse: Float64Array } {
  const { nx, ny, factor: b } = spec
  const t: LinearTrend = typeof spec.mean === 'number' ? { b0: spec.mean, b1: 0, b2: 0 } : spec.mean
  const fine = new Float64Array(fineNx * fineNy)
  for (let j = 0; j < fineNy; j++) for (let i = 0; i < fineNx; i++) fine[j * fineNx + i] = t.b0 + t.b1 * i + t.b2 * j
  // The block mean of a linear function is its value at the block centre.
  const coarse = new Float64Array(nx * ny)
  for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) coarse[J * nx + I] = t.b0 + t.b1 * (b * I + (b - 1) / 2) + t.b2 * (b * J + (b - 1) / 2)
  return { fine, coarse }
}

/** Builds the conditioning set-up (embedding, coarse operator, solver); throws on invalid input. */
export function buildConditioningModel(spec: ConditioningSpec): ConditioningModel {
  validate(spec)
  const options = spec.options ?? {}
  const b = spec.factor
  const fineNx = b * spec.nx, fineNy = b * spec.ny
  const kernel: KernelParams = { ...spec.kernel, nugget: 0 }
  const kernelNugget = spec.kernel.nugget ?? 0
  const radius = decayRadius(kernel, options.decayTolerance ?? 1e-12)

  // se is separable when its axes are the grid's (isotropic or unrotated); a rotated kernel takes the general path.
  const axes = kernel.kernel === 'se' ? axisAlignedLengthScales(kernel) : undefined
  let embedding: CirculantEmbedding
  if (axes) {
    const gx = axisGaussian(axes[0]), gy = axes[1] === axes[0] ? gx : axisGaussian(axes[1])
    embedding = embedSeparableCovariance(kernel.variance, gx, gy, fineNx, fineNy, b, radius, options.embedding)
  } else {
    embedding = embedCovariance(covarianceFunction(kernel), fineNx, fineNy, b, radius, options.embedding)
  }
  const lambda = embedding.eigenvalues
  if (kernelNugget > 0) for (let k = 0; k < lambda.length; k++) lambda[k]! += kernelNugget

  const blocks = new TorusBlockOperator(embedding.nx, embedding.ny, b)
  const gamma = blocks.coarseSymbol(lambda)
  let min = Infinity, max = -Infinity
  for (const v of gamma) { if (v < min) min = v; if (v > max) max = v }
  const maxCondition = options.maxCondition ?? 1e10
  let addedNugget = 0
  if (!(max <= maxCondition * min)) {
    // (max + τc)/(min + τc) = maxCondition, τc on the coarse scale = τ/b² on the fine scale.
    const tauCoarse = (max - maxCondition * Math.max(min, 0)) / (maxCondition - 1)
    addedNugget = tauCoarse * b * b
    for (let k = 0; k < lambda.length; k++) lambda[k]! += addedNugget
    for (let k = 0; k < gamma.length; k++) gamma[k]! += tauCoarse
    min += tauCoarse; max += tauCoarse
  }
  const conditionBound = max / min

  const observed = new Uint8Array(spec.nx * spec.ny)
  for (let k = 0; k < observed.length; k++) observed[k] = Number.isFinite(spec.coarse[k]!) ? 1 : 0
  const covariance = new CoarseCovariance(spec.nx, spec.ny, blocks.coarseNx, blocks.coarseNy, gamma, observed)

  let separable: ConditioningModel['separable']
  if (embedding.separable) {
    separable = {
      gammaX: coarseSymbol1d(embedding.separable.x, b),
      gammaY: coarseSymbol1d(embedding.separable.y, b),
      scale: embedding.separable.scale,
    }
  }
  const solver = chooseSolver(spec, options, covariance, separable, (kernelNugget + addedNugget) / (b * b))

  const prior = priorMeans(spec, fineNx, fineNy)
  const baseResidual = new Float64Array(spec.nx * spec.ny)
  for (let k = 0; k < baseResidual.length; k++) baseResidual[k] = observed[k] ? spec.coarse[k]! - prior.coarse[k]! : 0

  return {
    spec, fineNx, fineNy, embedding, lambda, blocks, covariance, solver,
    kernelNugget, addedNugget, conditionBound,
    priorFine: prior.fine, priorCoarse: prior.coarse, baseResidual, separable,
    pointVariance: kernel.variance + kernelNugget + addedNugget,
  }
}

/** One axis factor exp(−h²/(2ℓ²)) of the separable squared-exponential. */
function axisGaussian(lengthScale: number): (h: number) => number {
  const l2 = 2 * lengthScale ** 2
  return (h) => Math.exp(-(h * h) / l2)
}

function chooseSolver(
  spec: ConditioningSpec, options: ConditioningOptions, covariance: CoarseCovariance,
  separable: ConditioningModel['separable'], coarseNugget: number,
): CoarseSolver {
  const requested = options.solver ?? 'auto'
  const denseLimit = options.denseLimit ?? 600
  const fallbackLimit = options.denseFallbackLimit ?? 3000
  const kron = () => new KroneckerCoarseSolver(spec.nx, spec.ny, separable!.gammaX, separable!.gammaY, separable!.scale, coarseNugget)
  if (requested === 'kronecker') {
    if (!separable || !covariance.complete) throw new Error('the Kronecker solver needs a separable kernel (se) and no missing coarse cells')
    return kron()
  }
  if (requested === 'dense') return new DenseCoarseSolver(covariance)
  if (requested === 'pcg') return new PcgCoarseSolver(covariance, options.pcg)
  if (separable && covariance.complete) return kron()
  if (covariance.observedCount <= denseLimit) return new DenseCoarseSolver(covariance)
  const pcg = new PcgCoarseSolver(covariance, options.pcg)
  if (covariance.observedCount > fallbackLimit) return pcg
  return withDenseFallback(pcg, covariance)
}

/** PCG that switches, once and for good, to the dense Cholesky if an iteration fails to converge. */
function withDenseFallback(pcg: PcgCoarseSolver, covariance: CoarseCovariance): CoarseSolver {
  let dense: DenseCoarseSolver | undefined
  let denseNote: string | undefined
  const wrapper: { method: 'pcg' | 'dense'; readonly note?: string; readonly preconditioner?: string; solve: CoarseSolver['solve'] } = {
    method: 'pcg',
    // The PCG's own note (a preconditioner switch) until the dense route takes over.
    get note() { return denseNote ?? pcg.note },
    get preconditioner() { return dense ? undefined : pcg.preconditioner },
    solve(rhs) {
      if (dense) return dense.solve(rhs)
      try {
        return pcg.solve(rhs)
      } catch (err) {
        dense = new DenseCoarseSolver(covariance)
        wrapper.method = 'dense'
        denseNote = `PCG failed (${(err as Error).message}); switched to dense Cholesky`
        return dense.solve(rhs)
      }
    },
  }
  return wrapper
}

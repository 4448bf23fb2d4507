/**
 * Maximum-likelihood fit of the fine-field covariance from the coarse field alone.
 *
 * The coarse field y (nx×ny, row-major, NaN = missing) is modelled as exact b×b block means of a
 * stationary Gaussian field with constant mean μ, variance σ² and kernel k(·; ℓ): y ~ N(μ1, σ²R(ℓ) + η σ² I),
 * with R(ℓ) the block-mean correlation from the change-of-support table and η a nugget (fixed and small,
 * or estimated: profiled over ln η by a grid and Brent at every ℓ).
 * μ and σ² are profiled out in closed form; ℓ (fine cells) is found by a log-spaced grid over bounds set
 * from the grid size, refined by Brent's bounded method (Brent 1973) in ln ℓ. Reported: the estimates, the
 * maximised log-likelihood, a ~95% profile-likelihood interval for ℓ ({ℓ : 2(ℓ̂max − ℓ) ≤ χ²₁,0.95}),
 * a curvature standard error, and every evaluated (ℓ, log-likelihood) pair for plotting.
 * Likelihoods: exact dense Cholesky (small m, any missing pattern), exact Kronecker (se, complete grid),
 * debiased Whittle (large grids).
 *
 * Geometric anisotropy (option `anisotropy`): 'off' (default) is the isotropic model above; a given shape
 * { ratio, angle } fixes it and fits ℓ₁ (the major axis) as ℓ; 'fit' searches it by maximum likelihood after
 * the isotropic fit (anisotropySearch.ts, under a likelihood valid for rotated kernels: dense or Whittle) and
 * adopts it when the likelihood-ratio test against isotropy rejects at 5% (2·gain > χ²₂,0.95; Wilks 1938),
 * in which case ℓ, σ², μ, the interval and the profile describe the anisotropic model at the fitted shape.
 */
import type { Anisotropy, KernelName, KernelParams } from '../grf/kernels'
import { checkAnisotropy } from '../grf/kernels'
import { searchAnisotropy, structureTensorAnisotropy } from './anisotropySearch'
import { minimizeBounded } from '../optimize/brentMinimize'
import { findRootBracketed } from '../optimize/brentRoot'
import { coarseCorrelationTable } from './coarseCorrelation'
import { prepareCoarseField, type CoarseField } from './coarseField'
import { DENSE_MAX_CELLS, denseProfile } from './denseLikelihood'
import { kroneckerProfile } from './kroneckerLikelihood'
import type { ProfiledFit } from './profileLikelihood'
import { prepareWhittle, whittleProfile, type WhittleData } from './whittleLikelihood'

export type FitMethod = 'exact' | 'kronecker' | 'whittle'

export interface FitOptions {
  /** Block factor b: fine cells per coarse cell along each axis. */
  factor: number
  /**
   * Kernel family, or 'auto' to choose among se / matern12 / matern32 / matern52 by maximised likelihood,
   * penalised as AIC when the families differ in free parameters (an estimated nugget counts as one).
   */
  kernel: KernelName | 'auto'
  /** 'auto' (default): exact when affordable (Kronecker for se on a complete grid, dense up to AUTO_DENSE_MAX_CELLS), Whittle beyond. */
  method?: 'auto' | 'exact' | 'whittle'
  /** Smoothness ν for kernel 'matern' (general ν; not fitted). */
  nu?: number
  /** Search interval for ℓ in fine cells (default: 0.1 coarse cell to half the longer side of the domain). */
  lengthScaleBounds?: [number, number]
  /**
   * Nugget η: white-noise variance on each coarse cell as a fraction of σ², or 'estimate' (profiled over
   * [NUGGET_RANGE]). Default: 'estimate' for se, DEFAULT_NUGGET_RATIO for the Matérn families (see below).
   */
  nugget?: number | 'estimate'
  /** Split-cosine taper fraction for the Whittle likelihood (0 = none, 1 = Hann; default DEFAULT_WHITTLE_TAPER). */
  whittleTaper?: number
  /** Geometric anisotropy: 'off' (default, isotropic), 'fit' (searched, adopted if significant) or a fixed shape. */
  anisotropy?: 'off' | 'fit' | Anisotropy
  /** Smallest ratio ℓ₂/ℓ₁ searched by 'fit' (default DEFAULT_MIN_ANISOTROPY_RATIO). */
  minAnisotropyRatio?: number
}

/** What the anisotropy option found; the kernel uses it when `adopted`. */
export interface AnisotropyFit {
  source: 'fitted' | 'given'
  /** True when the reported model (ℓ, σ², …) is the anisotropic one. */
  adopted: boolean
  /** ℓ₂/ℓ₁ ∈ (0, 1] and θ ∈ [0, π) radians (major axis from the +i column axis towards the +j row axis). */
  ratio: number
  angle: number
  angleDegrees: number
  /** ℓ₁ and ℓ₂, fine cells. */
  majorLengthScale: number
  minorLengthScale: number
  /** Log-likelihood of the anisotropic optimum minus the isotropic one, both under `method` (0 for a given shape). */
  logLikelihoodGain: number
  method: FitMethod
  /** Likelihood evaluations of the shape search (0 for a given shape). */
  evaluations: number
  converged: boolean
}

export interface FitResult {
  kernel: KernelName
  nu?: number
  /** ℓ̂ in fine-grid cells. */
  lengthScale: number
  /** σ̂², the fine field's marginal variance (field units²). */
  variance: number
  /** μ̂: generalised-least-squares mean for the exact methods, the sample mean for Whittle. */
  mean: number
  logLikelihood: number
  /** ~95% profile-likelihood interval for ℓ (fine cells); an end at a search bound means "not bounded by the data". */
  lengthScaleInterval: [number, number]
  /** Approximate standard error of ℓ̂ from the curvature of the profile in ln ℓ (NaN at a bound or when flat). */
  standardError: number
  atBound: 'lower' | 'upper' | null
  method: FitMethod
  /** Likelihood evaluations for this kernel (all kernels together in `totalEvaluations`). */
  evaluations: number
  totalEvaluations: number
  profile: { lengthScale: number; logLikelihood: number }[]
  /** Every family tried by kernel 'auto', with its maximised log-likelihood and AIC (the choice: lowest AIC). */
  candidates?: { kernel: KernelName; logLikelihood: number; aic: number; lengthScale: number; method: FitMethod; nuggetEstimated: boolean }[]
  /** η used or estimated (coarse-cell white noise / σ²). */
  nuggetRatio: number
  nuggetEstimated: boolean
  /** The same nugget as a fine-grid variance for KernelParams.nugget: η·b²·σ̂² (fine white noise averages down by b²). */
  nugget: number
  lengthScaleBounds: [number, number]
  validCells: number
  /** Present unless the anisotropy option is 'off'. */
  anisotropy?: AnisotropyFit
}

/**
 * Fixed nugget ratio η used by default for the Matérn families: large enough to keep R + ηI positive definite,
 * small enough not to matter (Matérn spectra decay algebraically: measured, data noise of 1e-6·σ² leaves ℓ̂
 * unchanged, 1e-4·σ² lowers matern52 ℓ̂ by ~10%). The squared-exponential is different: its block-mean
 * correlation is singular to rounding once ℓ ≳ 2 coarse cells and its fit is then governed by the noise floor of
 * the data (measured: noise 1e-6·σ² moved ℓ = 4 coarse cells to 6.1 under a fixed η = 1e-10), so for se the
 * nugget is estimated by default.
 */
export const DEFAULT_NUGGET_RATIO = 1e-10
/** Range of an estimated nugget ratio η. */
export const NUGGET_RANGE: [number, number] = [1e-12, 1]
/** Largest number of valid cells for which method 'auto' uses the dense likelihood with an estimated nugget (one factorisation per trial η). */
export const AUTO_DENSE_ESTIMATE_MAX_CELLS = 300
/** Default Whittle taper fraction (see whittleLikelihood.ts). */
export const DEFAULT_WHITTLE_TAPER = 0.3
/** Largest number of valid cells for which method 'auto' uses the dense exact likelihood (≈ 0.1 s per evaluation here). */
export const AUTO_DENSE_MAX_CELLS = 700
/** Longest side for which method 'auto' uses the Kronecker likelihood (two eigendecompositions of this size per evaluation). */
export const AUTO_KRONECKER_MAX_SIDE = 512
/**
 * Largest number of valid cells for which method 'auto' runs the anisotropy search on the dense exact likelihood
 * (it takes ~100 evaluations, so ~2 s at this size here; Whittle beyond).
 */
export const AUTO_ANISOTROPY_DENSE_MAX_CELLS = 300
/** Default smallest ratio ℓ₂/ℓ₁ of the anisotropy search. */
export const DEFAULT_MIN_ANISOTROPY_RATIO = 0.1
/** Half the 0.95 quantile of χ² with two degrees of freedom (5.991464547107979, scipy.stats.chi2.ppf(0.95, 2)): anisotropy test. */
const HALF_CHI2_2DF_95 = 5.991464547107979 / 2
/** Points of the initial log-spaced grid in ℓ. */
const GRID_POINTS = 9
/** Half the 0.95 quantile of χ² with one degree of freedom (3.841458820694124, scipy.stats.chi2.ppf(0.95, 1)). */
const HALF_CHI2_95 = 3.841458820694124 / 2
/** Brent tolerance in ln ℓ (0.01% in ℓ). */
const LOG_TOLERANCE = 1e-4
/** Step in ln ℓ for the curvature (standard error). */
const CURVATURE_STEP = 0.05
const FAMILIES: KernelName[] = ['se', 'matern12', 'matern32', 'matern52']

/** Default search interval for ℓ (fine cells): 0.1 coarse cell to half the longer side. */
export function defaultLengthScaleBounds(nx: number, ny: number, factor: number): [number, number] {
  return [0.1 * factor, 0.5 * factor * Math.max(nx, ny, 2)]
}

/**
 * The likelihood each kernel gets under a requested method (see FitOptions.method). The Kronecker form needs
 * the isotropic se kernel; an anisotropic model (`isotropic` false) gets the dense or the Whittle likelihood.
 */
export function chooseMethod(requested: 'auto' | 'exact' | 'whittle', kernel: KernelName, field: CoarseField, estimateNugget = false, isotropic = true): FitMethod {
  const kronecker = kernel === 'se' && field.complete && isotropic
  const m = field.valid.length
  if (requested === 'whittle') return 'whittle'
  if (requested === 'exact') {
    if (kronecker) return 'kronecker'
    if (m <= DENSE_MAX_CELLS) return 'exact'
    throw new Error(`exact likelihood needs at most ${DENSE_MAX_CELLS} valid cells (got ${m}) unless the kernel is se on a complete grid; use method "whittle"`)
  }
  if (kronecker && Math.max(field.nx, field.ny) <= AUTO_KRONECKER_MAX_SIDE) return 'kronecker'
  return m <= (estimateNugget ? AUTO_DENSE_ESTIMATE_MAX_CELLS : AUTO_DENSE_MAX_CELLS) ? 'exact' : 'whittle'
}

/** The nugget a kernel gets: the option if given, else estimated for se and DEFAULT_NUGGET_RATIO otherwise. */
function nuggetFor(option: FitOptions['nugget'], kernel: KernelName): number | 'estimate' {
  return option ?? (kernel === 'se' ? 'estimate' : DEFAULT_NUGGET_RATIO)
}

/** Steps of the initial grid in log₁₀ η and the Brent tolerance there. */
const NUGGET_GRID_STEP = 3
const NUGGET_LOG_TOLERANCE = 0.05

/** Maximises a profile over log₁₀ η ∈ log₁₀ NUGGET_RANGE: grid, then Brent between the best point's neighbours. */
function maximiseNugget(profile: (nugget: number) => ProfiledFit): { fit: ProfiledFit; nugget: number } {
  const lo = Math.log10(NUGGET_RANGE[0]), hi = Math.log10(NUGGET_RANGE[1])
  const seen: { t: number; fit: ProfiledFit }[] = []
  const at = (t: number) => { const fit = profile(10 ** t); seen.push({ t, fit }); return fit }
  for (let t = lo; t <= hi + 1e-9; t += NUGGET_GRID_STEP) at(t)
  let best = seen[0]!
  for (const e of seen) if (e.fit.logLikelihood > best.fit.logLikelihood) best = e
  const a = Math.max(lo, best.t - NUGGET_GRID_STEP), b = Math.min(hi, best.t + NUGGET_GRID_STEP)
  const interior = best.t > lo && best.t < hi
  minimizeBounded((t) => -at(t).logLikelihood, a, b, { tolerance: NUGGET_LOG_TOLERANCE, start: interior ? { x: best.t, value: -best.fit.logLikelihood } : undefined })
  for (const e of seen) if (e.fit.logLikelihood > best.fit.logLikelihood) best = e
  return { fit: best.fit, nugget: 10 ** best.t }
}

interface Evaluated { x: number; fit: ProfiledFit; nugget: number }

/**
 * Profile fit (μ, σ² profiled; the nugget fixed or profiled) at length scale ℓ (ℓ₁ with a shape) for one
 * kernel and method.
 */
function fitAt(field: CoarseField, factor: number, kernel: KernelName, nu: number | undefined, method: FitMethod, nugget: number | 'estimate', whittle: () => WhittleData, l: number, shape?: Anisotropy): { fit: ProfiledFit; nugget: number } {
  let profile: (nugget: number) => ProfiledFit
  if (method === 'kronecker') {
    if (shape && shape.ratio !== 1) throw new Error('the Kronecker likelihood needs an isotropic kernel')
    profile = kroneckerProfile(field, factor, l)
  } else {
    const table = coarseCorrelationTable(kernel, l, factor, field.nx, field.ny, nu, shape)
    profile = method === 'exact' ? denseProfile(field, table) : whittleProfile(whittle(), table)
  }
  return nugget === 'estimate' ? maximiseNugget(profile) : { fit: profile(nugget), nugget }
}

/** Profile log-likelihood as a function of x = ln ℓ for one kernel, method and (optional) fixed shape, recording every call. */
function likelihoodOf(field: CoarseField, factor: number, kernel: KernelName, nu: number | undefined, method: FitMethod, nugget: number | 'estimate', whittle: () => WhittleData, shape?: Anisotropy) {
  const history: Evaluated[] = []
  const evaluate = (x: number): ProfiledFit => {
    const e: Evaluated = { x, ...fitAt(field, factor, kernel, nu, method, nugget, whittle, Math.exp(x), shape) }
    history.push(e)
    return e.fit
  }
  return { evaluate, history }
}

interface KernelFit {
  kernel: KernelName
  method: FitMethod
  nugget: number | 'estimate'
  best: Evaluated
  history: Evaluated[]
  shape?: Anisotropy
}

/** Grid search over ln ℓ, then Brent between the best grid point's neighbours. */
function maximise(evaluate: (x: number) => ProfiledFit, history: Evaluated[], lo: number, hi: number): Evaluated {
  const grid = Array.from({ length: GRID_POINTS }, (_, k) => lo + (hi - lo) * k / (GRID_POINTS - 1))
  for (const x of grid) evaluate(x)
  let iBest = 0
  for (let k = 1; k < GRID_POINTS; k++) if (history[k]!.fit.logLikelihood > history[iBest]!.fit.logLikelihood) iBest = k
  const a = grid[Math.max(0, iBest - 1)]!, b = grid[Math.min(GRID_POINTS - 1, iBest + 1)]!
  const interior = iBest > 0 && iBest < GRID_POINTS - 1
  minimizeBounded((x) => -evaluate(x).logLikelihood, a, b, {
    tolerance: LOG_TOLERANCE,
    start: interior ? { x: grid[iBest]!, value: -history[iBest]!.fit.logLikelihood } : undefined,
  })
  return bestOf(history)
}

function bestOf(history: Evaluated[]): Evaluated {
  let best = history[0]!
  for (const e of history) if (e.fit.logLikelihood > best.fit.logLikelihood) best = e
  return best
}

function fitKernel(field: CoarseField, factor: number, kernel: KernelName, nu: number | undefined, method: FitMethod, nugget: number | 'estimate', lo: number, hi: number, whittle: () => WhittleData, shape?: Anisotropy): KernelFit {
  const { evaluate, history } = likelihoodOf(field, factor, kernel, nu, method, nugget, whittle, shape)
  const best = maximise(evaluate, history, lo, hi)
  if (!Number.isFinite(best.fit.logLikelihood)) throw new Error(`likelihood could not be evaluated for kernel ${kernel} anywhere in the search interval (try a larger nugget)`)
  return { kernel, method, nugget, best, history, ...(shape ? { shape } : {}) }
}

/**
 * End of the profile-likelihood interval on one side of x̂: the crossing of ll = llmax − χ²₁,0.95/2,
 * bracketed by already-evaluated points and refined by Brent's root finder; the search bound if never crossed.
 */
function intervalEnd(evaluate: (x: number) => ProfiledFit, history: Evaluated[], best: Evaluated, side: -1 | 1, bound: number): number {
  const threshold = best.fit.logLikelihood - HALF_CHI2_95
  const onSide = history.filter((e) => side * (e.x - best.x) > 0).sort((p, q) => side * (p.x - q.x))
  // Nearest point beyond the crossing, and the farthest point still above it before that one.
  const below = onSide.find((e) => e.fit.logLikelihood < threshold)
  if (!below) return bound
  let inside: Evaluated = best
  for (const e of onSide) {
    if (side * (e.x - below.x) >= 0) break
    if (e.fit.logLikelihood >= threshold) inside = e
  }
  const g = (x: number) => evaluate(x).logLikelihood - threshold
  return findRootBracketed(g, inside.x, below.x, inside.fit.logLikelihood - threshold, below.fit.logLikelihood - threshold, 1e-3).x
}

/**
 * Fits ℓ (fine cells), σ² and μ of a stationary kernel to a coarse field of b×b block means by maximum
 * likelihood; see the module comment. `coarse`: row-major nx×ny (index j·nx + i), NaN = missing.
 * Throws with a one-line message for a bad factor, too few valid cells, a constant field or bad options.
 */
export function fitCoarseField(coarse: ArrayLike<number>, nx: number, ny: number, opts: FitOptions): FitResult {
  const factor = opts.factor
  const field = prepareCoarseField(coarse, nx, ny, factor)
  if (opts.nugget !== undefined && opts.nugget !== 'estimate' && !(opts.nugget >= 0 && Number.isFinite(opts.nugget))) {
    throw new Error(`nugget must be a finite number ≥ 0 or "estimate", got ${opts.nugget}`)
  }
  const requested = opts.method ?? 'auto'
  if (!['auto', 'exact', 'whittle'].includes(requested)) throw new Error(`unknown method "${requested}" (use auto, exact or whittle)`)
  const kernelOption = opts.kernel
  if (kernelOption !== 'auto' && !['se', 'matern12', 'matern32', 'matern52', 'matern'].includes(kernelOption)) {
    throw new Error(`unknown kernel "${kernelOption}" (use se, matern12, matern32, matern52, matern or auto)`)
  }
  const nu = kernelOption === 'matern' ? opts.nu : undefined
  if (kernelOption === 'matern' && !(nu !== undefined && nu > 0 && Number.isFinite(nu))) throw new Error('kernel "matern" needs a smoothness nu > 0')
  const bounds = opts.lengthScaleBounds ?? defaultLengthScaleBounds(nx, ny, factor)
  if (!(bounds[0] > 0 && bounds[1] > bounds[0] && Number.isFinite(bounds[1]))) throw new Error(`length-scale bounds must satisfy 0 < lower < upper, got [${bounds[0]}, ${bounds[1]}]`)
  const lo = Math.log(bounds[0]), hi = Math.log(bounds[1])
  const anisotropyOption = opts.anisotropy ?? 'off'
  if (typeof anisotropyOption === 'object') checkAnisotropy(anisotropyOption)
  else if (anisotropyOption !== 'off' && anisotropyOption !== 'fit') throw new Error(`unknown anisotropy option "${anisotropyOption}" (use off, fit or { ratio, angle })`)
  const minRatio = opts.minAnisotropyRatio ?? DEFAULT_MIN_ANISOTROPY_RATIO
  if (!(minRatio > 0 && minRatio < 1)) throw new Error(`smallest anisotropy ratio must be in (0, 1), got ${minRatio}`)
  const givenShape = typeof anisotropyOption === 'object' ? anisotropyOption : undefined
  const isotropicModel = !givenShape || givenShape.ratio === 1

  let whittleData: WhittleData | undefined
  const whittle = () => (whittleData ??= prepareWhittle(field, opts.whittleTaper ?? DEFAULT_WHITTLE_TAPER))
  const fitWith = (kernel: KernelName, method: FitMethod) => fitKernel(field, factor, kernel, nu, method, nuggetFor(opts.nugget, kernel), lo, hi, whittle, givenShape)
  const methodFor = (kernel: KernelName) => chooseMethod(requested, kernel, field, nuggetFor(opts.nugget, kernel) === 'estimate', isotropicModel)

  let chosen: KernelFit
  let candidates: FitResult['candidates']
  let searched = 0 // evaluations of every search made, all kernels
  if (kernelOption === 'auto') {
    // Likelihoods are comparable only under one approximation: exact for all, or Whittle for all. Families
    // with an estimated nugget have one parameter more, so the choice is by AIC = 2k − 2ℓ (Akaike 1974).
    const methods = FAMILIES.map(methodFor)
    const allExact = methods.every((m) => m !== 'whittle')
    // A family whose likelihood cannot be evaluated anywhere (e.g. se with a zero nugget) drops out.
    const fits = FAMILIES.flatMap((k, i) => { try { return [fitWith(k, allExact ? methods[i]! : 'whittle')] } catch { return [] } })
    if (fits.length === 0) throw new Error('no kernel family could be fitted (try a larger nugget)')
    const aic = (f: KernelFit) => 2 * (f.nugget === 'estimate' ? 4 : 3) - 2 * f.best.fit.logLikelihood
    candidates = fits.map((f) => ({
      kernel: f.kernel, logLikelihood: f.best.fit.logLikelihood, aic: aic(f), lengthScale: Math.exp(f.best.x), method: f.method, nuggetEstimated: f.nugget === 'estimate',
    }))
    const winner = fits.reduce((p, q) => (aic(q) < aic(p) ? q : p))
    const preferred = methodFor(winner.kernel)
    // Refit the winner with its own best likelihood (e.g. Kronecker for se after a Whittle comparison).
    chosen = preferred === winner.method ? winner : fitWith(winner.kernel, preferred)
    searched = fits.reduce((s, f) => s + f.history.length, 0) + (chosen === winner ? 0 : chosen.history.length)
  } else {
    chosen = fitWith(kernelOption, methodFor(kernelOption))
    searched = chosen.history.length
  }

  let anisotropy: AnisotropyFit | undefined
  if (anisotropyOption === 'fit') {
    const shaped = fitShape(field, factor, chosen, nu, requested, lo, hi, bounds, minRatio, whittle)
    anisotropy = shaped.anisotropy
    searched += shaped.evaluations
    chosen = shaped.chosen
  } else if (givenShape) {
    const major = Math.exp(chosen.best.x)
    anisotropy = {
      source: 'given', adopted: true, ratio: givenShape.ratio, angle: givenShape.angle, angleDegrees: degrees(givenShape.angle),
      majorLengthScale: major, minorLengthScale: givenShape.ratio * major, logLikelihoodGain: 0, method: chosen.method, evaluations: 0, converged: true,
    }
  }

  // Interval and curvature reuse the chosen kernel's evaluations.
  const { evaluate, history } = likelihoodOf(field, factor, chosen.kernel, nu, chosen.method, chosen.nugget, whittle, chosen.shape)
  history.push(...chosen.history)
  const best = chosen.best
  const left = intervalEnd(evaluate, history, best, -1, lo)
  const right = intervalEnd(evaluate, history, best, 1, hi)
  let standardError = NaN
  if (best.x - CURVATURE_STEP >= lo && best.x + CURVATURE_STEP <= hi) {
    const minus = evaluate(best.x - CURVATURE_STEP).logLikelihood, plus = evaluate(best.x + CURVATURE_STEP).logLikelihood
    const curvature = (plus - 2 * best.fit.logLikelihood + minus) / (CURVATURE_STEP * CURVATURE_STEP)
    if (curvature < 0) standardError = Math.exp(best.x) / Math.sqrt(-curvature) // delta method: se(ℓ) = ℓ·se(ln ℓ)
  }
  const edge = 10 * LOG_TOLERANCE
  const atBound = best.x - lo < edge ? 'lower' : hi - best.x < edge ? 'upper' : null
  const profile = history
    .filter((e) => Number.isFinite(e.fit.logLikelihood))
    .map((e) => ({ lengthScale: Math.exp(e.x), logLikelihood: e.fit.logLikelihood }))
    .sort((p, q) => p.lengthScale - q.lengthScale)
    .filter((e, k, all) => k === 0 || e.lengthScale !== all[k - 1]!.lengthScale)
  const variance = best.fit.variance
  return {
    kernel: chosen.kernel,
    ...(nu !== undefined ? { nu } : {}),
    lengthScale: Math.exp(best.x),
    variance,
    mean: best.fit.mean,
    logLikelihood: best.fit.logLikelihood,
    lengthScaleInterval: [Math.exp(left), Math.exp(right)],
    standardError,
    atBound,
    method: chosen.method,
    evaluations: history.length,
    totalEvaluations: searched + history.length - chosen.history.length,
    profile,
    ...(candidates ? { candidates } : {}),
    nuggetRatio: best.nugget,
    nuggetEstimated: chosen.nugget === 'estimate',
    nugget: best.nugget * factor * factor * variance,
    lengthScaleBounds: [bounds[0], bounds[1]],
    validCells: field.valid.length,
    ...(anisotropy ? { anisotropy } : {}),
  }
}

/** θ in degrees, in [0, 180). */
function degrees(angle: number): number {
  const d = (angle * 180) / Math.PI
  return ((d % 180) + 180) % 180
}

/**
 * Option 'fit': the isotropic optimum under a likelihood valid for rotated kernels (re-fitted near ℓ̂ when the
 * isotropic fit used Kronecker), the shape search from there, and — when the likelihood-ratio test rejects
 * isotropy — the full fit of ℓ₁ at the fitted shape, which then becomes the reported model.
 */
function fitShape(
  field: CoarseField, factor: number, isotropic: KernelFit, nu: number | undefined, requested: 'auto' | 'exact' | 'whittle',
  lo: number, hi: number, bounds: [number, number], minRatio: number, whittle: () => WhittleData,
): { anisotropy: AnisotropyFit; chosen: KernelFit; evaluations: number } {
  const { kernel, nugget } = isotropic
  const method: FitMethod = requested === 'auto' && field.valid.length > AUTO_ANISOTROPY_DENSE_MAX_CELLS
    ? 'whittle' : chooseMethod(requested, kernel, field, nugget === 'estimate', false)
  let evaluations = 0
  let iso = isotropic
  if (method !== isotropic.method) {
    iso = fitKernel(field, factor, kernel, nu, method, nugget, Math.max(lo, isotropic.best.x - 0.5), Math.min(hi, isotropic.best.x + 0.5), whittle)
    evaluations += iso.history.length
  }
  const search = searchAnisotropy({
    logLikelihood: (l, shape) => fitAt(field, factor, kernel, nu, method, nugget, whittle, l, shape).fit.logLikelihood,
    isotropicLengthScale: Math.exp(iso.best.x), start: structureTensorAnisotropy(field), bounds, minRatio,
  })
  evaluations += search.evaluations
  const gain = search.logLikelihood - iso.best.fit.logLikelihood
  const adopted = gain > HALF_CHI2_2DF_95
  let chosen = isotropic
  let major = search.lengthScale
  if (adopted) {
    chosen = fitKernel(field, factor, kernel, nu, method, nugget, lo, hi, whittle, search.anisotropy)
    evaluations += chosen.history.length
    major = Math.exp(chosen.best.x)
  }
  const { ratio, angle } = search.anisotropy
  return {
    anisotropy: {
      source: 'fitted', adopted, ratio, angle, angleDegrees: degrees(angle), majorLengthScale: major, minorLengthScale: ratio * major,
      logLikelihoodGain: gain, method, evaluations: search.evaluations, converged: search.converged,
    },
    chosen, evaluations,
  }
}

/**
 * The kernel a fit describes, for the downscaler (grf/downscaler.ts): anisotropy included when adopted; the
 * fitted nugget (fine-cell variance) unless `withNugget` is false (the smooth part only).
 */
export function kernelParamsOf(fit: FitResult, withNugget = true): KernelParams {
  const a = fit.anisotropy
  return {
    kernel: fit.kernel, lengthScale: fit.lengthScale, variance: fit.variance,
    ...(withNugget ? { nugget: fit.nugget } : {}),
    ...(fit.nu !== undefined ? { nu: fit.nu } : {}),
    ...(a?.adopted && a.ratio !== 1 ? { anisotropy: { ratio: a.ratio, angle: a.angle } } : {}),
  }
}

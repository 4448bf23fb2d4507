/**
 * Local stationary fits on overlapping windows of the coarse field (Fuentes 2002, Biometrika 89:197),
 * each tested against the whole-domain fit: a window keeps its own length scale and variance only when
 * the likelihood-ratio test of "the whole-domain parameters hold here" rejects at 1% (Wilks 1938),
 *   D = 2(ℓ_window(θ̂_window) − ℓ_window(θ_global)) > χ²_{d, 0.99},
 * d = 2 (ℓ, σ²) or 3 when the window also estimates its nugget; the mean is profiled in both. Otherwise it
 * takes the whole-domain parameters. This shrinks towards stationarity where the data do not show a
 * different regime, so a stationary field keeps the stationary model (with 1% per window of spurious local
 * parameters, which are then close to the global ones anyway). The kernel family, smoothness and any
 * fitted anisotropy shape are the whole-domain fit's; windows fit ℓ (ℓ₁), σ² and, for se, the nugget.
 */
import { fitCoarseField, kernelParamsOf, type FitOptions, type FitResult } from '../fit/fitCoarse'
import { MIN_VALID_CELLS } from '../fit/coarseField'
import { logLikelihoodAt } from '../fit/likelihoodAt'
import type { KernelParams } from '../grf/kernels'
import { cropCoarse, regimeLayout, type RegimeLayout, type RegimeLayoutOptions, type RegimeWindow } from './regimeWindows'

/** χ²_{d, 0.99} for d = 2 and 3 (9.210340371976182, 11.344866730144373: scipy.stats.chi2.ppf(0.99, d)). */
const CHI2_99 = { 2: 9.210340371976182, 3: 11.344866730144373 } as const

export interface RegimeFitOptions {
  factor: number
  /** Keep the fitted nugget in the windows' priors (default true; the member pipeline samples from the smooth part). */
  withNugget?: boolean
  layout?: RegimeLayoutOptions
  /** Likelihood for the window fits (default: exact up to WINDOW_DENSE_MAX_CELLS cells, Whittle beyond). */
  method?: FitOptions['method']
}

/**
 * Largest tile (valid cells) fitted with the dense exact likelihood by default. Lower than the whole-domain
 * limit because there are up to 16 windows: measured here, a 16×16 tile takes ~0.7 s exact and ~30 ms
 * Whittle, with similar spread of ℓ̂ over seeded replicates.
 */
export const WINDOW_DENSE_MAX_CELLS = 150

export interface WindowFit {
  window: RegimeWindow
  /** Valid cells of the window's tile (where it is fitted). */
  validCells: number
  /** Local estimates (absent when the support has too few valid cells to fit). */
  local?: Pick<FitResult, 'lengthScale' | 'variance' | 'mean' | 'nuggetRatio' | 'nugget' | 'logLikelihood' | 'method' | 'atBound'>
  /** D of the test above (0 without a local fit) and its degrees of freedom. */
  statistic: number
  degreesOfFreedom: number
  /** True when the window keeps its local parameters. */
  departs: boolean
  /** Prior used for the window's conditional simulation. */
  kernel: KernelParams
  mean: number
}

export interface RegimeFit {
  layout: RegimeLayout
  windows: WindowFit[]
  /** Number of windows that keep local parameters. */
  departures: number
}

/** Local fits and tests on the windows of `regimeLayout(nx, ny, options.layout)`; `global` is the whole-domain fit of the same field. */
export function fitRegimes(coarse: ArrayLike<number>, nx: number, ny: number, global: FitResult, options: RegimeFitOptions): RegimeFit {
  const { factor } = options
  const layout = regimeLayout(nx, ny, options.layout)
  const withNugget = options.withNugget ?? true
  const globalKernel = kernelParamsOf(global, withNugget)
  const windows = layout.windows.map((window): WindowFit => {
    const { tile } = window
    const w = tile.x1 - tile.x0, h = tile.y1 - tile.y0
    const sub = cropCoarse(coarse, nx, tile)
    let validCells = 0
    for (const v of sub) if (Number.isFinite(v)) validCells++
    const keepGlobal: WindowFit = { window, validCells, statistic: 0, degreesOfFreedom: 2, departs: false, kernel: globalKernel, mean: global.mean }
    if (validCells < MIN_VALID_CELLS) return keepGlobal
    const method = options.method ?? (validCells <= WINDOW_DENSE_MAX_CELLS ? 'auto' : 'whittle')
    const upper = Math.min(global.lengthScaleBounds[1], 0.5 * factor * Math.max(w, h, 2))
    const lower = global.lengthScaleBounds[0]
    let local: FitResult
    try {
      local = fitCoarseField(sub, w, h, {
        factor, kernel: global.kernel, nu: global.nu, method,
        lengthScaleBounds: [lower, Math.max(2 * lower, upper)],
        nugget: global.nuggetEstimated ? 'estimate' : global.nuggetRatio,
        ...(globalKernel.anisotropy ? { anisotropy: globalKernel.anisotropy } : {}),
      })
    } catch {
      return keepGlobal // e.g. a constant window: nothing to learn locally
    }
    const atGlobal = logLikelihoodAt(sub, w, h, {
      factor, kernel: global.kernel, nu: global.nu, lengthScale: global.lengthScale, anisotropy: globalKernel.anisotropy,
      nuggetRatio: global.nuggetRatio, variance: global.variance, method: local.method,
    })
    const statistic = Math.max(0, 2 * (local.logLikelihood - atGlobal.logLikelihood))
    const degreesOfFreedom = local.nuggetEstimated ? 3 : 2
    const departs = !(statistic <= CHI2_99[degreesOfFreedom]) // a likelihood that fails at the global parameters departs too
    const summary = {
      lengthScale: local.lengthScale, variance: local.variance, mean: local.mean, nuggetRatio: local.nuggetRatio,
      nugget: local.nugget, logLikelihood: local.logLikelihood, method: local.method, atBound: local.atBound,
    }
    if (!departs) return { ...keepGlobal, local: summary, statistic, degreesOfFreedom }
    return {
      window, validCells, local: summary, statistic, degreesOfFreedom, departs,
      kernel: { ...globalKernel, lengthScale: local.lengthScale, variance: local.variance, ...(withNugget ? { nugget: local.nugget } : {}) },
      mean: local.mean,
    }
  })
  return { layout, windows, departures: windows.filter((w) => w.departs).length }
}

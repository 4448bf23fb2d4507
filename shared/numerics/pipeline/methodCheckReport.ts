/**
 * The method-check report: what `runMethodCheck` returns, what the worker stores (jsonb), what the
 * report page draws and what `tessera check` prints. Plain JSON: numbers, arrays and strings only;
 * a value that is undefined (e.g. the FSS when neither field has an event, 0/0) is null.
 *
 * Conventions (as for `tessera score`, shared/numerics/verify/scoreEnsemble.ts): an event is value ≥
 * threshold; FSS fractions over n×n squares (odd n, fine cells) centred on each cell, outside cells
 * counting as non-events (denominator n²), sums over the whole grid; the CRPS of an ensemble is the
 * fair CRPS (Ferro 2014) averaged over cells, that of a single field its mean absolute error (the CRPS
 * of a point forecast); `mse` of an ensemble is that of its mean; Brier probabilities are the per-cell
 * share of members with an event (0 or 1 for a single field). Spectra: radially averaged PSD
 * (verify/radialSpectrum.ts: Hann window, mean removed), wavenumbers in cycles per fine cell.
 */
import type { KernelName } from '../grf/kernels'
import type { InterpolationMethod } from '../interp/upsample'
import type { TransformOption } from '../transform/latentTransform'

export const METHOD_CHECK_REPORT_VERSION = 1

/** Kernel families the check can fit ('auto': chosen by likelihood, as for forecast runs). */
export type MethodCheckKernelChoice = 'auto' | Exclude<KernelName, 'matern'>

/** Prior parameters given instead of fitted (ℓ in fine cells, σ² in field units², μ defaults to the coarse mean). */
export interface GivenKernel {
  kernel: Exclude<KernelName, 'matern'>
  lengthScale: number
  variance: number
  mean?: number
}

export interface MethodCheckSettings {
  /** Block factor b (2…16): the truth is averaged over b×b blocks, then downscaled by b. */
  factor: number
  kernel: MethodCheckKernelChoice
  /** When present, these parameters are used and nothing is fitted. */
  givenKernel?: GivenKernel
  /** Conditional samples drawn (≥ 2, so that the fair CRPS exists). */
  samples: number
  seed: number
  /** Event thresholds, as values in the field's units or as percentiles (0–100) of the truth. */
  thresholds: { kind: 'value' | 'percentile'; values: number[] }
  /** Odd FSS neighbourhood sizes, fine cells. */
  neighbourhoods: number[]
  /** Cap on the fitted ℓ in coarse cells (default: the forecast runs' cap). */
  maxLengthScaleCoarseCells?: number
  /** The run options of the member pipeline (defaults as for a new forecast run: 'auto', 'off', 'off'). */
  transform?: TransformOption
  anisotropy?: 'off' | 'fit'
  regimes?: 'off' | 'windows'
}

export type ForecastKind = 'mean' | 'ensemble' | 'baseline' | 'sample'

/** Scores of one forecast (a single field, or the sample ensemble) against the truth. */
export interface ForecastScores {
  /** 'mean', 'ensemble', 'sample-<k>', or a baseline id such as 'bilinear' / 'bilinear-bm'. */
  id: string
  label: string
  kind: ForecastKind
  method?: InterpolationMethod
  /** True when every b×b block mean equals the coarse value (to rounding; see blockMeanError). */
  preservesBlockMeans: boolean
  /** Largest |block mean − coarse value| of the field (of every member for the ensemble). */
  blockMeanError: number
  mse: number
  rmse: number
  mae: number
  /** Fair CRPS for the ensemble, the mean absolute error for a single field. */
  crps: number
  /** fss[t][n]: threshold t, neighbourhood n (null when neither field has an event). */
  fss: (number | null)[][]
  /** Per threshold: Brier score with Murphy's decomposition. */
  brier: { score: number; reliability: number; resolution: number; uncertainty: number }[]
  /** Power at wavelengths shorter than two coarse cells, as a share of the truth's (null when the truth has none). */
  subgridPowerRatio: number | null
}

export interface SpectrumSeries {
  id: string
  label: string
  power: (number | null)[]
  /** power / truth power, ring by ring. */
  ratio: (number | null)[]
}

export interface MethodCheckReport {
  version: typeof METHOD_CHECK_REPORT_VERSION
  settings: MethodCheckSettings
  grid: {
    nx: number
    ny: number
    coarseNx: number
    coarseNy: number
    factor: number
    /** Fine grid spacing, km (null when unknown: distances are then in cells only). */
    spacingKm: number | null
    /** Set when the truth was cropped to a multiple of the factor (its original size). */
    croppedFrom: { nx: number; ny: number } | null
    units: string | null
  }
  truth: { mean: number; std: number; min: number; max: number }
  fit: {
    source: 'fitted' | 'given'
    kernel: KernelName
    /** ℓ in fine cells, and in km when the spacing is known. */
    lengthScale: number
    lengthScaleKm: number | null
    lengthScaleInterval: [number, number] | null
    variance: number
    mean: number
    atBound: 'lower' | 'upper' | null
    method: string | null
    logLikelihood: number | null
    /** The upper end of the ℓ search (fine cells), when fitted. */
    lengthScaleCap: number | null
    /** Latent transform the member pipeline applied (e.g. 'boxcox'), null when none. */
    transform: string | null
  }
  engine: { solver: string; blockMeanError: number; addedNugget: number; stdMethod: string | null; stdErrorBound: number | null }
  thresholds: { value: number; percentile: number | null; baseRate: number; useful: number }[]
  neighbourhoods: number[]
  /** The posterior mean, the sample ensemble and the interpolation baselines. */
  forecasts: ForecastScores[]
  /** Every conditional sample on its own. */
  samples: ForecastScores[]
  ensemble: {
    members: number
    crpsEnsemble: number
    /** √(mean unbiased sample variance), field units. */
    spread: number
    /** √((N+1)/N)·spread / RMSE of the ensemble mean: about 1 for a calibrated ensemble (Fortin et al. 2014). */
    spreadSkill: number | null
    rankHistogram: number[]
    /** Share of cells where the truth is below every sample / above every sample; 1/(N+1) each is expected. */
    outside: { below: number; above: number; expectedEach: number }
    /** Reliability diagram points per threshold: forecast probability k/N, cells, observed frequency. */
    reliability: { probability: number; count: number; observedFrequency: number }[][]
  }
  /** The Gaussian posterior itself (mean and pointwise std of the conditional distribution); null values when the model was not a single Gaussian field. */
  posterior: {
    /** Mean posterior variance over cells (field units²). */
    meanVariance: number | null
    /** Mean of ((truth − mean)/std)²: 1 when the posterior is calibrated. */
    standardisedErrorVariance: number | null
    /** CRPS of N(mean, std²) (Gneiting et al. 2005), mean over cells. */
    gaussianCrps: number | null
  }
  spectrum: {
    wavenumber: number[]
    /** Cycles per km and wavelength in km (null without a spacing). */
    wavenumberPerKm: number[] | null
    modes: number[]
    truth: (number | null)[]
    /** Posterior mean, samples (mean / lowest / highest over samples) and each baseline. */
    series: SpectrumSeries[]
    /** Coarse grid's Nyquist wavenumber 1/(2b), cycles per fine cell: shorter waves are sub-grid. */
    coarseNyquist: number
    window: string
    removeMean: boolean
    /** Factor within which the samples' mean spectrum is said to agree with the truth's. */
    agreementFactor: number
    /** Shortest wavelength (fine cells; km) down to which the samples' mean spectrum agrees at every ring, or null when it does not agree even at the longest. */
    samplesAgreeDownTo: { ring: number; cells: number; km: number | null } | null
  }
  /** The numbers the lists and batch summaries use. */
  headline: MethodCheckHeadline
  /** Plain-language sentences generated from the numbers (methodCheckSummary.ts). */
  summary: string[]
}

export interface MethodCheckHeadline {
  rmseMean: number
  rmseSampleAverage: number
  bestBaseline: string
  rmseBestBaseline: number
  crpsSamples: number
  maeBestBaseline: number
  /** Sub-grid power share of the samples (mean over samples) and of the best baseline. */
  subgridPowerSamples: number | null
  subgridPowerBestBaseline: number | null
  /** FSS at the first threshold and smallest neighbourhood. */
  fssSmallSamples: number | null
  fssSmallBestBaseline: number | null
  spreadSkill: number | null
}

/** Defaults of the settings a user may leave out (the page, the routes and `tessera check` share them). */
export const METHOD_CHECK_DEFAULTS: Readonly<Omit<MethodCheckSettings, 'factor'>> = {
  kernel: 'auto',
  transform: 'auto',
  anisotropy: 'off',
  regimes: 'off',
  samples: 20,
  seed: 1,
  thresholds: { kind: 'percentile', values: [75, 90, 97] },
  neighbourhoods: [1, 3, 5, 9, 17, 33, 65],
}

/** Progress reports: a fraction in [0, 1] and what is being done. */
export type MethodCheckProgress = (fraction: number, stage: string) => void

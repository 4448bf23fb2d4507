/**
 * Shapes of the forecast-run API as the pages use them (see server/utils/runs.ts and
 * server/ingest/types.ts RunSummary). Times arrive as ISO 8601 strings.
 */
import type { KERNEL_CHOICES } from '#shared/schemas/runs'
import type { RunContents } from '#shared/types/runContents'
import type { AnisotropyFit } from '#shared/numerics/fit/fitCoarse'
import type { RegimeSummary } from '#shared/numerics/pipeline/downscaleMember'
import type { TransformSummary } from '#shared/numerics/transform/latentCoarse'

export type { RunContents, RunGridSummary } from '#shared/types/runContents'

export type RunStatus = 'staged' | 'ready' | 'queued' | 'running' | 'completed' | 'failed' | 'cancelled'
export type TaskStatus = 'pending' | 'running' | 'done' | 'failed' | 'cancelled'
export type KernelChoice = (typeof KERNEL_CHOICES)[number]
export type FittedKernel = Exclude<KernelChoice, 'auto'> | 'matern'
export type FitMethod = 'exact' | 'kronecker' | 'whittle'

export interface RunSettings {
  factor: number; samplesPerMember: number; kernel: KernelChoice; seed: number
  transform?: 'auto' | 'none' | 'boxcox' | 'log' | 'censored'; anisotropy?: 'off' | 'fit'; regimes?: 'off' | 'windows'
  timeCoherence?: boolean; timeScaleHours?: number
}


/** A run as lists and pages show it (no large arrays). */
export interface RunSummaryDto extends RunContents {
  id: number
  name: string
  status: RunStatus
  sourceFileName: string
  sourceBytes: number
  heightM: number | null
  cellMethods: string | null
  /** Outer corners [lon, lat]: north-west, north-east, south-east, south-west. */
  corners: [number, number][]
  settings: RunSettings | null
  isDemo: boolean
  startedAt: string | null
  finishedAt: string | null
  createdAt: string
}

export interface TaskCounts { total: number; done: number; running: number; pending: number; failed: number; cancelled: number }

export interface RunListItem extends RunSummaryDto { progress: TaskCounts }

/** The preview of an uploaded file, before it is confirmed (server/ingest/types.ts RunSummary). */
export interface UploadPreview extends RunContents {
  heightM?: number
  cellMethods?: string
  /** First member at the first lead time, canonical units. */
  stats: { min: number; max: number; mean: number; missingCells: number }
}

export interface UploadResponse { run: RunSummaryDto; preview: UploadPreview }

/** Fitted prior of one member at one lead time (the list omits the profile curve). */
export interface TaskFit {
  kernel: FittedKernel
  nu?: number
  /** ℓ in fine-grid cells. */
  lengthScale: number
  lengthScaleKm: number
  lengthScaleIntervalKm: [number, number]
  /** σ², field units². */
  variance: number
  mean: number
  logLikelihood: number
  atBound: 'lower' | 'upper' | null
  method: FitMethod
  /** Largest rounding error of the stored 16-bit samples, field units. */
  precision?: number
  blockMeanError?: number
  /** Search interval for ℓ in fine cells. */
  lengthScaleBounds?: [number, number]
  candidates?: { kernel: FittedKernel; logLikelihood: number; lengthScale: number; method: FitMethod }[]
  profile?: ProfilePoint[]
  /** Present when the run's anisotropy setting is 'fit'. */
  anisotropy?: TaskAnisotropy
  /** The latent transform; absent on runs made before transforms existed. */
  transform?: TaskTransform
  /** Present when the run's regimes setting is 'windows'. */
  regimes?: TaskRegimes
}

/**
 * Fitted geometric anisotropy (shared/numerics/fit/fitCoarse.ts): ratio ℓ₂/ℓ₁, the long axis' angle from the
 * +column (east) axis towards the +row (north) axis, ℓ₁ and ℓ₂ in fine cells; `adopted` when the fit's ℓ, σ², …
 * are those of the anisotropic model.
 */
export type TaskAnisotropy = Pick<AnisotropyFit, 'source' | 'adopted' | 'ratio' | 'angle' | 'angleDegrees' | 'majorLengthScale' | 'minorLengthScale' | 'logLikelihoodGain'>

/** The latent transform of a member (shared/numerics/transform/latentCoarse.ts); the table needs name and λ. */
export type TaskTransform = Pick<TransformSummary, 'name' | 'lambda' | 'lambdaFitted'> & Partial<Omit<TransformSummary, 'name' | 'lambda' | 'lambdaFitted'>>

/** Regime windows of a member (shared/numerics/pipeline/downscaleMember.ts); per window the table needs whether it departs and its ℓ. */
export type TaskRegimes = Omit<RegimeSummary, 'windows'> & {
  windows: (Pick<RegimeSummary['windows'][number], 'departs' | 'lengthScale' | 'lengthScaleKm'> & Partial<RegimeSummary['windows'][number]>)[]
}

export interface ProfilePoint { lengthScaleKm: number; logLikelihood: number }

export interface RunTask {
  id: number
  leadIndex: number
  memberIndex: number
  status: TaskStatus
  attempts: number
  elapsedMs: number | null
  error: string | null
  startedAt: string | null
  finishedAt: string | null
  fit: TaskFit | null
}

export interface RunProgress extends TaskCounts { elapsedMs: number; estimateMs: number | null; meanTaskMs: number | null }

export interface RunDetail extends RunSummaryDto { sampleBytesEstimate: number | null; fineSpacingKm: number | null }

export interface RunDetailResponse { run: RunDetail; progress: RunProgress; tasks: RunTask[] }

export interface TaskProfileResponse {
  task: { id: number; leadIndex: number; memberIndex: number; status: TaskStatus; fit: (TaskFit & { profile: ProfilePoint[] }) | null }
}

/** What both the upload preview and a stored run can show about the file's contents. */
export type RunFacts = RunContents & { heightM?: number | null; cellMethods?: string | null; stats?: UploadPreview['stats'] }

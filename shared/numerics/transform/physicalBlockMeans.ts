/**
 * Restores the physical block means of back-transformed samples. Conditioning makes the latent
 * block means exact, A g = t, but block means are linear only there: A h(g) ≠ h(A g) (Jensen), so
 * the samples' physical block means miss the coarse values y. Documented correction:
 *  1. Re-conditioning rounds (smooth): the latent targets are moved by a Newton step per block,
 *     Δ_I = (y_I − mean_I h(g)) / mean_I h′(g) (the response of the block mean to a uniform latent
 *     shift), and the sample re-conditioned to them, g ← g + K Aᵀ C⁻¹ Δ, until every block is within
 *     `tolerance`, after `maxIterations` rounds, or once a round gains less than 30 % (shared rounds
 *     level off when only the samples' own fluctuations are left). By default the rounds are shared:
 *     every sample moves by the mean of the samples' steps, one coarse solve and one fine FFT per round
 *     whatever the number of samples (the Jensen gap mostly depends on the block's conditional spread,
 *     common to all samples); `shared: false` gives each sample its own step (one solve and FFT per
 *     two samples).
 *     The error of a block is |y − mean h(g)| / max(y, ȳ), ȳ the mean of the positive coarse values,
 *     so near-zero amounts are judged on the field's scale rather than their own.
 *     Censored model: a dry block (y = 0) whose latent maximum is above the threshold gets Δ = −max g
 *     (pushing it below), and a wet block whose sample is entirely dry gets the step that lifts its
 *     highest cell to h⁻¹(y).
 *  2. Exact finish (per block): the uniform latent shift δ_I with mean h(g + δ_I) = y_I (a monotone
 *     equation: safeguarded Newton, to 1e-4), then a rescaling by y/mean (a factor within 1e-4 of 1) so the
 *     block mean is y to rounding; dry blocks are set to 0. A shift, not a rescaling, because it keeps
 *     the censored model's meaning: a near-dry block becomes mostly dry, not uniformly drizzly.
 * Afterwards every block mean equals y to rounding (≈1e-15 relative). The shifts are steps at block
 * edges; the report gives the largest (latent units, and over `latentScale`) so they are never hidden.
 */
import type { LatentTransform } from './latentTransform'

export interface PhysicalMeanOptions {
  /** Re-conditioning rounds at most (default 2). */
  maxIterations?: number
  /** Relative block-mean error below which no further round is made (default 1e-3). */
  tolerance?: number
  /** Largest latent target change per block and round, latent units (default: no limit). */
  maxStep?: number
  /** Latent standard deviation, to report the final shifts relative to it (default 1). */
  latentScale?: number
  /** One common target change for all samples per round (default true; see the module note). */
  shared?: boolean
}

export interface PhysicalMeanReport {
  /** Re-conditioning rounds made. */
  iterations: number
  /** Largest block-mean error (see the module note) of the plain back-transform h(g), and after the rounds. */
  initialRelativeError: number
  iteratedRelativeError: number
  /** Largest |δ| of the final per-block latent shifts, in latent units and over latentScale. */
  maxShift: number
  maxShiftInScale: number
  /** Root-mean-square δ over the wet blocks of all samples, over latentScale. */
  rmsShiftInScale: number
  /** Largest |factor − 1| of the rescaling after the shift (≤ 1e-4). */
  maxRescale: number
  /** Share of the dry blocks' fine cells that were wet in the latent sample after the rounds (set to 0). */
  forcedDryFraction: number
  /** Largest relative block-mean error of the returned samples (wet blocks; dry blocks are exactly 0). */
  finalRelativeError: number
}

export interface BlockGrid { nx: number; ny: number; factor: number }

/** Re-conditions latent fields to changed coarse targets (Downscaler.recondition). */
export type Recondition = (fields: Float64Array[], changes: Float64Array[]) => Float64Array[]

interface BlockStats { meanX: number; meanSlope: number; maxG: number; minG: number }

/** Block statistics of h(g + δ); when `out` is given, h(g + δ) is also written to the block's cells there. */
function blockStats(g: Float64Array, grid: BlockGrid, I: number, J: number, h: LatentTransform, delta = 0, out?: Float64Array): BlockStats {
  const b = grid.factor, width = grid.nx * b
  let sx = 0, sd = 0, maxG = -Infinity, minG = Infinity
  for (let q = 0; q < b; q++) {
    const row = (J * b + q) * width + I * b
    for (let p = row; p < row + b; p++) {
      const v = g[p]! + delta, x = h.toPhysical(v)
      if (out) out[p] = x
      sx += x; sd += h.slopeAt(v, x)
      if (v > maxG) maxG = v
      if (v < minG) minG = v
    }
  }
  return { meanX: sx / (b * b), meanSlope: sd / (b * b), maxG, minG }
}

/**
 * Physical samples h(g) whose b×b block means equal `physical` (row-major nx×ny, NaN = missing) for
 * latent conditional samples g (row-major fine grids). The latent fields are not modified.
 */
export function restorePhysicalBlockMeans(
  latent: Float64Array[], physical: Float64Array, grid: BlockGrid, h: LatentTransform, recondition: Recondition,
  options: PhysicalMeanOptions = {},
): { samples: Float64Array[]; report: PhysicalMeanReport } {
  const { nx, ny, factor: b } = grid
  const maxIterations = options.maxIterations ?? 2, tolerance = options.tolerance ?? 1e-3, maxStep = options.maxStep ?? Infinity
  const report: PhysicalMeanReport = { iterations: 0, initialRelativeError: 0, iteratedRelativeError: 0, maxShift: 0, maxShiftInScale: 0, rmsShiftInScale: 0, maxRescale: 0, forcedDryFraction: 0, finalRelativeError: 0 }
  if (h.name === 'none') return { samples: latent.map((g) => Float64Array.from(g)), report }
  const m = nx * ny
  let wetSum = 0, wetCount = 0
  for (const y of physical) if (y > 0) { wetSum += y; wetCount++ }
  const typical = wetCount > 0 ? wetSum / wetCount : 1
  let fields = latent
  // Each round's block statistics, kept so the exact finish starts from the last ones without a new pass.
  const stats = latent.map(() => ({ meanX: new Float64Array(m), meanSlope: new Float64Array(m), maxG: new Float64Array(m), minG: new Float64Array(m) }))
  let previous = Infinity
  for (let round = 0; ; round++) {
    let worst = 0
    const changes = fields.map(() => new Float64Array(m))
    fields.forEach((g, s) => {
      const kept = stats[s]!
      for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
        const k = J * nx + I, y = physical[k]!
        if (!Number.isFinite(y)) continue
        const st = blockStats(g, grid, I, J, h)
        kept.meanX[k] = st.meanX; kept.meanSlope[k] = st.meanSlope; kept.maxG[k] = st.maxG; kept.minG[k] = st.minG
        let step: number
        if (h.censored && y === 0) {
          step = st.maxG > 0 ? -st.maxG : 0
        } else {
          worst = Math.max(worst, Math.abs(y - st.meanX) / Math.max(y, typical))
          step = st.meanSlope > 0 ? (y - st.meanX) / st.meanSlope : h.toLatent(y) - st.maxG
        }
        changes[s]![k] = Math.max(-maxStep, Math.min(maxStep, step))
      }
    })
    if (round === 0) report.initialRelativeError = worst
    report.iteratedRelativeError = worst
    // Stop when close enough, out of rounds, or when the last round gained less than 30 %
    // (shared rounds level off once only the samples' own fluctuations are left).
    if (worst <= tolerance || round >= maxIterations || worst > 0.7 * previous) break
    previous = worst
    if (options.shared ?? true) {
      const common = new Float64Array(m)
      for (const c of changes) for (let k = 0; k < m; k++) common[k]! += c[k]! / changes.length
      const [correction] = recondition([new Float64Array(fields[0]!.length)], [common])
      fields = fields.map((g) => g.map((v, c) => v + correction![c]!))
    } else {
      fields = recondition(fields, changes)
    }
    report.iterations = round + 1
  }
  let forced = 0, dryCells = 0, shiftSquares = 0, shifted = 0
  const samples = fields.map((g, s) => {
    const x = new Float64Array(g.length), kept = stats[s]!
    for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
      const k = J * nx + I, y = physical[k]!
      if (!Number.isFinite(y)) { forEachCell(grid, I, J, (c) => { x[c] = h.toPhysical(g[c]!) }); continue }
      if (h.censored && y === 0) {
        dryCells += b * b
        forEachCell(grid, I, J, (c) => { if (g[c]! > 0) forced++ })
        continue // x is already 0 there
      }
      const start = { meanX: kept.meanX[k]!, meanSlope: kept.meanSlope[k]!, maxG: kept.maxG[k]!, minG: kept.minG[k]! }
      const { delta, meanX } = shiftToMean(g, x, grid, I, J, h, y, start)
      report.maxShift = Math.max(report.maxShift, Math.abs(delta))
      shiftSquares += delta * delta; shifted++
      const factorY = y / meanX
      report.maxRescale = Math.max(report.maxRescale, Math.abs(factorY - 1))
      forEachCell(grid, I, J, (c) => { x[c]! *= factorY })
    }
    return x
  })
  const scale = options.latentScale ?? 1
  report.maxShiftInScale = report.maxShift / scale
  report.rmsShiftInScale = shifted > 0 ? Math.sqrt(shiftSquares / shifted) / scale : 0
  report.forcedDryFraction = dryCells > 0 ? forced / dryCells : 0
  report.finalRelativeError = finalError(samples, physical, grid)
  return { samples, report }
}

function forEachCell(grid: BlockGrid, I: number, J: number, f: (cell: number) => void): void {
  const b = grid.factor, width = grid.nx * b
  for (let q = 0; q < b; q++) {
    const row = (J * b + q) * width + I * b
    for (let p = 0; p < b; p++) f(row + p)
  }
}

/**
 * Writes h(g + δ) to block (I, J) of x for the uniform latent shift δ that brings its mean to y > 0
 * (to FINISH_TOLERANCE relative; the caller's rescaling does the rest), and returns δ and that mean.
 * F(δ) = mean h(g + δ) − y increases from −y (δ → −∞) to ∞: Newton steps inside a bracket,
 * bisection when a step leaves it. `start` holds the block's statistics at δ = 0.
 */
function shiftToMean(g: Float64Array, x: Float64Array, grid: BlockGrid, I: number, J: number, h: LatentTransform, y: number, start: BlockStats): { delta: number; meanX: number } {
  let lo = -Infinity, hi = Infinity, delta = 0, written = false
  let st = start
  let f = st.meanX - y
  const span = Math.max(1, st.maxG - st.minG)
  for (let iteration = 0; iteration < 200 && !(Math.abs(f) <= FINISH_TOLERANCE * y); iteration++) {
    if (f < 0) lo = delta; else hi = delta
    let next = st.meanSlope > 0 ? delta - f / st.meanSlope : NaN
    if (!(next > lo && next < hi)) {
      if (Number.isFinite(lo) && Number.isFinite(hi)) next = 0.5 * (lo + hi)
      // No bracket yet: step towards the root, growing with the distance already travelled.
      else next = f < 0 ? delta + 2 * Math.max(span, Math.abs(delta)) : delta - 2 * Math.max(span, Math.abs(delta))
    }
    if (next === delta) break
    delta = next
    st = blockStats(g, grid, I, J, h, delta, x)
    written = true
    f = st.meanX - y
  }
  if (!written) st = blockStats(g, grid, I, J, h, delta, x)
  return { delta, meanX: st.meanX }
}

/** Relative accuracy of the finish's shift; the rescaling after it (a factor within this of 1) makes the mean exact. */
const FINISH_TOLERANCE = 1e-4

/** Largest relative |block mean − y| over wet blocks (absolute for y = 0 blocks). */
function finalError(samples: Float64Array[], physical: Float64Array, grid: BlockGrid): number {
  const { nx, ny, factor: b } = grid
  let worst = 0
  for (const x of samples) for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
    const y = physical[J * nx + I]!
    if (!Number.isFinite(y)) continue
    let s = 0
    forEachCell(grid, I, J, (c) => { s += x[c]! })
    const mean = s / (b * b)
    worst = Math.max(worst, y === 0 ? Math.abs(mean) : Math.abs(mean - y) / y)
  }
  return worst
}

/**
 * Preconditioner for the coarse covariance C = P Γ Pᵀ (the torus circulant Γ restricted to the nx×ny
 * window W): the torus inverse M = P Γ⁻¹ Pᵀ with a correction along the window edges.
 *
 * Why: with X the torus cells outside the window and H = Γ⁻¹, the block-inverse (Schur complement)
 * identity gives C⁻¹ = H_WW − H_WX (H_XX)⁻¹ H_XW = M − E, with E ⪰ 0. E lives near the window edges
 * and falls off geometrically with the distance to them (the precision H is short-range). Left in,
 * it spreads the spectrum of M·C over [1, ~15] with O(perimeter) outliers, which is what makes
 * torus-preconditioned CG take ~50 iterations at 1e-13.
 *
 * How: each pair of opposite edges is corrected with the exact E of a cylinder — the window made
 * periodic along the edge (period = torus side) and D cells deep across it. On the cylinder C and M
 * are diagonalised by the DFT along the edge, so for every along-edge frequency ω the correction is
 * the small D×D Hermitian matrix E_ω = M_ω − C_ω⁻¹ (M_ω, C_ω the across-edge Toeplitz matrices of the
 * partial DFTs of h and c). Its w×w corner blocks, the strips of width w along the two edges, are kept
 * (w from the decay of E, see `EdgeCorrectionOptions`); a window no deeper than D is corrected with the
 * whole D×D matrix. Corners get both corrections, which counts the exterior quadrant twice and can
 * make M − E_rows − E_columns indefinite (it does for Matérn-5/2); so on a K×K square at each corner
 * (K = ⌈w/2⌉) the correction is replaced by the exact E of a small 2K×2K window sharing the corner
 * (dense Cholesky); its own far edges are K cells away, where E has decayed. Applying the corrections
 * costs a few 1-D FFTs per strip row, about a fifth of applying M. Positive definiteness is still not
 * guaranteed (strips too narrow for very smooth kernels), so the caller must detect a breakdown.
 * Measured (1024² fine, b = 8, Matérn-3/2, ℓ = 2 coarse cells, tolerance 1e-13): see pcgCoarseSolver.
 * Coarse vectors are row-major nx×ny (index J·nx + I); missing cells are zero on input and output.
 */
import { fft2d } from '../fft/fft2d'
import { complexFftPlan, type ComplexFftPlan } from '../fft/fftPlan'
import { invertHermitianPositive } from '../linalg/hermitianInverse'
import { choleskyFactor, choleskySolve } from '../linalg/cholesky'
import type { CoarseCovariance } from './coarseCovariance'

export interface EdgeCorrectionOptions {
  /** Largest strip width in coarse cells (default 12). */
  maxWidth?: number
  /** The strip ends where every entry of E is below this fraction of its largest (default 1e-6). */
  tolerance?: number
  /** Side of the corner squares as a fraction of the strip width (default 0.5). */
  cornerFraction?: number
  /** Cells between a corner square and the far edges of the small window it is computed on (default K). */
  cornerMargin?: number
}

/** One strip: window rows (or columns) [start, start + size), with a size×size matrix per frequency. */
interface Strip {
  start: number
  size: number
  /** E_ω(s, t) at ((ω·size + s)·size + t)·2 (+1 for the imaginary part). */
  matrices: Float64Array
}

/** The corrections of two opposite edges: 'rows' = top and bottom (DFT along x), 'columns' = left and right. */
interface EdgePair {
  along: 'rows' | 'columns'
  /** Torus side along the edge (the cylinder's period) and the window length along it. */
  period: number
  length: number
  strips: Strip[]
  plan: ComplexFftPlan
  /** Depth (cells) beyond which E is below the tolerance, at most maxWidth; the strip width unless the window is shallow. */
  decayWidth: number
}

/** Depth of the cylinder beyond the two strips, so that the two edges do not see each other. */
const CYLINDER_MARGIN = 8

export class EdgeCorrectedPreconditioner {
  /** Strip width used for the top/bottom and left/right edges (0 = that pair is not corrected). */
  readonly widths: { rows: number; columns: number }
  /** Side K of the corner squares (0 = no corner fix). */
  readonly cornerSize: number
  private readonly pairs: EdgePair[] = []
  private readonly corners: CornerFix[]
  private spectrum = new Float64Array(0)
  private scratch = new Float64Array(0)

  constructor(private readonly covariance: CoarseCovariance, options: EdgeCorrectionOptions = {}) {
    const maxWidth = options.maxWidth ?? 12
    const tolerance = options.tolerance ?? 1e-6
    const { torusNx: tx, torusNy: ty, symbol } = covariance
    // h: first column of Γ⁻¹ on the torus (real; γ > 0 on a well-posed system).
    const hRe = symbol.map((v) => (v > 0 ? 1 / v : 0)), hIm = new Float64Array(symbol.length)
    fft2d(hRe, hIm, tx, ty, true)
    const c = covariance.firstColumn
    const rows = buildEdgePair('rows', c, hRe, covariance, maxWidth, tolerance)
    const columns = buildEdgePair('columns', c, hRe, covariance, maxWidth, tolerance)
    this.widths = { rows: rows?.strips[0]!.size ?? 0, columns: columns?.strips[0]!.size ?? 0 }
    for (const p of [rows, columns]) if (p) this.pairs.push(p)
    this.corners = rows && columns ? cornerFixes(rows, columns, c, hRe, covariance, options) : []
    this.cornerSize = this.corners.length ? Math.round(Math.sqrt(this.corners[0]!.cells.length)) : 0
  }

  /** out[j] ← (M − E) input[j]; two real vectors share each complex transform. */
  apply(input: Float64Array[], out: Float64Array[]): void {
    this.covariance.applyTorusInverse(input, out)
    for (let start = 0; start < input.length; start += 2) {
      for (const pair of this.pairs) this.subtractCorrection(pair, input[start]!, input[start + 1], out[start]!, out[start + 1])
    }
    const observed = this.covariance.observed
    for (const { cells, matrix } of this.corners) {
      const m = cells.length
      for (let j = 0; j < input.length; j++) {
        const x = input[j]!, o = out[j]!
        for (let p = 0; p < m; p++) {
          if (!observed[cells[p]!]) continue
          let s = 0
          for (let q = 0; q < m; q++) s += matrix[p * m + q]! * x[cells[q]!]!
          o[cells[p]!]! -= s
        }
      }
    }
  }

  /** outA/outB −= E·a / E·b for one pair of opposite edges (strip rows packed as a + i·b). */
  private subtractCorrection(pair: EdgePair, a: Float64Array, b: Float64Array | undefined, outA: Float64Array, outB: Float64Array | undefined): void {
    const { nx, observed } = this.covariance
    const { period: T, length: L, plan } = pair
    for (const strip of pair.strips) {
      const { start, size, matrices } = strip
      const need = 2 * T * size
      if (this.spectrum.length < need) { this.spectrum = new Float64Array(need); this.scratch = new Float64Array(need) }
      const spectrum = this.spectrum, line = this.scratch
      // Forward DFT along the edge of every strip line (zero beyond the window).
      for (let s = 0; s < size; s++) {
        line.fill(0, 0, 2 * T)
        for (let t = 0; t < L; t++) {
          const k = pair.along === 'rows' ? (start + s) * nx + t : t * nx + start + s
          if (!observed[k]) continue
          line[2 * t] = a[k]!
          if (b) line[2 * t + 1] = b[k]!
        }
        plan.forward(spectrum.subarray(2 * T * s, 2 * T * (s + 1)), line)
      }
      // Per frequency: U(ω) = E_ω V(ω), written into the scratch buffer.
      for (let w = 0; w < T; w++) {
        const m0 = w * size * size * 2
        for (let s = 0; s < size; s++) {
          let ur = 0, ui = 0
          const row = m0 + s * size * 2
          for (let t = 0; t < size; t++) {
            const er = matrices[row + 2 * t]!, ei = matrices[row + 2 * t + 1]!
            const vr = spectrum[2 * (T * t + w)]!, vi = spectrum[2 * (T * t + w) + 1]!
            ur += er * vr - ei * vi
            ui += er * vi + ei * vr
          }
          line[2 * (T * s + w)] = ur
          line[2 * (T * s + w) + 1] = ui
        }
      }
      // Inverse DFT of each corrected line back into the window.
      for (let s = 0; s < size; s++) {
        const u = spectrum.subarray(0, 2 * T)
        plan.inverse(u, line.subarray(2 * T * s, 2 * T * (s + 1)))
        for (let t = 0; t < L; t++) {
          const k = pair.along === 'rows' ? (start + s) * nx + t : t * nx + start + s
          if (!observed[k]) continue
          outA[k]! -= u[2 * t]!
          if (outB) outB[k]! -= u[2 * t + 1]!
        }
      }
    }
  }
}

/**
 * Partial DFTs along the edge of a torus field f (row-major tx×ty): for each across-edge lag
 * d ∈ (−D, D), the spectrum along the edge of the torus line at that lag; result at ((d + D − 1)·T + ω)·2.
 */
function lineSpectra(f: Float64Array, tx: number, ty: number, along: 'rows' | 'columns', depth: number, plan: ComplexFftPlan): Float64Array {
  const T = along === 'rows' ? tx : ty, across = along === 'rows' ? ty : tx
  const out = new Float64Array(2 * T * (2 * depth - 1)), line = new Float64Array(2 * T)
  for (let d = -(depth - 1); d < depth; d++) {
    const q = ((d % across) + across) % across
    for (let t = 0; t < T; t++) line[2 * t] = along === 'rows' ? f[q * tx + t]! : f[t * tx + q]!
    plan.forward(out.subarray(2 * T * (d + depth - 1), 2 * T * (d + depth)), line)
  }
  return out
}

/** Cylinder corrections for one pair of opposite edges, or undefined when the window is too thin to need one. */
function buildEdgePair(along: 'rows' | 'columns', c: Float64Array, h: Float64Array, covariance: CoarseCovariance, maxWidth: number, tolerance: number): EdgePair | undefined {
  const { nx, ny, torusNx: tx, torusNy: ty } = covariance
  const across = along === 'rows' ? ny : nx, length = along === 'rows' ? nx : ny
  const T = along === 'rows' ? tx : ty
  if (across < 2) return undefined
  const whole = across <= 2 * maxWidth + CYLINDER_MARGIN
  const D = whole ? across : 2 * maxWidth + CYLINDER_MARGIN
  const plan = complexFftPlan(T)
  const cHat = lineSpectra(c, tx, ty, along, D, plan), hHat = lineSpectra(h, tx, ty, along, D, plan)
  // E_ω for ω ≤ T/2; c and h are real, so E_{T−ω} = conj(E_ω).
  const full = new Float64Array(2 * T * D * D)
  const aRe = new Float64Array(D * D), aIm = new Float64Array(D * D)
  for (let w = 0; w <= T / 2; w++) {
    for (let j = 0; j < D; j++) for (let k = 0; k < D; k++) {
      const o = 2 * (T * (j - k + D - 1) + w)
      aRe[j * D + k] = cHat[o]!; aIm[j * D + k] = cHat[o + 1]!
    }
    const inv = invertHermitianPositive(aRe, aIm, D)
    for (let j = 0; j < D; j++) for (let k = 0; k < D; k++) {
      const o = 2 * (T * (j - k + D - 1) + w)
      const er = hHat[o]! - inv.re[j * D + k]!, ei = hHat[o + 1]! - inv.im[j * D + k]!
      const p = 2 * ((w * D + j) * D + k)
      full[p] = er; full[p + 1] = ei
      if (w > 0 && w < T - w) {
        const q = 2 * (((T - w) * D + j) * D + k)
        full[q] = er; full[q + 1] = -ei
      }
    }
  }
  const width = decayWidth(full, T, D, maxWidth, tolerance)
  if (whole) return { along, period: T, length, plan, decayWidth: width, strips: [{ start: 0, size: D, matrices: full }] }
  const block = (from: number): Float64Array => {
    const m = new Float64Array(2 * T * width * width)
    for (let w = 0; w < T; w++) for (let s = 0; s < width; s++) for (let t = 0; t < width; t++) {
      const p = 2 * ((w * D + from + s) * D + from + t), q = 2 * ((w * width + s) * width + t)
      m[q] = full[p]!; m[q + 1] = full[p + 1]!
    }
    return m
  }
  return {
    along, period: T, length, plan, decayWidth: width,
    strips: [{ start: 0, size: width, matrices: block(0) }, { start: across - width, size: width, matrices: block(D - width) }],
  }
}

/** Smallest w ≤ maxWidth beyond which every |E_ω(j, k)| near the first edge (j, k < D/2) is below tolerance·max|E| (at least 1). */
function decayWidth(full: Float64Array, T: number, D: number, maxWidth: number, tolerance: number): number {
  const half = Math.floor(D / 2)
  const profile = new Float64Array(half)
  for (let w = 0; w < T; w++) for (let j = 0; j < half; j++) for (let k = 0; k < half; k++) {
    const p = 2 * ((w * D + j) * D + k)
    profile[j] = Math.max(profile[j]!, Math.hypot(full[p]!, full[p + 1]!))
  }
  const top = Math.max(...profile)
  let width = half
  while (width > 1 && profile[width - 1]! <= tolerance * top) width--
  return Math.min(width, maxWidth)
}

/** Corner square: window cells (row-major order of the square) and the extra correction F = E_exact − E_strips on them. */
interface CornerFix {
  cells: Int32Array
  matrix: Float64Array
}

/**
 * Real-space kernel of one strip's correction between strip lines s and t at along-edge offset dx:
 * e(dx, s, t) = (1/T) Σ_ω E_ω(s, t) e^{2πi ω dx/T} (real, because E_{T−ω} = conj E_ω).
 * `cos`/`sin` hold cos, sin(2π q/T) for q ∈ [0, T).
 */
function stripKernel(strip: Strip, T: number, dx: number, s: number, t: number, cos: Float64Array, sin: Float64Array): number {
  const { size, matrices } = strip
  const step = ((dx % T) + T) % T
  let sum = 0
  for (let w = 0, q = 0; w < T; w++, q = (q + step) % T) {
    const p = 2 * ((w * size + s) * size + t)
    sum += matrices[p]! * cos[q]! - matrices[p + 1]! * sin[q]!
  }
  return sum / T
}

/** The strip corrections' combined entry between window cells (i, j) and (i2, j2). */
function stripEntry(pairs: EdgePair[], i: number, j: number, i2: number, j2: number, tables: Map<number, [Float64Array, Float64Array]>): number {
  let sum = 0
  for (const pair of pairs) {
    const [cos, sin] = tables.get(pair.period)!
    const [across, across2, along, along2] = pair.along === 'rows' ? [j, j2, i, i2] : [i, i2, j, j2]
    for (const strip of pair.strips) {
      const s = across - strip.start, t = across2 - strip.start
      if (s < 0 || t < 0 || s >= strip.size || t >= strip.size) continue
      sum += stripKernel(strip, pair.period, along - along2, s, t, cos, sin)
    }
  }
  return sum
}

/**
 * Exact corrections on the four K×K corner squares: E = M − C_L⁻¹ of an Lx×Ly window (L = K + margin,
 * at most the window) sharing the corner, minus what the strips already subtract there.
 */
function cornerFixes(rows: EdgePair, columns: EdgePair, c: Float64Array, h: Float64Array, covariance: CoarseCovariance, options: EdgeCorrectionOptions): CornerFix[] {
  const { nx, ny, torusNx: tx, torusNy: ty } = covariance
  const width = Math.min(rows.decayWidth, columns.decayWidth)
  const K = Math.ceil(width * (options.cornerFraction ?? 0.5))
  if (K < 1 || nx < 2 * K || ny < 2 * K) return []
  const margin = options.cornerMargin ?? K
  const lx = Math.min(K + margin, nx), ly = Math.min(K + margin, ny)
  const torusValue = (f: Float64Array, dx: number, dy: number) => f[(((dy % ty) + ty) % ty) * tx + (((dx % tx) + tx) % tx)]!
  // Dense covariance of the small window (row-major cells, index y·lx + x).
  const n = lx * ly
  const dense = new Float64Array(n * n)
  for (let p = 0; p < n; p++) for (let q = 0; q <= p; q++) {
    const v = torusValue(c, (p % lx) - (q % lx), Math.floor(p / lx) - Math.floor(q / lx))
    dense[p * n + q] = v; dense[q * n + p] = v
  }
  const L = choleskyFactor(dense, n)
  const pairs = [rows, columns]
  const tables = new Map<number, [Float64Array, Float64Array]>()
  for (const { period: T } of pairs) {
    tables.set(T, [Float64Array.from({ length: T }, (_, q) => Math.cos(2 * Math.PI * q / T)), Float64Array.from({ length: T }, (_, q) => Math.sin(2 * Math.PI * q / T))])
  }
  const fixes: CornerFix[] = []
  for (const [right, bottom] of [[false, false], [true, false], [false, true], [true, true]] as const) {
    const i0 = right ? nx - K : 0, j0 = bottom ? ny - K : 0
    const li0 = right ? lx - K : 0, lj0 = bottom ? ly - K : 0
    const m = K * K
    const cells = new Int32Array(m), local = new Int32Array(m)
    for (let a = 0; a < K; a++) for (let b = 0; b < K; b++) {
      cells[a * K + b] = (j0 + a) * nx + i0 + b
      local[a * K + b] = (lj0 + a) * lx + li0 + b
    }
    const matrix = new Float64Array(m * m)
    const unit = new Float64Array(n)
    for (let q = 0; q < m; q++) {
      unit.fill(0); unit[local[q]!] = 1
      const column = choleskySolve(L, n, unit)
      const iq = cells[q]! % nx, jq = Math.floor(cells[q]! / nx)
      for (let p = 0; p < m; p++) {
        const ip = cells[p]! % nx, jp = Math.floor(cells[p]! / nx)
        const exact = torusValue(h, ip - iq, jp - jq) - column[local[p]!]!
        matrix[p * m + q] = exact - stripEntry(pairs, ip, jp, iq, jq, tables)
      }
    }
    fixes.push({ cells, matrix })
  }
  return fixes
}

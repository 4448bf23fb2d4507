/**
 * One-dimensional upsampling weights from m coarse cells to b·m fine cells.
 *
 * Geometry: coarse cell I covers fine cells bI … bI + b − 1, so fine cell i (centre i + ½ in
 * fine units) sits at coarse coordinate u = (i + ½)/b − ½, where coarse centres are the integers.
 * Values are attached to coarse centres (point values); block-mean data are handled by
 * blockMeanPrefilter.ts.
 *
 * Edges: taps that fall outside 0 … m − 1 use ghost values extrapolated by the polynomial
 * through the nearest d + 1 coarse values (d = 1 for bilinear, d = 2 for bicubic: the boundary condition of
 * Keys 1981, IEEE Trans. ASSP 29:1153, c₋₁ = 3c₀ − 3c₁ + c₂), lowered to m − 1 when
 * the axis is shorter. Ghosts are folded into the weights, so every weight refers to a real cell.
 */

export type InterpolationMethod = 'nearest' | 'bilinear' | 'bicubic'

/** Sparse row-per-fine-cell weights: fine[i] = Σ_k weight[i·width + k] · coarse[index[i·width + k]]. */
export interface AxisWeights {
  fineCount: number
  coarseCount: number
  /** Taps stored per fine cell (unused slots have weight 0). */
  width: number
  index: Int32Array
  weight: Float64Array
}

/**
 * Keys' cubic convolution kernel with a = −½ (Keys 1981): the choice that makes the
 * interpolant exact for polynomials up to degree 2 (third-order accurate); s in coarse cells.
 */
export function keysKernel(s: number): number {
  const x = Math.abs(s)
  // Factored forms of 1.5x³ − 2.5x² + 1 and −0.5x³ + 2.5x² − 4x + 2 (fewer cancellations).
  if (x <= 1) return (1 - x) * (1 + x - 1.5 * x * x)
  if (x < 2) return -0.5 * (x - 1) * (2 - x) * (2 - x)
  return 0
}

/** Lagrange basis weights L_k(x) for the given nodes (exact extrapolation of degree < nodes.length). */
function lagrangeWeights(nodes: number[], x: number): number[] {
  return nodes.map((xk, k) => nodes.reduce((p, xj, j) => (j === k ? p : p * (x - xj) / (xk - xj)), 1))
}

const GHOST_DEGREE: Record<InterpolationMethod, number> = { nearest: 0, bilinear: 1, bicubic: 2 }

/** Raw taps (coarse index, weight) of one fine cell before ghosts are folded in. */
function rawTaps(method: InterpolationMethod, i: number, factor: number): Array<[number, number]> {
  if (method === 'nearest') return [[Math.floor(i / factor), 1]]
  const u = (i + 0.5) / factor - 0.5
  const i0 = Math.floor(u)
  const t = u - i0
  if (method === 'bilinear') return [[i0, 1 - t], [i0 + 1, t]]
  return [[i0 - 1, keysKernel(t + 1)], [i0, keysKernel(t)], [i0 + 1, keysKernel(1 - t)], [i0 + 2, keysKernel(2 - t)]]
}

/**
 * Weights of `method` for an axis of `coarseCount` cells upsampled by the integer `factor`.
 * nearest: the fine cell takes its own block's value; bilinear: linear between the two nearest
 * coarse centres; bicubic: Keys (a = −½) through the four nearest.
 */
export function axisWeights(method: InterpolationMethod, coarseCount: number, factor: number): AxisWeights {
  if (!Number.isInteger(coarseCount) || coarseCount < 1) throw new Error(`coarse axis length must be a positive integer, got ${coarseCount}`)
  if (!Number.isInteger(factor) || factor < 1) throw new Error(`upsampling factor must be a positive integer, got ${factor}`)
  const m = coarseCount
  const degree = Math.min(GHOST_DEGREE[method], m - 1)
  const lowNodes = Array.from({ length: degree + 1 }, (_, k) => k)
  const highNodes = Array.from({ length: degree + 1 }, (_, k) => m - 1 - k)
  const width = method === 'nearest' ? 1 : method === 'bilinear' ? 2 : 4
  const fineCount = m * factor
  const index = new Int32Array(fineCount * width)
  const weight = new Float64Array(fineCount * width)
  for (let i = 0; i < fineCount; i++) {
    const merged = new Map<number, number>()
    const add = (J: number, w: number) => merged.set(J, (merged.get(J) ?? 0) + w)
    for (const [J, w] of rawTaps(method, i, factor)) {
      if (w === 0) continue
      if (J >= 0 && J < m) add(J, w)
      else {
        const nodes = J < 0 ? lowNodes : highNodes
        lagrangeWeights(nodes, J).forEach((l, k) => add(nodes[k]!, w * l))
      }
    }
    if (merged.size > width) throw new Error('internal: more interpolation taps than expected')
    let k = 0
    for (const [J, w] of merged) { index[i * width + k] = J; weight[i * width + k] = w; k++ }
  }
  return { fineCount, coarseCount: m, width, index, weight }
}

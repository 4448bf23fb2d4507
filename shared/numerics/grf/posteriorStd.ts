/**
 * Pointwise conditional standard deviation of the fine field given the observed block means,
 *   var_i = k(0) − v_iᵀ C⁻¹ v_i,   v_i = (A K)_{:,i}  (covariance of pixel i with every observed block mean),
 * computed without Monte Carlo by one of three methods:
 *  - 'kronecker' (se, complete grid): exact. With C = s·Cx⊗Cy + t·I diagonalised by Qy⊗Qx, v_iᵀC⁻¹v_i is a
 *    sum over eigenpairs of products of 1-D terms, i.e. three small matrix products (Saatçi 2011).
 *  - 'dense': exact, v_iᵀC⁻¹v_i = ‖L⁻¹v_i‖² with the Cholesky factor L of C; O(W·m²), small grids only
 *    (the window method with a window covering the grid).
 *  - 'window' (large non-separable grids): see windowPosteriorVariance.ts; exact when the window covers
 *    the grid, otherwise never below the exact std, with a certified bound (tight away from the edges).
 * All methods use the torus model of the set-up (the embedded kernel, including any nugget).
 */
import { fft2d } from '../fft/fft2d'
import { matmul } from '../linalg/denseMatrix'
import type { ConditioningModel } from './conditioningModel'
import { KroneckerCoarseSolver } from './kroneckerCoarseSolver'
import { boxTransfer } from './torusBlockOperator'
import { torusPointVariance } from './blockResponse'
import { windowPosteriorVariance } from './windowPosteriorVariance'

export interface PosteriorStdOptions {
  method?: 'auto' | 'kronecker' | 'dense' | 'window'
  /** Window method: accepted certified bound on each variance, as a fraction of k(0) (default 1e-6). */
  tolerance?: number
  /** Window method: fixed window side in coarse cells (default: grown until the bound meets the tolerance). */
  window?: number
  /** Window method: largest window side tried (default 25). */
  maxWindow?: number
}

export interface PosteriorStdResult {
  std: Float64Array
  method: 'kronecker' | 'dense' | 'window'
  /** Certified bound on |std − exact std| over all pixels (0 when exact to rounding). */
  errorBound: number
  /** Window method: the certified bound away from the grid edges (see windowPosteriorVariance.ts). */
  interiorErrorBound?: number
  /** Window side used (window method). */
  window?: number
}

/** Largest W·m² for which the automatic choice uses the dense method. */
const DENSE_WORK_LIMIT = 3e9

/** Computes the conditional standard deviation on the fine window (row-major). */
export function posteriorStd(model: ConditioningModel, options: PosteriorStdOptions = {}): PosteriorStdResult {
  const method = options.method ?? 'auto'
  const solver = model.solver
  if (method === 'kronecker' || (method === 'auto' && solver instanceof KroneckerCoarseSolver)) {
    if (!(solver instanceof KroneckerCoarseSolver) || !model.separable) throw new Error('the Kronecker std needs the Kronecker coarse solver (se kernel, complete grid)')
    return { std: kroneckerStd(model, solver), method: 'kronecker', errorBound: 0 }
  }
  const work = model.fineNx * model.fineNy * model.covariance.observedCount ** 2
  // A window covering the whole grid is the dense exact computation (one Cholesky of C, translation-shared stencils).
  const whole = Math.max(model.spec.nx, model.spec.ny)
  const dense = method === 'dense' || (method === 'auto' && work <= DENSE_WORK_LIMIT)
  const result = windowPosteriorVariance(model, dense ? { window: whole } : options)
  if (dense) return { std: result.variance.map((v) => Math.sqrt(Math.max(v, 0))), method: 'dense', errorBound: 0 }
  return { std: result.variance.map((v) => Math.sqrt(Math.max(v, 0))), method: 'window', errorBound: result.stdErrorBound, interiorErrorBound: result.interiorStdErrorBound, window: result.window }
}

/** 1-D cross-covariances V[B, i] = cov(x_i, y_B) = (Ax Kx)[B, i] from a 1-D torus spectrum λ (nc × fine). */
function crossCovariance1d(lambda: Float64Array, b: number, nc: number, fine: number): Float64Array {
  const N = lambda.length
  const [hr, hi] = boxTransfer(N, b)
  const re = new Float64Array(N), im = new Float64Array(N)
  for (let k = 0; k < N; k++) { re[k] = lambda[k]! * hr[k]!; im[k] = lambda[k]! * hi[k]! }
  fft2d(re, im, N, 1, true)
  const out = new Float64Array(nc * fine)
  for (let B = 0; B < nc; B++) for (let i = 0; i < fine; i++) out[B * fine + i] = re[(((i - b * B) % N) + N) % N]!
  return out
}

function kroneckerStd(model: ConditioningModel, solver: KroneckerCoarseSolver): Float64Array {
  const { spec, fineNx, fineNy, embedding } = model
  const sep = embedding.separable!
  const b = spec.factor, nx = spec.nx, ny = spec.ny
  const s = sep.scale
  const t = (model.kernelNugget + model.addedNugget) / (b * b) // coarse share of the fine nugget: cov(x_i, y_B(i)) gains τ/b²
  // ax[i, jx] = qx_jxᵀ vx_i  (fine × nx), ex[i, jx] = Qx[B(i), jx]; likewise for y.
  const ax = matmul(crossCovariance1d(sep.x, b, nx, fineNx), solver.qx, fineNx, nx, nx, true)
  const ay = matmul(crossCovariance1d(sep.y, b, ny, fineNy), solver.qy, fineNy, ny, ny, true)
  const ex = blockRows(solver.qx, nx, b), ey = blockRows(solver.qy, ny, b)
  const einv = new Float64Array(ny * nx)
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) einv[j * nx + i] = 1 / solver.eigenvalue(j, i)
  const square = (a: Float64Array) => a.map((v) => v * v)
  const product = (a: Float64Array, c: Float64Array) => a.map((v, k) => v * c[k]!)
  // Σ_{jy,jx} G(iy, jy)·E⁻¹(jy, jx)·F(ix, jx)  =  (G · E⁻¹ · Fᵀ)(iy, ix).
  const term = (g: Float64Array, f: Float64Array) => matmul(matmul(g, einv, fineNy, ny, nx), f, fineNy, nx, fineNx, false, true)
  const q = term(square(ay), square(ax)).map((v) => s * s * v)
  if (t > 0) {
    const cross = term(product(ay, ey), product(ax, ex)), own = term(square(ey), square(ex))
    for (let k = 0; k < q.length; k++) q[k]! += 2 * s * t * cross[k]! + t * t * own[k]!
  }
  const k0 = torusPointVariance(model)
  return q.map((v) => Math.sqrt(Math.max(k0 - v, 0)))
}

/** Rows of Q (n × n) repeated for each fine cell: out[i, j] = Q[⌊i/b⌋, j]  (n·b × n). */
function blockRows(q: Float64Array, n: number, b: number): Float64Array {
  const out = new Float64Array(n * b * n)
  for (let i = 0; i < n * b; i++) out.set(q.subarray(Math.floor(i / b) * n, Math.floor(i / b) * n + n), i * n)
  return out
}

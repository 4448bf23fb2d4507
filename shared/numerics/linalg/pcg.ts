/**
 * Preconditioned conjugate gradients (Hestenes & Stiefel 1952; Golub & Van Loan 2013, alg. 11.5.1)
 * for several right-hand sides of one symmetric positive-definite operator at once. Each system has
 * its own step lengths; the operator and preconditioner are applied to all of them together so a
 * caller can pack two real vectors into one complex FFT.
 */

/** Applies a linear operator to each input vector, writing the results into `out` (same lengths). */
export type BatchOperator = (input: Float64Array[], out: Float64Array[]) => void

export interface PcgOptions {
  /** Stop when ‖b − A x‖₂ ≤ tolerance·‖b‖₂ (default 1e-12). */
  tolerance?: number
  /** Default 500. */
  maxIterations?: number
  /** Give up on a system whose residual did not halve over this many iterations (default 100). */
  stagnationWindow?: number
}

export interface PcgResult {
  solutions: Float64Array[]
  iterations: number
  /** True relative residuals ‖b − A x‖/‖b‖ recomputed with the operator at the end (0 for a zero right-hand side). */
  relativeResiduals: number[]
  converged: boolean
  /** True when a system was abandoned because its residual stopped falling. */
  stagnated: boolean
  /** True when a system was abandoned because rᵀ·M·r or pᵀ·A·p was not positive (a preconditioner or operator that is not positive definite). */
  breakdown: boolean
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0
  for (let k = 0; k < a.length; k++) s += a[k]! * b[k]!
  return s
}

/** Solves A xⱼ = bⱼ for every right-hand side, starting from xⱼ = 0. */
export function pcgBatch(apply: BatchOperator, precondition: BatchOperator, rhs: Float64Array[], options: PcgOptions = {}): PcgResult {
  const tol = options.tolerance ?? 1e-12
  const maxIterations = options.maxIterations ?? 500
  const window = options.stagnationWindow ?? 100
  const count = rhs.length, n = rhs[0]?.length ?? 0
  const make = () => Array.from({ length: count }, () => new Float64Array(n))
  const x = make(), r = rhs.map((b) => Float64Array.from(b)), z = make(), p = make(), q = make()
  const bNorm = rhs.map((b) => Math.sqrt(dot(b, b)))
  const active = bNorm.map((v) => v > 0)
  const converged = active.map((a) => !a)
  const history: number[][] = rhs.map(() => [])
  let stagnated = false, breakdown = false
  precondition(r, z)
  const rz = r.map((rj, j) => dot(rj, z[j]!))
  for (let j = 0; j < count; j++) p[j]!.set(z[j]!)
  let iterations = 0
  while (active.some(Boolean) && iterations < maxIterations) {
    apply(p, q)
    iterations++
    for (let j = 0; j < count; j++) {
      if (!active[j]) continue
      const pj = p[j]!, qj = q[j]!, xj = x[j]!, rj = r[j]!
      const curvature = dot(pj, qj)
      if (!(curvature > 0)) { active[j] = false; breakdown = true; p[j]!.fill(0); continue }
      const alpha = rz[j]! / curvature
      for (let k = 0; k < n; k++) { xj[k]! += alpha * pj[k]!; rj[k]! -= alpha * qj[k]! }
      const norm = Math.sqrt(dot(rj, rj))
      if (norm <= tol * bNorm[j]!) { active[j] = false; converged[j] = true; p[j]!.fill(0); continue }
      const h = history[j]!
      h.push(norm)
      if (h.length > window) {
        // CG residuals are not monotone: the best of the last 10 against the value `window` iterations ago.
        const before = h.shift()!
        if (Math.min(...h.slice(-10)) > 0.5 * before) { active[j] = false; stagnated = true; p[j]!.fill(0) }
      }
    }
    if (!active.some(Boolean)) break
    precondition(r, z)
    for (let j = 0; j < count; j++) {
      if (!active[j]) continue
      const rzNew = dot(r[j]!, z[j]!)
      if (!(rzNew > 0)) { active[j] = false; breakdown = true; p[j]!.fill(0); continue }
      const beta = rzNew / rz[j]!
      rz[j] = rzNew
      const pj = p[j]!, zj = z[j]!
      for (let k = 0; k < n; k++) pj[k] = zj[k]! + beta * pj[k]!
    }
  }
  // The recursively updated residual drifts from the true one; report the true one.
  apply(x, q)
  const relativeResiduals = rhs.map((b, j) => {
    if (bNorm[j] === 0) return 0
    let s = 0
    for (let k = 0; k < n; k++) s += (b[k]! - q[j]![k]!) ** 2
    return Math.sqrt(s) / bNorm[j]!
  })
  return { solutions: x, iterations, relativeResiduals, converged: converged.every(Boolean), stagnated, breakdown }
}

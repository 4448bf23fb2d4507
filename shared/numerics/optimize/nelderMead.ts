/**
 * Derivative-free minimisation in a few dimensions by the Nelder–Mead simplex method (Nelder & Mead 1965,
 * Comput. J. 7:308) with the standard coefficients (reflection 1, expansion 2, contraction ½, shrink ½)
 * and the tie-breaking rules of Lagarias, Reeds, Wright & Wright (1998, SIAM J. Optim. 9:112).
 * Bounds are the caller's business (e.g. a penalty outside the box); non-finite values count as +Infinity.
 */

export interface NelderMeadOptions {
  /** Initial step along each coordinate (the simplex is x₀ and x₀ + stepᵢ·eᵢ). */
  steps: number[]
  /** Stop when max |f − f_best| over the simplex is below this (default 1e-6). */
  valueTolerance?: number
  /** …and every vertex lies within this distance (max norm) of the best one (default 1e-4). */
  pointTolerance?: number
  /** Cap on function calls (default 200·dimension). */
  maxEvaluations?: number
}

export interface NelderMeadResult {
  x: number[]
  value: number
  evaluations: number
  /** True when the tolerances were met (false: stopped by the evaluation cap). */
  converged: boolean
}

/** Minimises f from the start point x0 (Nelder & Mead 1965; Lagarias et al. 1998). */
export function nelderMead(f: (x: number[]) => number, x0: number[], options: NelderMeadOptions): NelderMeadResult {
  const n = x0.length
  if (options.steps.length !== n) throw new Error(`nelderMead: ${options.steps.length} steps for ${n} coordinates`)
  const valueTol = options.valueTolerance ?? 1e-6, pointTol = options.pointTolerance ?? 1e-4
  const maxEvaluations = options.maxEvaluations ?? 200 * n
  let evaluations = 0
  const call = (x: number[]) => { evaluations++; const v = f(x); return Number.isFinite(v) ? v : Infinity }
  const simplex: { x: number[]; v: number }[] = [{ x: [...x0], v: call(x0) }]
  for (let i = 0; i < n; i++) {
    const x = [...x0]
    x[i]! += options.steps[i]!
    simplex.push({ x, v: call(x) })
  }
  const along = (c: number[], worst: number[], t: number) => c.map((ci, i) => ci + t * (ci - worst[i]!))
  let converged = false
  while (evaluations < maxEvaluations) {
    simplex.sort((p, q) => p.v - q.v) // stable: ties keep their order (Lagarias et al.)
    const best = simplex[0]!, worst = simplex[n]!
    const spread = worst.v - best.v
    let size = 0
    for (let k = 1; k <= n; k++) for (let i = 0; i < n; i++) size = Math.max(size, Math.abs(simplex[k]!.x[i]! - best.x[i]!))
    if (spread <= valueTol && size <= pointTol) { converged = true; break }
    const centroid = new Array<number>(n).fill(0)
    for (let k = 0; k < n; k++) for (let i = 0; i < n; i++) centroid[i]! += simplex[k]!.x[i]! / n
    const xr = along(centroid, worst.x, 1), fr = call(xr)
    if (fr < best.v) {
      const xe = along(centroid, worst.x, 2), fe = call(xe)
      simplex[n] = fe < fr ? { x: xe, v: fe } : { x: xr, v: fr }
      continue
    }
    if (fr < simplex[n - 1]!.v) { simplex[n] = { x: xr, v: fr }; continue }
    // Contraction: outside when the reflected point beats the worst, inside otherwise.
    const outside = fr < worst.v
    const xc = along(centroid, worst.x, outside ? 0.5 : -0.5), fc = call(xc)
    if (outside ? fc <= fr : fc < worst.v) { simplex[n] = { x: xc, v: fc }; continue }
    for (let k = 1; k <= n; k++) {
      const x = simplex[k]!.x.map((xi, i) => best.x[i]! + 0.5 * (xi - best.x[i]!))
      simplex[k] = { x, v: call(x) }
    }
  }
  simplex.sort((p, q) => p.v - q.v)
  return { x: simplex[0]!.x, value: simplex[0]!.v, evaluations, converged }
}

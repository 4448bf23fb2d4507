/**
 * Change of support on a regular grid (Kyriakidis 2004, Geographical Analysis 36:259):
 * covariances between b×b block means of a stationary fine field are themselves stationary,
 * c_B(Δ) = Σ_δ w(δx) w(δy) k(bΔ + δ) with the triangular weights w(δ) = (b − |δ|)/b², δ ∈ [−(b−1), b−1].
 *
 * All tables here share one layout: row-major (2mx−1)×(2my−1), index (Δy + my − 1)·(2mx − 1) + (Δx + mx − 1),
 * for coarse lags Δx ∈ [−(mx−1), mx−1], Δy ∈ [−(my−1), my−1].
 * The double sum is evaluated separably, one fine lag row at a time: each fine lag k(h) is evaluated once
 * (O(4·m·b²) kernel calls instead of O(4·m·(2b−1)²)), and the fine covariance matrix is never built.
 */

/** Triangular weight table w(δ) = (b − |δ|)/b² for δ ∈ [−(b−1), b−1], index δ + b − 1. */
function blockLagWeights(b: number): Float64Array {
  const w = new Float64Array(2 * b - 1)
  for (let d = -(b - 1); d <= b - 1; d++) w[d + b - 1] = (b - Math.abs(d)) / (b * b)
  return w
}

function checkFactor(b: number, mx: number, my: number): void {
  if (!Number.isInteger(b) || b < 1) throw new Error(`block factor must be a positive integer, got ${b}`)
  if (!Number.isInteger(mx) || mx < 1 || !Number.isInteger(my) || my < 1) throw new Error(`coarse grid must be at least 1×1, got ${mx}×${my}`)
}

/**
 * Covariance of block means c_B(Δ) for all coarse lags (layout above).
 * `cov(dx, dy)` is the fine-grid covariance at offsets in fine cells (need not be symmetric: anisotropy is fine).
 */
export function coarseCovarianceTable(cov: (dx: number, dy: number) => number, b: number, mx: number, my: number): Float64Array {
  checkFactor(b, mx, my)
  const w = blockLagWeights(b)
  const wx = 2 * mx - 1
  const table = new Float64Array(wx * (2 * my - 1))
  const hxMax = b * mx - 1, hyMax = b * my - 1
  const row = new Float64Array(2 * hxMax + 1) // k(hx, hy) at index hx + hxMax
  const rowConv = new Float64Array(wx) // Σ_δx w(δx) k(bΔx + δx, hy)
  for (let hy = -hyMax; hy <= hyMax; hy++) {
    for (let hx = -hxMax; hx <= hxMax; hx++) row[hx + hxMax] = cov(hx, hy)
    for (let Dx = -(mx - 1); Dx <= mx - 1; Dx++) {
      let s = 0
      const base = b * Dx + hxMax
      for (let d = -(b - 1); d <= b - 1; d++) s += w[d + b - 1]! * row[base + d]!
      rowConv[Dx + mx - 1] = s
    }
    // Fine row hy = bΔy + δy feeds the (at most two) coarse lags Δy with |hy − bΔy| ≤ b − 1.
    for (let Dy = Math.ceil((hy - b + 1) / b); Dy <= Math.floor((hy + b - 1) / b); Dy++) {
      if (Dy < -(my - 1) || Dy > my - 1) continue
      const wy = w[hy - b * Dy + b - 1]!
      const off = (Dy + my - 1) * wx
      for (let k = 0; k < wx; k++) table[off + k]! += wy * rowConv[k]!
    }
  }
  return table
}

/** Elliptical support {h : a·hx² + 2c·hx·hy + d·hy² ≤ radius²} outside which a kernel is taken as exactly 0. */
export interface EllipticSupport {
  /** [a, c, d], positive definite (see kernels.ts anisotropyMetric). */
  metric: [number, number, number]
  radius: number
}

/**
 * The same table as `coarseCovarianceTable` for a covariance with point symmetry cov(−h) = cov(h) (every
 * stationary covariance, anisotropic ones included): only coarse lags Δy ≥ 0 are summed and the rest
 * mirrored, c_B(−Δ) = c_B(Δ), which halves the kernel calls; with `support`, fine lags outside the
 * ellipse are skipped (taken as 0), row by row in closed form.
 */
export function pointSymmetricCoarseCovarianceTable(
  cov: (dx: number, dy: number) => number, b: number, mx: number, my: number, support?: EllipticSupport,
): Float64Array {
  checkFactor(b, mx, my)
  const w = blockLagWeights(b)
  const wx = 2 * mx - 1
  const table = new Float64Array(wx * (2 * my - 1))
  const hxMax = b * mx - 1, hyMax = b * my - 1
  const row = new Float64Array(2 * hxMax + 1) // k(hx, hy) at index hx + hxMax, zero outside [lo, hi]
  const rowConv = new Float64Array(wx)
  const [a, c, d] = support?.metric ?? [1, 0, 1]
  const r2 = support ? support.radius * support.radius : Infinity
  const det = a * d - c * c
  // Rows of the ellipse: a·hx² + 2c·hy·hx + d·hy² ≤ R² has a solution iff hy² ≤ R²·a/det.
  const hyTop = support ? Math.min(hyMax, Math.floor(Math.sqrt(r2 * a / det))) : hyMax
  let lastLo = 0, lastHi = -1
  for (let hy = -(b - 1); hy <= hyTop; hy++) {
    let lo = -hxMax, hi = hxMax
    if (support) {
      const disc = r2 * a - hy * hy * det
      if (disc < 0) continue
      const root = Math.sqrt(disc)
      lo = Math.max(-hxMax, Math.ceil((-c * hy - root) / a))
      hi = Math.min(hxMax, Math.floor((-c * hy + root) / a))
      if (lo > hi) continue
    }
    if (lastHi >= lastLo) row.fill(0, lastLo + hxMax, lastHi + hxMax + 1)
    for (let hx = lo; hx <= hi; hx++) row[hx + hxMax] = cov(hx, hy)
    lastLo = lo; lastHi = hi
    // Coarse lags whose triangle [bΔx − (b−1), bΔx + (b−1)] meets [lo, hi].
    const dxLo = Math.max(-(mx - 1), Math.ceil((lo - b + 1) / b)), dxHi = Math.min(mx - 1, Math.floor((hi + b - 1) / b))
    for (let Dx = dxLo; Dx <= dxHi; Dx++) {
      let s = 0
      const base = b * Dx + hxMax
      for (let e = -(b - 1); e <= b - 1; e++) s += w[e + b - 1]! * row[base + e]!
      rowConv[Dx + mx - 1] = s
    }
    for (let Dy = Math.max(0, Math.ceil((hy - b + 1) / b)); Dy <= Math.min(my - 1, Math.floor((hy + b - 1) / b)); Dy++) {
      const wy = w[hy - b * Dy + b - 1]!
      const off = (Dy + my - 1) * wx
      for (let k = dxLo + mx - 1; k <= dxHi + mx - 1; k++) table[off + k]! += wy * rowConv[k]!
    }
  }
  // c_B(−Δx, −Δy) = c_B(Δx, Δy): rows Δy < 0 are the rows Δy > 0 reversed.
  for (let Dy = 1; Dy <= my - 1; Dy++) {
    const src = (Dy + my - 1) * wx, dst = (-Dy + my - 1) * wx
    for (let k = 0; k < wx; k++) table[dst + k] = table[src + wx - 1 - k]!
  }
  return table
}

/**
 * Same table for an isotropic correlation/covariance `radial(r)` (r in fine cells), using the symmetry
 * k(±hx, ±hy) = k(|hx|, |hy|): one quadrant of fine lags (m·b² calls) and one quadrant of coarse lags, mirrored.
 * Beyond `cutoff` fine cells the kernel is taken as exactly 0 (pass e.g. decayRadius(p, 1e-17) to skip work).
 */
export function isotropicCoarseCovarianceTable(radial: (r: number) => number, b: number, mx: number, my: number, cutoff = Infinity): Float64Array {
  checkFactor(b, mx, my)
  const w = blockLagWeights(b)
  const hxMax = b * mx - 1, hyMax = b * my - 1
  const quadrant = new Float64Array(mx * my) // Δx, Δy ≥ 0, index Δy·mx + Δx
  const row = new Float64Array(hxMax + 1)
  const rowConv = new Float64Array(mx)
  const cutoff2 = cutoff * cutoff
  for (let hy = 0; hy <= Math.min(hyMax, Math.floor(cutoff)); hy++) {
    const hy2 = hy * hy
    let last = hxMax
    if (cutoff2 < Infinity) last = Math.min(hxMax, Math.floor(Math.sqrt(Math.max(0, cutoff2 - hy2))))
    for (let hx = 0; hx <= last; hx++) row[hx] = radial(Math.sqrt(hx * hx + hy2))
    row.fill(0, last + 1)
    for (let Dx = 0; Dx < mx; Dx++) {
      let s = 0
      for (let d = -(b - 1); d <= b - 1; d++) s += w[d + b - 1]! * row[Math.abs(b * Dx + d)]!
      rowConv[Dx] = s
    }
    for (let Dy = Math.ceil((hy - b + 1) / b); Dy <= Math.floor((hy + b - 1) / b); Dy++) {
      if (Dy < 0 || Dy >= my) continue
      // Row −hy is the same row; it feeds Δy = 0 as well when 0 < hy < b.
      let wy = w[hy - b * Dy + b - 1]!
      if (Dy === 0 && hy > 0) wy += w[-hy + b - 1]!
      const off = Dy * mx
      for (let k = 0; k < mx; k++) quadrant[off + k]! += wy * rowConv[k]!
    }
  }
  return mirrorQuadrant(quadrant, mx, my)
}

/** Expands a Δx, Δy ≥ 0 quadrant (index Δy·mx + Δx) of an even table to the full layout above. */
function mirrorQuadrant(quadrant: Float64Array, mx: number, my: number): Float64Array {
  const wx = 2 * mx - 1
  const table = new Float64Array(wx * (2 * my - 1))
  for (let Dy = -(my - 1); Dy <= my - 1; Dy++) {
    const q = Math.abs(Dy) * mx, off = (Dy + my - 1) * wx
    for (let Dx = -(mx - 1); Dx <= mx - 1; Dx++) table[off + Dx + mx - 1] = quadrant[q + Math.abs(Dx)]!
  }
  return table
}

/**
 * One-dimensional block-mean covariance c(Δ) = Σ_δ w(δ) k(bΔ + δ) for Δ ∈ [−(m−1), m−1], index Δ + m − 1.
 * For a separable kernel k(dx, dy) = kx(dx)·ky(dy) (the squared-exponential) the 2-D table is the outer
 * product cy(Δy)·cx(Δx), and the coarse covariance matrix is the Kronecker product Cy ⊗ Cx (Saatçi 2011).
 */
export function coarseCovariance1d(k: (h: number) => number, b: number, m: number): Float64Array {
  checkFactor(b, m, 1)
  const w = blockLagWeights(b)
  const out = new Float64Array(2 * m - 1)
  for (let D = -(m - 1); D <= m - 1; D++) {
    let s = 0
    for (let d = -(b - 1); d <= b - 1; d++) s += w[d + b - 1]! * k(b * D + d)
    out[D + m - 1] = s
  }
  return out
}

/** Full 2-D table (layout above) as the outer product of two 1-D tables from coarseCovariance1d. */
export function separableCoarseCovarianceTable(cx: Float64Array, cy: Float64Array): Float64Array {
  const wx = cx.length, wy = cy.length
  const table = new Float64Array(wx * wy)
  for (let j = 0; j < wy; j++) for (let i = 0; i < wx; i++) table[j * wx + i] = cy[j]! * cx[i]!
  return table
}

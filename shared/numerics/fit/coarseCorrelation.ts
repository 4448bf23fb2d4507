/**
 * Block-mean correlation tables of the kernel families used in fitting, at unit variance, for a given
 * length scale ℓ (fine cells; the major axis ℓ₁ when anisotropic). Layout of the 2-D table: as in
 * grf/changeOfSupport.ts.
 */
import { coarseCovariance1d, isotropicCoarseCovarianceTable, pointSymmetricCoarseCovarianceTable, separableCoarseCovarianceTable } from '../grf/changeOfSupport'
import { anisotropyMetric, axisAlignedLengthScales, correlationAt, decayRadius, type Anisotropy, type KernelName, type KernelParams } from '../grf/kernels'
import '../grf/maternGeneral'

/** Correlation below which the kernel is treated as exactly zero when building tables. */
const NEGLIGIBLE_CORRELATION = 1e-17

/** Radial correlation ρ(r), r in fine cells, as a small closure (closed forms inlined for speed). */
export function radialCorrelation(kernel: KernelName, lengthScale: number, nu?: number): (r: number) => number {
  switch (kernel) {
    case 'se': { const c = -0.5 / (lengthScale * lengthScale); return (r) => Math.exp(c * r * r) }
    case 'matern12': { const c = 1 / lengthScale; return (r) => Math.exp(-c * r) }
    case 'matern32': { const c = Math.sqrt(3) / lengthScale; return (r) => { const s = c * r; return (1 + s) * Math.exp(-s) } }
    case 'matern52': { const c = Math.sqrt(5) / lengthScale; return (r) => { const s = c * r; return (1 + s + s * s / 3) * Math.exp(-s) } }
    case 'matern': { const p: KernelParams = { kernel, lengthScale, variance: 1, nu }; return (r) => correlationAt(p, r) }
  }
}

/** 1-D block-mean correlation of the squared-exponential along one axis (index Δ + m − 1), for the Kronecker form. */
export function seCoarseCorrelation1d(lengthScale: number, b: number, m: number): Float64Array {
  // Entries below the negligible level are set to 0: far se lags reach subnormal numbers, which make the
  // eigendecomposition and products many times slower without changing any result.
  return coarseCovariance1d(radialCorrelation('se', lengthScale), b, m).map((v) => (v < NEGLIGIBLE_CORRELATION ? 0 : v))
}

/**
 * Full 2-D block-mean correlation table of a kernel family at length scale ℓ (unit variance, no nugget),
 * optionally with geometric anisotropy (ℓ = ℓ₁, see grf/kernels.ts). se with axis-aligned axes stays
 * separable; rotated kernels use the point-symmetric table with the kernel's elliptical cut-off.
 */
export function coarseCorrelationTable(kernel: KernelName, lengthScale: number, b: number, mx: number, my: number, nu?: number, anisotropy?: Anisotropy): Float64Array {
  const params: KernelParams = { kernel, lengthScale, variance: 1, nu, anisotropy }
  const cutoff = decayRadius(params, NEGLIGIBLE_CORRELATION)
  if (anisotropy === undefined || anisotropy.ratio === 1) {
    if (kernel === 'se') {
      const cx = seCoarseCorrelation1d(lengthScale, b, mx)
      return separableCoarseCovarianceTable(cx, mx === my ? cx : seCoarseCorrelation1d(lengthScale, b, my))
    }
    return isotropicCoarseCovarianceTable(radialCorrelation(kernel, lengthScale, nu), b, mx, my, cutoff)
  }
  const axes = kernel === 'se' ? axisAlignedLengthScales(params) : undefined
  if (axes) return separableCoarseCovarianceTable(seCoarseCorrelation1d(axes[0], b, mx), seCoarseCorrelation1d(axes[1], b, my))
  const metric = anisotropyMetric(anisotropy)
  const [a, c, d] = metric
  const radial = radialCorrelation(kernel, lengthScale, nu)
  const correlation = (dx: number, dy: number) => radial(Math.sqrt(Math.max(0, a * dx * dx + 2 * c * dx * dy + d * dy * dy)))
  return pointSymmetricCoarseCovarianceTable(correlation, b, mx, my, { metric, radius: cutoff })
}

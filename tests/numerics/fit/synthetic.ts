/**
 * Synthetic coarse fields for the fitting tests: y = μ + σ·L z with L Lᵀ = R + ηI the block-mean
 * correlation of the coarse grid (from the change-of-support table, itself checked against A K Aᵀ),
 * z standard normal from the seeded generator. This is exactly the law of the block means of a fine
 * Gaussian field with that kernel (plus coarse white noise of variance ησ²).
 */
import { choleskyFactor } from '../../../shared/numerics/linalg/cholesky'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'
import { fillStandardNormal } from '../../../shared/numerics/random/normal'
import { coarseCorrelationTable } from '../../../shared/numerics/fit/coarseCorrelation'
import { validCellCorrelation } from '../../../shared/numerics/fit/denseLikelihood'
import { prepareCoarseField } from '../../../shared/numerics/fit/coarseField'
import type { KernelName } from '../../../shared/numerics/grf/kernels'

export interface SyntheticSpec { kernel: KernelName; lengthScale: number; variance: number; mean: number; factor: number; nx: number; ny: number; nugget?: number; nu?: number }

/** Returns a generator of independent replicates (row-major nx×ny) for one specification. */
export function coarseSampler(spec: SyntheticSpec): (seed: number) => Float64Array {
  const { nx, ny } = spec
  const table = coarseCorrelationTable(spec.kernel, spec.lengthScale, spec.factor, nx, ny, spec.nu)
  // Any non-constant field gives the full-grid layout needed to read the table.
  const layout = prepareCoarseField(Float64Array.from({ length: nx * ny }, (_, k) => k), nx, ny, spec.factor)
  const m = nx * ny
  const L = choleskyFactor(validCellCorrelation(layout, table, spec.nugget ?? 1e-10), m)
  const sd = Math.sqrt(spec.variance)
  return (seed) => {
    const z = fillStandardNormal(new Xoshiro128(seed), new Float64Array(m))
    const y = new Float64Array(m)
    for (let r = 0; r < m; r++) {
      let s = 0
      for (let k = 0; k <= r; k++) s += L[r * m + k]! * z[k]!
      y[r] = spec.mean + sd * s
    }
    return y
  }
}

/**
 * The transform between a variable's physical values and the latent Gaussian field the engine
 * downscales (block means are linear only there), and the default choice from the CF standard name:
 * gusts and wind speeds (positive, right-skewed) → Box–Cox with fitted λ; precipitation amounts,
 * fluxes and rates (an atom at 0, skewed when wet) → the censored latent Gaussian; anything else,
 * temperatures included → none. A forecaster's explicit choice always wins.
 */
import { boxCox, inverseBoxCox, inverseBoxCoxDerivative } from './boxCox'
import { censoredDerivative, censoredToLatent } from './censoredPower'

export type TransformName = 'none' | 'boxcox' | 'log' | 'censored'
export type TransformOption = 'auto' | TransformName

export interface LatentTransform {
  readonly name: TransformName
  /** Box–Cox or power parameter λ (0 for log, 1 for none). */
  readonly lambda: number
  /** Physical → latent (censored: wet values only). */
  toLatent(x: number): number
  /** Latent → physical; never negative for boxcox, log and censored. */
  toPhysical(g: number): number
  /** d(toPhysical)/dg. */
  derivative(g: number): number
  /** The same derivative given x = toPhysical(g) as well, without a second power (hot loops). */
  slopeAt(g: number, x: number): number
  /** True when latent values ≤ 0 all map to physical 0 (the censored model: dry). */
  readonly censored: boolean
}

/** The transform `name` with parameter λ (ignored by none and log). */
export function latentTransform(name: TransformName, lambda = name === 'log' ? 0 : 1): LatentTransform {
  switch (name) {
    case 'none': return { name, lambda: 1, censored: false, toLatent: (x) => x, toPhysical: (g) => g, derivative: () => 1, slopeAt: () => 1 }
    case 'log': return { name, lambda: 0, censored: false, toLatent: Math.log, toPhysical: Math.exp, derivative: Math.exp, slopeAt: (_g, x) => x }
    case 'boxcox':
      if (lambda === 0) return { ...latentTransform('log'), name }
      return {
        name, lambda, censored: false, toLatent: (x) => boxCox(x, lambda), toPhysical: (g) => inverseBoxCox(g, lambda), derivative: (g) => inverseBoxCoxDerivative(g, lambda),
        // dx/dg = (1 + λg)^{1/λ − 1} = x / (1 + λg).
        slopeAt: (g, x) => { const base = 1 + lambda * g; return base > 0 ? x / base : 0 },
      }
    case 'censored': {
      if (!(lambda > 0)) throw new Error(`censored transform needs λ > 0, got ${lambda}`)
      const p = 1 / lambda
      return {
        name, lambda, censored: true, toLatent: (x) => censoredToLatent(x, lambda), derivative: (g) => censoredDerivative(g, lambda),
        // exp∘log: ~2× faster than Math.pow here.
        toPhysical: (g) => (g > 0 ? Math.exp(p * Math.log(g)) : 0),
        // dx/dg = (1/λ) g^{1/λ − 1} = x / (λ g).
        slopeAt: (g, x) => (g > 0 ? (p * x) / g : 0),
      }
    }
  }
}

const SKEWED_POSITIVE = new Set(['wind_speed_of_gust', 'wind_speed'])
const PRECIPITATION = /(precipitation|rainfall|snowfall|graupel|hail)_(amount|flux|rate)$/

/** The default transform of a variable from its CF standard name (unknown or absent names → none). */
export function defaultTransform(standardName: string | undefined): TransformName {
  if (!standardName) return 'none'
  if (SKEWED_POSITIVE.has(standardName)) return 'boxcox'
  if (PRECIPITATION.test(standardName)) return 'censored'
  return 'none'
}

/**
 * The transform to use for a coarse field: 'auto' takes the default of the standard name, falling
 * back to none (with a note) when the data do not fit it (Box–Cox on non-positive values); an explicit
 * choice that the data cannot take throws a one-line reason.
 */
export function resolveTransform(option: TransformOption, standardName: string | undefined, coarse: ArrayLike<number>): { name: TransformName; note?: string } {
  const name = option === 'auto' ? defaultTransform(standardName) : option
  if (name === 'boxcox' || name === 'log') {
    let bad = 0
    for (let k = 0; k < coarse.length; k++) if (coarse[k]! <= 0) bad++
    if (bad > 0) {
      if (option === 'auto') return { name: 'none', note: `${name} skipped: ${bad} coarse values are not positive` }
      throw new Error(`the ${name} transform needs positive values; ${bad} coarse values are zero or negative`)
    }
  }
  return { name }
}

/**
 * Turns a physical coarse field into what the latent Gaussian engine needs: the transform (λ fitted
 * on the coarse values by maximum likelihood), the latent field to fit the covariance on, and the
 * latent block targets to condition on. Physical block means are restored after sampling
 * (physicalBlockMeans.ts); the latent targets here are the first guess h⁻¹(y).
 *
 * Censored model (precipitation): a dry block (y = 0) has no latent value, only the bound "every cell
 * ≤ 0". Its target is the fitted latent marginal's mean below the bound, E[g | g ≤ 0] = μ − σ φ(α)/Φ(α),
 * α = −μ/σ, and the covariance is fitted on all blocks with these targets. Measured on synthetic
 * censored fields (64² coarse, known latent field): the imputed plateau biases ℓ̂ low by about a third
 * (9–11 vs 15–16 fine cells from the true latent values), while leaving the dry blocks out biases it
 * far worse, high by ~10× (the missingness is informative: the wet blocks are where the field is high),
 * and makes sampling slow. Negative inputs (model round-off) are treated as dry and counted.
 */
import { fitBoxCox } from './boxCox'
import type { KernelParams } from '../grf/kernels'
import { DEFAULT_CENSORED_LAMBDA, fitCensoredPower, type CensoredPowerFit } from './censoredPower'
import { indirectCensoredFit, simulationFields } from './censoredIndirect'
import { latentTransform, resolveTransform, type LatentTransform, type TransformName, type TransformOption } from './latentTransform'
import { inverseMillsRatio } from './logNormalCdf'

export interface TransformSummary {
  name: TransformName
  requested: TransformOption
  /** λ used (0 = log, 1 = none). */
  lambda: number
  lambdaFitted: boolean
  lambdaStandardError?: number
  lambdaAtBound?: 'lower' | 'upper' | null
  note?: string
  /** Censored model: coarse blocks with y = 0 and y > 0, inputs below 0 set to 0, the dry blocks' latent target. */
  dryBlocks?: number
  wetBlocks?: number
  negativeInputs?: number
  dryTarget?: number
  /** Censored model: the fitted latent marginal of the coarse values and its dry probability Φ(−μ/σ). */
  latentMean?: number
  latentSd?: number
  coarseDryProbability?: number
  /**
   * Censored model with λ fitted: 'indirect' when the change-of-support correction (censoredIndirect.ts)
   * replaced the coarse fit's λ, with the coarse (auxiliary) λ̂, the fine-scale latent marginal and the
   * binding-function evaluations; 'coarse' when it was not applied or failed (see note).
   */
  lambdaMethod?: 'coarse' | 'indirect'
  coarseLambda?: number
  fineLatentMean?: number
  fineLatentSd?: number
  indirectEvaluations?: number
}

export interface LatentCoarse {
  transform: LatentTransform
  /** Physical block-mean constraints, row-major nx×ny, NaN = missing (censored: negatives set to 0). */
  physical: Float64Array
  /** Latent targets to condition on (NaN = missing). */
  targets: Float64Array
  /** Latent field for the covariance fit (NaN = left out). */
  fitField: Float64Array
  /** True when every valid block is dry (censored): the samples are all zero, nothing to fit. */
  allDry: boolean
  summary: TransformSummary
  /** Censored model: the coarse Tobit fit the targets came from (absent when there was nothing to fit). */
  censoredFit?: CensoredPowerFit
}

/**
 * Prepares the latent coarse field for `option` ('auto' decides from the CF standard name).
 * `lambda` fixes λ of boxcox / censored instead of fitting it.
 */
export function prepareLatentCoarse(coarse: ArrayLike<number>, option: TransformOption, standardName?: string, lambda?: number): LatentCoarse {
  const physical = Float64Array.from(coarse)
  const resolved = resolveTransform(option, standardName, physical)
  const name = resolved.name
  const valid: number[] = []
  for (let k = 0; k < physical.length; k++) if (Number.isFinite(physical[k]!)) valid.push(k)
  const base = { name, requested: option, ...(resolved.note ? { note: resolved.note } : {}) }

  if (name === 'none' || name === 'log') {
    const t = latentTransform(name)
    const latent = physical.map((v) => (Number.isFinite(v) ? t.toLatent(v) : NaN))
    return { transform: t, physical, targets: latent, fitField: latent, allDry: false, summary: { ...base, lambda: t.lambda, lambdaFitted: false } }
  }
  if (name === 'boxcox') {
    if (lambda !== undefined) {
      const t = latentTransform('boxcox', lambda)
      const latent = physical.map((v) => (Number.isFinite(v) ? t.toLatent(v) : NaN))
      return { transform: t, physical, targets: latent, fitField: latent, allDry: false, summary: { ...base, lambda, lambdaFitted: false } }
    }
    const fit = fitBoxCox(valid.map((k) => physical[k]!))
    const t = latentTransform('boxcox', fit.lambda)
    const latent = physical.map((v) => (Number.isFinite(v) ? t.toLatent(v) : NaN))
    return {
      transform: t, physical, targets: latent, fitField: latent, allDry: false,
      summary: { ...base, lambda: fit.lambda, lambdaFitted: true, lambdaStandardError: fit.standardError, lambdaAtBound: fit.atBound },
    }
  }
  return prepareCensored(physical, valid, base, lambda)
}

function prepareCensored(physical: Float64Array, valid: number[], base: Pick<TransformSummary, 'name' | 'requested' | 'note'>, fixedLambda?: number): LatentCoarse {
  let negativeInputs = 0, wetBlocks = 0
  for (const k of valid) {
    if (physical[k]! < 0) { physical[k] = 0; negativeInputs++ }
    if (physical[k]! > 0) wetBlocks++
  }
  const dryBlocks = valid.length - wetBlocks
  const counts = { dryBlocks, wetBlocks, negativeInputs }
  if (wetBlocks === 0) {
    const t = latentTransform('censored', DEFAULT_CENSORED_LAMBDA)
    const empty = physical.map((v) => (Number.isFinite(v) ? -1 : NaN))
    return { transform: t, physical, targets: empty, fitField: empty, allDry: true, summary: { ...base, ...counts, lambda: t.lambda, lambdaFitted: false } }
  }
  let lambda = fixedLambda ?? DEFAULT_CENSORED_LAMBDA, lambdaFitted = false, lambdaAtBound: TransformSummary['lambdaAtBound'] = null
  let dryTarget: number, censoredFit: CensoredPowerFit | undefined, marginal: Pick<TransformSummary, 'latentMean' | 'latentSd' | 'coarseDryProbability'> = {}
  const wetLatent = (l: number) => valid.filter((k) => physical[k]! > 0).map((k) => Math.pow(physical[k]!, l))
  const distinctWet = new Set(wetLatent(1)).size
  if (distinctWet >= 2) {
    const fit = fitCensoredPower(valid.map((k) => physical[k]!), undefined, fixedLambda)
    lambda = fit.lambda; lambdaFitted = fit.lambdaFitted; lambdaAtBound = fit.atBound; censoredFit = fit
    const alpha = -fit.mean / fit.sd
    dryTarget = fit.mean - fit.sd * inverseMillsRatio(alpha)
    marginal = { latentMean: fit.mean, latentSd: fit.sd, coarseDryProbability: fit.dryProbability }
  } else {
    // One wet value (or all equal): no spread to fit; mirror it below the bound.
    dryTarget = -wetLatent(lambda)[0]!
  }
  const t = latentTransform('censored', lambda)
  const targets = physical.map((v) => (!Number.isFinite(v) ? NaN : v > 0 ? t.toLatent(v) : dryTarget))
  return {
    transform: t, physical, targets, fitField: targets, allDry: false, ...(censoredFit ? { censoredFit } : {}),
    summary: { ...base, ...counts, lambda, lambdaFitted, lambdaAtBound, dryTarget, ...marginal },
  }
}

/**
 * Censored model with λ fitted on the coarse field: the change-of-support correction by indirect
 * inference (censoredIndirect.ts), with the latent correlation of `kernel` (fitted on `latent`'s
 * targets). Returns the latent field prepared again with the fine-scale λ, and the fine-scale latent
 * mean and standard deviation, for the prior; null (with the reason) when it does not apply or fails.
 */
export function correctCensoredSupport(latent: LatentCoarse, kernel: KernelParams, nx: number, ny: number, factor: number, seed: number): { latent: LatentCoarse; mean: number; sd: number } | { note: string } {
  const s = latent.summary
  const observed = latent.censoredFit
  if (s.name !== 'censored' || !s.lambdaFitted || !observed) return { note: 'λ not fitted' }
  const valid: number[] = []
  for (let k = 0; k < latent.physical.length; k++) if (Number.isFinite(latent.physical[k]!)) valid.push(k)
  const { standard, grid } = simulationFields(kernel, nx, ny, factor, seed)
  const fine = indirectCensoredFit(observed, standard, grid)
  if (!fine) return { note: 'change-of-support correction did not converge: λ from the coarse fit' }
  const again = prepareCensored(Float64Array.from(latent.physical), valid, { name: s.name, requested: s.requested, ...(s.note ? { note: s.note } : {}) }, fine.lambda)
  again.summary = {
    ...again.summary, lambdaFitted: true, lambdaAtBound: null, lambdaMethod: 'indirect', coarseLambda: observed.lambda,
    fineLatentMean: fine.mean, fineLatentSd: fine.sd, indirectEvaluations: fine.evaluations, negativeInputs: s.negativeInputs,
  }
  return { latent: again, mean: fine.mean, sd: fine.sd }
}

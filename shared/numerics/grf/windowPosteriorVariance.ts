import type { ConditioningModel } from './conditioningModel'
import type { PosteriorStdOptions } from './posteriorStd'

export function windowPosteriorVariance(model: ConditioningModel, options: PosteriorStdOptions): { variance: Float64Array; stdErrorBound: number; window: number } {
  void model; void options
  throw new Error('not yet')
}

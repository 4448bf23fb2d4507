/**
 * Mean squared error between two row-major fields of the same shape, in the field's units squared.
 * Both fields must be complete: a NaN anywhere makes the result NaN.
 */

/** MSE = (1/n) Σ (forecast − truth)², over all n cells. */
export function meanSquaredError(forecast: ArrayLike<number>, truth: ArrayLike<number>): number {
  if (forecast.length !== truth.length) throw new Error(`fields differ in size: ${forecast.length} vs ${truth.length} cells`)
  if (truth.length === 0) throw new Error('cannot score an empty field')
  let s = 0
  for (let k = 0; k < truth.length; k++) { const d = forecast[k]! - truth[k]!; s += d * d }
  return s / truth.length
}

/** RMSE = √MSE, in the field's units. */
export function rootMeanSquaredError(forecast: ArrayLike<number>, truth: ArrayLike<number>): number {
  return Math.sqrt(meanSquaredError(forecast, truth))
}

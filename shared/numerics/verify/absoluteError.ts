/**
 * Mean absolute error of a deterministic field, in the field's units: the CRPS of a one-member
 * forecast, so it is the score a deterministic baseline (e.g. an interpolation) is compared
 * with when the ensemble is scored by CRPS (Hersbach 2000).
 */

/** MAE = (1/n) Σ |forecast − truth| over all n cells (complete fields; NaN propagates). */
export function meanAbsoluteError(forecast: ArrayLike<number>, truth: ArrayLike<number>): number {
  if (forecast.length !== truth.length) throw new Error(`fields differ in size: ${forecast.length} vs ${truth.length} cells`)
  if (truth.length === 0) throw new Error('cannot score an empty field')
  let s = 0
  for (let k = 0; k < truth.length; k++) s += Math.abs(forecast[k]! - truth[k]!)
  return s / truth.length
}

/**
 * Area-of-interest products from joint samples (GUIDE §4):
 *  - anywhere: share of samples whose area maximum is ≥ T ('above'; area minimum ≤ T for 'below');
 *  - areaMean: share of samples whose weighted area mean crosses T;
 *  - fractionExpected: expected weighted share of the area where the event happens,
 *    E[Σ w·1(x crosses T)] / Σw = Σ w·P_pixel / Σw (linearity of expectation);
 *  - type-7 percentiles of the area maximum and minimum over samples.
 * Over a time window (stacks of several lead times, sample-aligned): "anywhere at any time",
 * "area mean crosses at some time", and the expected share of the area affected at some time.
 */
import type { AreaMask } from './areaMask'
import { areaSamples, windowAreaSamples, type AreaSamples } from './areaSamples'
import { exceedanceProbability } from './exceedance'
import { DEFAULT_PERCENTILES } from './percentiles'
import { quantileType7 } from './sortedStack'
import { timeExtremeStack, type Direction, type EnsembleStack } from './stack'

export interface AreaCrossing {
  /** P(the event happens somewhere in the area). */
  anywhere: number
  /** P(the area mean crosses the threshold). */
  areaMean: number
}

export interface AreaProducts extends AreaCrossing {
  threshold: number
  direction: Direction
  /** Expected share of the area (weighted) where the event happens, in [0, 1]. */
  fractionExpected: number
  percents: number[]
  /** Percentiles of the area maximum over samples, one per entry of percents. */
  maxPercentiles: number[]
  /** Percentiles of the area minimum over samples, one per entry of percents. */
  minPercentiles: number[]
}

/** P(anywhere) and P(area mean) from per-sample area statistics. */
export function areaCrossing(samples: AreaSamples, threshold: number, direction: Direction): AreaCrossing {
  const n = samples.max.length
  let anywhere = 0
  let areaMean = 0
  for (let m = 0; m < n; m++) {
    if (direction === 'above') {
      if (samples.max[m]! >= threshold) anywhere++
      if (samples.meanMax[m]! >= threshold) areaMean++
    } else {
      if (samples.min[m]! <= threshold) anywhere++
      if (samples.meanMin[m]! <= threshold) areaMean++
    }
  }
  return { anywhere: anywhere / n, areaMean: areaMean / n }
}

/** Weighted mean of a per-pixel probability map over the area: the expected affected fraction. */
export function expectedAreaFraction(probability: ArrayLike<number>, mask: AreaMask): number {
  let s = 0
  for (let c = 0; c < mask.cells.length; c++) s += mask.weights[c]! * probability[mask.cells[c]!]!
  return s / mask.totalWeight
}

/** Type-7 percentiles (percent values in [0, 100]) of a set of sample values. */
export function samplePercentiles(values: ArrayLike<number>, percents: readonly number[]): number[] {
  const sorted = Float64Array.from(values).sort()
  return percents.map((p) => {
    if (!(p >= 0 && p <= 100)) throw new Error(`percentile must be within [0, 100], got ${p}`)
    return quantileType7(sorted, 0, sorted.length, p / 100)
  })
}

/**
 * All area products for one lead time (a stack) or a time window (sample-aligned stacks).
 * `probability` may pass the per-pixel map of the single-lead case when already computed.
 */
export function areaProducts(stacks: EnsembleStack | readonly EnsembleStack[], mask: AreaMask, threshold: number, direction: Direction,
  options: { percents?: readonly number[]; probability?: ArrayLike<number> } = {}): AreaProducts {
  const list = Array.isArray(stacks) ? stacks as readonly EnsembleStack[] : [stacks as EnsembleStack]
  if (list.length === 0) throw new Error('a time window needs at least one lead time')
  const samples = windowAreaSamples(list.map((s) => areaSamples(s, mask)))
  const percents = [...(options.percents ?? DEFAULT_PERCENTILES)]
  let probability = options.probability
  if (!probability || list.length > 1) {
    const perPixel = list.length === 1 ? list[0]! : timeExtremeStack(list, direction === 'above' ? 'max' : 'min')
    probability = exceedanceProbability(perPixel, threshold, direction)
  }
  return {
    threshold,
    direction,
    ...areaCrossing(samples, threshold, direction),
    fractionExpected: expectedAreaFraction(probability, mask),
    percents,
    maxPercentiles: samplePercentiles(samples.max, percents),
    minPercentiles: samplePercentiles(samples.min, percents),
  }
}

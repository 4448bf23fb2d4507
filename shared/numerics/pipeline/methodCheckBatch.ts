/**
 * Batch summary of several method checks (e.g. every demo truth × several block factors): for each
 * headline score, the distribution over cases (minimum, median by Hyndman & Fan type 7, maximum), and
 * how often the samples beat the best interpolation on it. Pure; inputs are report headlines.
 */
import { quantileType7 } from '../ensemble/sortedStack'
import type { MethodCheckHeadline } from './methodCheckReport'

export interface BatchMetric {
  key: keyof MethodCheckHeadline
  label: string
  /** How to read it: lower is better, higher is better, or closest to 1 is best. */
  better: 'lower' | 'higher' | 'one'
}

/** The headline numbers a batch summarises, in display order. */
export const BATCH_METRICS: readonly BatchMetric[] = [
  { key: 'rmseMean', label: 'RMSE, posterior mean', better: 'lower' },
  { key: 'rmseBestBaseline', label: 'RMSE, best interpolation', better: 'lower' },
  { key: 'rmseSampleAverage', label: 'RMSE, single sample (average)', better: 'lower' },
  { key: 'crpsSamples', label: 'Fair CRPS, samples', better: 'lower' },
  { key: 'maeBestBaseline', label: 'Absolute error, best interpolation', better: 'lower' },
  { key: 'subgridPowerSamples', label: 'Sub-grid variance share, samples', better: 'one' },
  { key: 'subgridPowerBestBaseline', label: 'Sub-grid variance share, best interpolation', better: 'one' },
  { key: 'fssSmallSamples', label: 'FSS, smallest neighbourhood, samples', better: 'higher' },
  { key: 'fssSmallBestBaseline', label: 'FSS, smallest neighbourhood, best interpolation', better: 'higher' },
  { key: 'spreadSkill', label: 'Spread–skill ratio', better: 'one' },
]

export interface Distribution { count: number; min: number | null; median: number | null; max: number | null }

/** Min, median (type 7) and max of the finite values; nulls when there are none. */
export function distributionOf(values: readonly (number | null | undefined)[]): Distribution {
  const v = Float64Array.from(values.filter((x): x is number => typeof x === 'number' && Number.isFinite(x))).sort()
  if (v.length === 0) return { count: 0, min: null, median: null, max: null }
  return { count: v.length, min: v[0]!, median: quantileType7(v, 0, v.length, 0.5), max: v[v.length - 1]! }
}

export interface BatchSummary {
  cases: number
  metrics: (BatchMetric & Distribution)[]
  /** Cases where the samples (or the posterior mean, for MSE) did better than the best interpolation. */
  wins: { meanOnMse: number; samplesOnCrps: number; samplesOnSubgridPower: number; samplesOnSmallFss: number }
}

/** Summarises the headlines of a batch's completed checks. */
export function summariseBatch(headlines: readonly MethodCheckHeadline[]): BatchSummary {
  const count = (pred: (h: MethodCheckHeadline) => boolean) => headlines.filter(pred).length
  const distanceFromOne = (x: number | null) => (x === null ? Infinity : Math.abs(Math.log(x)))
  return {
    cases: headlines.length,
    metrics: BATCH_METRICS.map((m) => ({ ...m, ...distributionOf(headlines.map((h) => h[m.key] as number | null)) })),
    wins: {
      meanOnMse: count((h) => h.rmseMean < h.rmseBestBaseline),
      samplesOnCrps: count((h) => h.crpsSamples < h.maeBestBaseline),
      samplesOnSubgridPower: count((h) => distanceFromOne(h.subgridPowerSamples) < distanceFromOne(h.subgridPowerBestBaseline)),
      samplesOnSmallFss: count((h) => h.fssSmallSamples !== null && h.fssSmallBestBaseline !== null && h.fssSmallSamples > h.fssSmallBestBaseline),
    },
  }
}

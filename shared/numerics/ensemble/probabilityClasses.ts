/**
 * Display classes for an exceedance probability from N members/samples. Probabilities can
 * only be k/N, so no class is narrower than one member: with N no larger than the number of
 * bins there is one class per member count; otherwise equal-width bins (lower edge excluded,
 * upper included), each holding at least one attainable k/N. Count 0 is always its own
 * "no scenario" class, never merged with small non-zero probabilities.
 */

export interface ProbabilityClass {
  index: number
  /** Smallest and largest member count k (of N) in the class. */
  minCount: number
  maxCount: number
  /** Probability range: (lower, upper]; the no-scenario class is exactly [0, 0]. */
  lower: number
  upper: number
  label: string
  noScenario: boolean
}

export interface ProbabilityClasses {
  n: number
  classes: ProbabilityClass[]
  /** Class boundaries as probabilities: 0, then each class's upper edge (ends at 1). */
  edges: number[]
  /** Class index of a member count k ∈ [0, N]. */
  classOfCount(count: number): number
  /** Class index of a probability p = k/N (rounded to the nearest count). */
  classOfProbability(p: number): number
}

function percentText(p: number): string {
  const v = Math.round(p * 1000) / 10
  return `${Number.isInteger(v) ? v.toFixed(0) : v.toFixed(1)} %`
}

/**
 * Classes for N members; `binWidth` (default 0.1, must divide 1) is the finest width used
 * once N is large enough to fill every bin.
 */
export function probabilityClasses(n: number, binWidth = 0.1): ProbabilityClasses {
  if (!Number.isInteger(n) || n < 1) throw new Error(`number of members must be a positive integer, got ${n}`)
  const bins = Math.round(1 / binWidth)
  if (!(binWidth > 0 && binWidth <= 1) || Math.abs(bins * binWidth - 1) > 1e-9) throw new Error(`bin width must divide 1 (e.g. 0.1, 0.2, 0.25), got ${binWidth}`)
  const classes: ProbabilityClass[] = [{ index: 0, minCount: 0, maxCount: 0, lower: 0, upper: 0, label: `no scenario (0 of ${n})`, noScenario: true }]
  if (n <= bins) {
    for (let k = 1; k <= n; k++) classes.push({ index: k, minCount: k, maxCount: k, lower: (k - 1) / n, upper: k / n, label: `${k} of ${n}`, noScenario: false })
  } else {
    for (let b = 1; b <= bins; b++) {
      const minCount = Math.floor(((b - 1) * n) / bins) + 1
      const maxCount = Math.floor((b * n) / bins)
      const lower = (b - 1) / bins
      const upper = b / bins
      const label = b === 1 ? `above 0 %, up to ${percentText(upper)}` : `${percentText(lower)}–${percentText(upper)}`
      classes.push({ index: b, minCount, maxCount, lower, upper, label, noScenario: false })
    }
  }
  const classOfCountTable = new Int32Array(n + 1)
  for (const c of classes) for (let k = c.minCount; k <= c.maxCount; k++) classOfCountTable[k] = c.index
  const classOfCount = (count: number): number => {
    if (!Number.isInteger(count) || count < 0 || count > n) throw new Error(`member count must be an integer in [0, ${n}], got ${count}`)
    return classOfCountTable[count]!
  }
  return {
    n,
    classes,
    edges: [0, ...classes.slice(1).map((c) => c.upper)],
    classOfCount,
    classOfProbability: (p: number) => classOfCount(Math.min(n, Math.max(0, Math.round(p * n)))),
  }
}

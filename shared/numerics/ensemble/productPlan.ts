/**
 * A product plan: the one-off preparation that makes a new threshold cheap.
 *  - Per-pixel probability: a branch-free count over the members, O(N·cells); once the
 *    pixels are sorted (on first need: percentiles, or sortPixels()) a binary search, O(cells·log N).
 *  - NEP: the disk mean of the probability map (member and neighbourhood means are both linear).
 *  - NMEP: the neighbourhood max of 1[x ≥ T] is 1[diskMax(x) ≥ T], so after
 *    prepareNeighbourhood(R) it is an exceedance count over the cached disk-extreme stack;
 *    before that, the direct bit-packed computation from the members.
 */
import { diskChords } from './disk'
import { diskExtremeOperator } from './diskExtreme'
import { exceedanceProbability } from './exceedance'
import { ensembleMean, ensembleSpread } from './moments'
import { neighbourhoodMean } from './neighbourhoodMean'
import { neighbourhoodMaximumProbability } from './neighbourhoodProbability'
import { DEFAULT_PERCENTILES, pixelPercentiles } from './percentiles'
import { sortByPixel, sortedExceedance, type SortedStack } from './sortedStack'
import { checkStack, type Direction, type EnsembleStack } from './stack'

/** Probability maps for one threshold, direction and radius; row-major nx·ny, values in [0, 1]. */
export interface ProbabilityMaps {
  threshold: number
  direction: Direction
  /** Neighbourhood radius, in cells. */
  radius: number
  /** Per-pixel P(x ≥ T) ('above') or P(x ≤ T) ('below'). */
  probability: Float64Array
  /** Neighbourhood ensemble probability (mean of neighbourhood means). */
  nep: Float64Array
  /** Neighbourhood maximum ensemble probability (chance of an event within R). */
  nmep: Float64Array
}

export interface ProductPlanOptions {
  /** How many (radius, direction) disk-extreme stacks to keep; each holds N·nx·ny values. Default 2. */
  neighbourhoodCacheSize?: number
}

export class ProductPlan {
  readonly stack: EnsembleStack
  private sortedValues?: SortedStack
  private readonly cacheSize: number
  private readonly extremes = new Map<string, EnsembleStack>()
  private meanGrid?: Float64Array
  private spreadGrid?: Float64Array

  /** Checks the stack (finite values, one shape); nothing is sorted yet. */
  constructor(stack: EnsembleStack, options: ProductPlanOptions = {}) {
    checkStack(stack)
    this.stack = stack
    this.cacheSize = Math.max(0, options.neighbourhoodCacheSize ?? 2)
  }

  /** The pixel-major sorted values, sorting them now if not done yet (the one-off cost). */
  get sorted(): SortedStack { return (this.sortedValues ??= sortByPixel(this.stack)) }

  /** Sorts every pixel now (e.g. while the user is idle), so later maps use binary search. */
  sortPixels(): void { void this.sorted }

  get n(): number { return this.stack.members.length }

  /** Per-pixel exceedance probability: O(cells · log N) once sorted, O(N · cells) before. */
  exceedance(threshold: number, direction: Direction): Float64Array {
    return this.sortedValues
      ? sortedExceedance(this.sortedValues, threshold, direction)
      : exceedanceProbability(this.stack, threshold, direction)
  }

  /** Whether NMEP at this radius and direction will use the prepared (fast) path. */
  isPrepared(radius: number, direction: Direction): boolean {
    return isSingleCell(diskChords(radius)) || this.extremes.has(cacheKey(radius, direction))
  }

  /**
   * Builds and caches the disk-max ('above') or disk-min ('below') stack for radius R cells.
   * Cost: N disk extremes; memory N·nx·ny values (Float32 when the members are Float32, exact).
   */
  prepareNeighbourhood(radius: number, direction: Direction): void {
    const key = cacheKey(radius, direction)
    const chords = diskChords(radius)
    if (isSingleCell(chords) || this.extremes.has(key)) return
    const { nx, ny, members } = this.stack
    const single = members.every((g) => g instanceof Float32Array)
    const extreme = direction === 'above' ? 'max' : 'min'
    const operator = diskExtremeOperator(nx, ny, chords)
    const scratch = new Float64Array(nx * ny)
    const grids = members.map((g) => {
      const e = operator(g, extreme, scratch)
      return single ? Float32Array.from(e) : Float64Array.from(e)
    })
    this.extremes.set(key, { nx, ny, members: grids })
    while (this.extremes.size > this.cacheSize) this.extremes.delete(this.extremes.keys().next().value!)
  }

  /** Per-pixel probability, NEP and NMEP for threshold T at radius R cells. */
  probabilityMaps(threshold: number, direction: Direction, radius: number): ProbabilityMaps {
    const chords = diskChords(radius)
    const probability = this.exceedance(threshold, direction)
    const { nx, ny } = this.stack
    if (isSingleCell(chords)) {
      return { threshold, direction, radius, probability, nep: probability.slice(), nmep: probability.slice() }
    }
    const nep = neighbourhoodMean(probability, nx, ny, chords)
    const prepared = this.extremes.get(cacheKey(radius, direction))
    const nmep = prepared
      ? exceedanceProbability(prepared, threshold, direction)
      : neighbourhoodMaximumProbability(this.stack, threshold, direction, chords)
    return { threshold, direction, radius, probability, nep, nmep }
  }

  /** Ensemble mean per pixel (computed once). */
  mean(): Float64Array { return (this.meanGrid ??= ensembleMean(this.stack)) }

  /** Ensemble spread per pixel, standard deviation with divisor N − 1 (computed once). */
  spread(): Float64Array { return (this.spreadGrid ??= ensembleSpread(this.stack, this.mean())) }

  /** Per-pixel type-7 percentiles (percent values in [0, 100]), one grid each. */
  percentiles(percents: readonly number[] = DEFAULT_PERCENTILES): Float64Array[] {
    return pixelPercentiles(this.sorted, percents)
  }
}

function isSingleCell(chords: { reach: number; halfWidth: Int32Array }): boolean {
  return chords.reach === 0 && chords.halfWidth[0] === 0
}

function cacheKey(radius: number, direction: Direction): string {
  return `${direction}:${radius}`
}

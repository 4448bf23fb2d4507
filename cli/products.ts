/**
 * `tessera products`: exceedance, neighbourhood and area probabilities from members or samples.
 *
 *   tessera products --members members.json --threshold T [--below] [--radius R] [--area mask.json] [--out products.json]
 *
 * Conventions: 'above' means x ≥ T, --below means x ≤ T. The neighbourhood of a cell is every
 * cell whose centre lies within R cells (Euclidean) of its centre, truncated at the grid edge;
 * NEP averages the event field over the cells inside the grid, NMEP is the chance of an event
 * anywhere in the neighbourhood (Schwartz & Sobash 2017). Percentiles interpolate linearly
 * between order statistics (type 7); spread is the standard deviation with divisor N − 1.
 * The mask is a grid file of 0/1 values; area products use the joint samples.
 */
import { areaMask } from '../shared/numerics/ensemble/areaMask'
import { areaProducts } from '../shared/numerics/ensemble/areaProducts'
import { ProductPlan } from '../shared/numerics/ensemble/productPlan'
import type { Direction } from '../shared/numerics/ensemble/stack'
import { numberOption, parseOptions, UsageError, joinNegativeValues } from './args'
import { readGridFile, readMembersFile, toJsonArray, writeJson } from './gridFiles'


export async function run(argv: string[]): Promise<void> {
  const { values, positionals } = parseOptions(joinNegativeValues(argv, ['threshold', 'radius']), {
    members: { type: 'string' },
    threshold: { type: 'string' },
    below: { type: 'boolean' },
    radius: { type: 'string' },
    area: { type: 'string' },
    out: { type: 'string' },
  })
  if (positionals.length) throw new UsageError(`unexpected argument "${positionals[0]}"`)
  if (!values.members) throw new UsageError('--members is required')
  const threshold = numberOption(values.threshold, 'threshold')
  const radius = values.radius === undefined ? 0 : numberOption(values.radius, 'radius', { min: 0 })
  const direction: Direction = values.below ? 'below' : 'above'

  const { nx, ny, members } = readMembersFile(values.members)
  const stack = { nx, ny, members }
  let mask
  if (values.area) {
    const grid = readGridFile(values.area)
    if (grid.nx !== nx || grid.ny !== ny) throw new UsageError(`${values.area}: mask is ${grid.nx}×${grid.ny} but the members are ${nx}×${ny}`)
    const bad = grid.values.findIndex((v) => v !== 0 && v !== 1)
    if (bad >= 0) throw new UsageError(`${values.area}: mask values must be 0 or 1, got ${Number.isNaN(grid.values[bad]) ? 'null' : grid.values[bad]} at column ${bad % nx}, row ${Math.floor(bad / nx)}`)
    if (!grid.values.includes(1)) throw new UsageError(`${values.area}: the mask has no cell set to 1`)
    mask = areaMask(grid.values, nx, ny)
  }

  const plan = new ProductPlan(stack)
  const maps = plan.probabilityMaps(threshold, direction, radius)
  const [p10, p50, p90] = plan.percentiles([10, 50, 90])
  const output: Record<string, unknown> = {
    nx,
    ny,
    members: members.length,
    threshold,
    direction,
    radius,
    probability: toJsonArray(maps.probability),
    nep: toJsonArray(maps.nep),
    nmep: toJsonArray(maps.nmep),
    mean: toJsonArray(plan.mean()),
    spread: toJsonArray(plan.spread()),
    p10: toJsonArray(p10!),
    p50: toJsonArray(p50!),
    p90: toJsonArray(p90!),
  }
  if (mask) {
    const a = areaProducts(stack, mask, threshold, direction, { percents: [10, 50, 90], probability: maps.probability })
    const named = (q: number[]) => ({ p10: q[0], p50: q[1], p90: q[2] })
    output.area = {
      anywhere: a.anywhere,
      areaMean: a.areaMean,
      fractionExpected: a.fractionExpected,
      cells: mask.cells.length,
      areaMax: named(a.maxPercentiles),
      areaMin: named(a.minPercentiles),
    }
  }
  writeJson(values.out, output)
}

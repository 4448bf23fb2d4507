/**
 * The preview of a run shown before a forecaster confirms an upload, and printed by `tessera inspect`.
 */
import type { EnsembleRun, RunSummary } from './types'

/** Rounds to 6 significant digits so float32 noise (0.10000000149) does not reach the screen. */
function tidy(x: number): number {
  return Number.isFinite(x) ? Number(x.toPrecision(6)) : x
}

/** Summarises a run; stats are of the first member at the first lead time, in canonical units, missing cells ignored. */
export function summariseRun(run: EnsembleRun): RunSummary {
  const field = run.fields[0]!
  let min = Infinity, max = -Infinity, sum = 0, count = 0
  for (let k = 0; k < field.length; k++) {
    const v = field[k]!
    if (Number.isNaN(v)) continue
    if (v < min) min = v
    if (v > max) max = v
    sum += v
    count++
  }
  const { grid } = run
  return {
    format: run.format,
    variable: run.variable,
    standardName: run.standardName,
    units: run.units,
    canonicalUnits: run.canonicalUnits,
    displayUnits: run.displayUnits,
    members: run.members,
    leadTimes: run.leadTimes,
    forecastPeriodsHours: run.forecastPeriodsHours,
    referenceTime: run.referenceTime,
    ...(run.heightM !== undefined ? { heightM: run.heightM } : {}),
    ...(run.cellMethods ? { cellMethods: run.cellMethods } : {}),
    grid: { nx: grid.nx, ny: grid.ny, spacingKm: tidy(grid.spacingKm), dxKm: tidy(grid.dxKm), dyKm: tidy(grid.dyKm), crs: grid.crs },
    extent: run.extent.map(tidy) as RunSummary['extent'],
    stats: { min: tidy(min), max: tidy(max), mean: tidy(sum / count), missingCells: field.length - count },
    notes: run.notes,
  }
}

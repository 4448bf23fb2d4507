/**
 * The last step shared by every reader: checks times, sizes and fields, and builds the EnsembleRun.
 */
import { formatIsoUtc } from './cfTime'
import { IngestError } from './errors'
import { requireSomeValues } from './fieldDecode'
import type { PlacedGrid } from './gridGeometry'
import type { ResolvedUnits } from './quantities'
import type { EnsembleFormat, EnsembleRun } from './types'

export const DEFAULT_MAX_BYTES = 512 * 1024 * 1024

export interface RunParts {
  format: EnsembleFormat
  variable: string
  standardName: string | null
  longName?: string
  units: string
  resolved: ResolvedUnits
  members: number
  memberLabels?: string[]
  validTimesMs: number[]
  referenceTimeMs: number | null
  heightM?: number
  cellMethods?: string
  placed: PlacedGrid
  notes: string[]
}

/** '512 MB', '1.5 kB': sizes for messages (binary multiples). */
export function formatBytes(bytes: number): string {
  if (bytes >= 2 ** 20) return `${Number((bytes / 2 ** 20).toPrecision(3))} MB`
  if (bytes >= 1024) return `${Number((bytes / 1024).toPrecision(3))} kB`
  return `${bytes} bytes`
}

/** Refuses runs whose decoded fields would exceed the cap (float32 per cell). */
export function checkDecodedSize(cells: number, maxDecodedBytes: number): void {
  const bytes = cells * 4
  if (bytes > maxDecodedBytes) {
    throw new IngestError('too_large',
      `The decoded ensemble would take ${formatBytes(bytes)} in memory, over the limit of ${formatBytes(maxDecodedBytes)}.`)
  }
}

/** Refuses lead times that are not strictly increasing. */
export function requireIncreasingTimes(validTimesMs: number[]): void {
  for (let k = 1; k < validTimesMs.length; k++) {
    if (!(validTimesMs[k]! > validTimesMs[k - 1]!)) {
      throw new IngestError('non_monotonic',
        `The valid times are not in increasing order (${formatIsoUtc(validTimesMs[k - 1]!)} is followed by ${formatIsoUtc(validTimesMs[k]!)}).`)
    }
  }
}

/** Label of field (t, m) for messages: "Member 2 at 2031-03-04T06:00:00Z". */
export function fieldLabel(memberLabels: string[] | undefined, m: number, validTimeMs: number): string {
  return `Member ${memberLabels?.[m] ?? String(m + 1)} at ${formatIsoUtc(validTimeMs)}`
}

/** Builds the run from its parts and the decoded fields (index t·members + m), refusing all-missing fields. */
export function assembleRun(parts: RunParts, fields: Float32Array[]): EnsembleRun {
  const { members, validTimesMs, referenceTimeMs, placed } = parts
  if (members < 1) throw new IngestError('no_members', 'The file has no ensemble members (the member dimension is empty).')
  if (validTimesMs.length < 1) throw new IngestError('missing_time', 'The file has no lead times.')
  requireIncreasingTimes(validTimesMs)
  const cells = placed.grid.nx * placed.grid.ny
  if (fields.length !== members * validTimesMs.length || fields.some((f) => f.length !== cells)) {
    throw new IngestError('shape_mismatch', `Expected ${members * validTimesMs.length} fields of ${cells} cells.`)
  }
  fields.forEach((f, k) => requireSomeValues(f, fieldLabel(parts.memberLabels, k % members, validTimesMs[Math.floor(k / members)]!)))
  return {
    format: parts.format,
    variable: parts.variable,
    standardName: parts.standardName,
    ...(parts.longName ? { longName: parts.longName } : {}),
    units: parts.units,
    canonicalUnits: parts.resolved.canonicalUnits,
    displayUnits: parts.resolved.displayUnits,
    members,
    ...(parts.memberLabels ? { memberLabels: parts.memberLabels } : {}),
    leadTimes: validTimesMs.map(formatIsoUtc),
    forecastPeriodsHours: referenceTimeMs === null ? [] : validTimesMs.map((t) => (t - referenceTimeMs) / 3_600_000),
    referenceTime: referenceTimeMs === null ? null : formatIsoUtc(referenceTimeMs),
    ...(parts.heightM !== undefined ? { heightM: parts.heightM } : {}),
    ...(parts.cellMethods ? { cellMethods: parts.cellMethods } : {}),
    grid: placed.grid,
    extent: placed.extent,
    corners: placed.corners,
    fields,
    notes: [...placed.notes, ...parts.notes],
  }
}

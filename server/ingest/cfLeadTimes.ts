/**
 * Valid times, reference time and forecast periods of a CF forecast variable, from the time
 * coordinate, forecast_reference_time and forecast_period (CF standard names), whichever are given:
 * valid = reference + period, and when all three are present they must agree (to 1 s).
 */
import { readAll, textAttribute, type Dataset, type Variable } from './dataModel'
import { cfTimeToMs, durationUnitMs, formatIsoUtc, parseTimeUnits } from './cfTime'
import { IngestError } from './errors'

export interface LeadTimes { validTimesMs: number[]; referenceTimeMs: number | null; notes: string[] }

type TimeKind = 'valid' | 'reference' | 'period'

const AGREEMENT_MS = 1000

function kindOf(v: Variable): TimeKind | undefined {
  const sn = textAttribute(v, 'standard_name')
  const name = v.name.toLowerCase()
  if (sn === 'forecast_reference_time' || /reference_time|^frt$|analysis_time/.test(name)) return 'reference'
  if (sn === 'forecast_period' || ['forecast_period', 'leadtime', 'lead_time', 'step'].includes(name)) return 'period'
  if (sn === 'time' || name === 'time' || name === 'valid_time' || / since /i.test(textAttribute(v, 'units') ?? '')) return 'valid'
  return undefined
}

/** Time-like variables that apply to `data`: along its time dimension, or scalar. Listed coordinates come first. */
function timeVariables(ds: Dataset, data: Variable, timeDim: string | undefined): Partial<Record<TimeKind, Variable>> {
  const listed = (textAttribute(data, 'coordinates') ?? '').split(/\s+/).filter((n) => ds.variables.has(n))
  const pool = [...(timeDim ? [timeDim] : []), ...listed, ...ds.variables.keys()]
  const found: Partial<Record<TimeKind, Variable>> = {}
  for (const name of pool) {
    const v = ds.variables.get(name)
    if (!v || v === data) continue
    const fits = v.dimensions.length === 0 || (timeDim !== undefined && v.dimensions.length === 1 && v.dimensions[0] === timeDim)
    if (!fits) continue
    const kind = kindOf(v)
    if (kind && !found[kind]) found[kind] = v
  }
  return found
}

/** Values along the lead times; a scalar is shared by all lead times only where that makes sense (the reference time). */
function valuesAlong(v: Variable, count: number, what: string, scalarForAll: boolean): number[] {
  const values = Array.from(readAll(v), Number)
  if (scalarForAll && values.length === 1 && count > 1 && v.dimensions.length === 0) return new Array<number>(count).fill(values[0]!)
  if (values.length !== count) {
    throw new IngestError('shape_mismatch', `${what} has ${values.length} value${values.length === 1 ? '' : 's'} but the data have ${count} lead times.`)
  }
  const fill = v.attributes._FillValue
  if (values.some((x) => !Number.isFinite(x) || x === fill)) throw new IngestError('missing_time', `${what} has missing values.`)
  return values
}

function instants(v: Variable, count: number, label: string, scalarForAll = false): number[] {
  const units = textAttribute(v, 'units')
  const what = `The ${label} "${v.name}"`
  if (!units) throw new IngestError('bad_time_units', `${what} has no units (expected e.g. "hours since 2031-03-04 00:00:00").`)
  const axis = parseTimeUnits(units, textAttribute(v, 'calendar'), what)
  return valuesAlong(v, count, what, scalarForAll).map((x) => cfTimeToMs(x, axis, what))
}

function durations(v: Variable, count: number): number[] {
  const what = `The forecast period "${v.name}"`
  const ms = durationUnitMs(textAttribute(v, 'units') ?? '', what)
  return valuesAlong(v, count, what, false).map((x) => x * ms)
}

/** Resolves the lead times of `data` with `count` steps along `timeDim` (undefined: a single time). */
export function leadTimesOf(ds: Dataset, data: Variable, timeDim: string | undefined, count: number): LeadTimes {
  const vars = timeVariables(ds, data, timeDim)
  const notes: string[] = []
  const valid = vars.valid && instants(vars.valid, count, 'time coordinate')
  const period = vars.period && durations(vars.period, count)
  let reference: number | null = null
  if (vars.reference) {
    const refs = instants(vars.reference, count, 'forecast reference time', true)
    if (refs.some((r) => r !== refs[0])) {
      throw new IngestError('unsupported_layout', `The lead times come from different forecast runs (${formatIsoUtc(refs[0]!)} … ${formatIsoUtc(refs.find((r) => r !== refs[0])!)}); upload one run at a time.`)
    }
    reference = refs[0]!
  } else if (valid && period) {
    const refs = valid.map((t, k) => t - period[k]!)
    if (refs.some((r) => Math.abs(r - refs[0]!) > AGREEMENT_MS)) {
      throw new IngestError('inconsistent_times', 'time − forecast_period gives a different reference time for different lead times.')
    }
    reference = refs[0]!
    notes.push('The reference time was derived from time − forecast_period (the file has no forecast_reference_time).')
  }
  let validTimesMs: number[]
  if (valid) {
    validTimesMs = valid
    if (period && reference !== null) {
      valid.forEach((t, k) => {
        if (Math.abs(t - reference! - period[k]!) > AGREEMENT_MS) {
          throw new IngestError('inconsistent_times',
            `forecast_period says ${period[k]! / 3_600_000} h for ${formatIsoUtc(t)}, but that is ${(t - reference!) / 3_600_000} h after the reference time ${formatIsoUtc(reference!)}.`)
        }
      })
    }
  } else if (reference !== null && period) {
    validTimesMs = period.map((p) => reference! + p)
  } else {
    throw new IngestError('missing_time',
      `The variable "${data.name}" has no valid time: add a time coordinate, or forecast_reference_time and forecast_period.`)
  }
  return { validTimesMs, referenceTimeMs: reference, notes }
}

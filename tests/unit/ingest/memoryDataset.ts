/**
 * In-memory netCDF datasets for the CF reader tests: a small valid ensemble that each test
 * mutates (one defect at a time) before reading it.
 */
import { copyHyperslab, type AttributeValue, type Dataset, type ValueType, type Variable } from '../../../server/ingest/dataModel'

export interface VariableSpec { dims: string[]; type?: ValueType; attrs?: Record<string, AttributeValue>; values: number[] }
export interface DatasetSpec { dims: Record<string, number>; vars: Record<string, VariableSpec> }

export function memoryDataset(spec: DatasetSpec): Dataset {
  const variables = new Map<string, Variable>()
  for (const [name, v] of Object.entries(spec.vars)) {
    const shape = v.dims.map((d) => spec.dims[d]!)
    const values = v.type === 'float' ? Float32Array.from(v.values) : Float64Array.from(v.values)
    variables.set(name, {
      name, dimensions: v.dims, shape, type: v.type ?? 'double', attributes: v.attrs ?? {},
      read: (start, count) => copyHyperslab(shape, start, count, new Float64Array(count.reduce((p, n) => p * n, 1)), (k) => values[k]!),
    })
  }
  return { dimensions: new Map(Object.entries(spec.dims)), variables, attributes: {} }
}

/** Invented 2-member, 2-lead-time, 3 × 4 temperature ensemble in K over open ocean (44–43° S, 20–18.5° W): value = 280 + t + 0.5 m + 0.1 j + 0.01 i. */
export function baseSpec(): DatasetSpec {
  const values: number[] = []
  for (let t = 0; t < 2; t++) for (let m = 0; m < 2; m++) for (let j = 0; j < 3; j++) for (let i = 0; i < 4; i++) values.push(280 + t + 0.5 * m + 0.1 * j + 0.01 * i)
  return {
    dims: { time: 2, realization: 2, lat: 3, lon: 4 },
    vars: {
      time: { dims: ['time'], attrs: { standard_name: 'time', units: 'hours since 2031-03-04 00:00:00' }, values: [6, 12] },
      forecast_reference_time: { dims: [], attrs: { standard_name: 'forecast_reference_time', units: 'hours since 2031-03-04 00:00:00' }, values: [0] },
      realization: { dims: ['realization'], attrs: { standard_name: 'realization' }, values: [0, 1] },
      lat: { dims: ['lat'], attrs: { units: 'degrees_north' }, values: [-44, -43.5, -43] },
      lon: { dims: ['lon'], attrs: { units: 'degrees_east' }, values: [-20, -19.5, -19, -18.5] },
      t2m: { dims: ['time', 'realization', 'lat', 'lon'], type: 'float', attrs: { standard_name: 'air_temperature', units: 'K' }, values },
    },
  }
}

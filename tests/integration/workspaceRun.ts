// A small completed run written straight into the tables, for the workspace tests: a regular
// lon-lat grid over the invented demo region, synthetic samples with known values.
import { eq } from 'drizzle-orm'
import { useDB, tables } from '../../server/utils/db'
import { packInt16 } from '../../shared/numerics/io/packInt16'

export interface TestRun {
  id: number
  nx: number
  ny: number
  factor: number
  members: number
  samplesPerMember: number
  leads: number
  lon: number[]
  lat: number[]
  /** samples[lead][member][sample] = fine field, row-major fineNy × fineNx. */
  samples: Float64Array[][][]
  coarse: Float32Array[][]
  /** The coarse cell (I, J) that is missing (NaN) in member 0 at every lead. */
  missingCell: [number, number]
}

/**
 * Values: sample s of member m at lead t is 10 + m + 0.5·s + 2·t + a gentle west–east ramp
 * (0.1 per fine column), so every threshold count has a closed form the tests can check.
 */
export function fineValue(t: number, m: number, s: number, i: number, _j: number): number {
  return 10 + m + 0.5 * s + 2 * t + 0.1 * i
}

export async function insertTestRun(opts: { name?: string; isDemo?: boolean } = {}): Promise<TestRun> {
  const nx = 8, ny = 6, factor = 4, members = 3, samplesPerMember = 4, leads = 2
  const lon = Array.from({ length: nx }, (_, i) => -25 + 0.25 * i)
  const lat = Array.from({ length: ny }, (_, j) => -46 + 0.2 * j)
  const fnx = nx * factor, fny = ny * factor
  const missingCell: [number, number] = [7, 5]
  const db = useDB()
  const leadTimes = ['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z']
  const [run] = await db.insert(tables.runs).values({
    name: opts.name ?? `workspace test ${Date.now().toString(36)}`, status: 'completed', format: 'tessera-json',
    sourceFileName: 'synthetic.json', sourceSha256: `ws-${Date.now()}-${Math.random()}`, sourceBytes: 1,
    variable: 'gust', standardName: 'wind_speed_of_gust', units: 'm s-1', canonicalUnits: 'm s-1', displayUnits: 'm/s',
    members, leadTimes, forecastPeriodsHours: [6, 12], referenceTime: new Date('2031-11-14T00:00:00Z'), heightM: 10,
    grid: { nx, ny, spacingKm: 22, dxKm: 19.5, dyKm: 22.2, crs: 'EPSG:4326', proj4: '+proj=longlat +datum=WGS84 +no_defs', x: lon, y: lat, xUnits: 'degrees_east', yUnits: 'degrees_north' },
    extent: [lon[0]! - 0.125, lat[0]! - 0.1, lon[nx - 1]! + 0.125, lat[ny - 1]! + 0.1],
    corners: [[lon[0]! - 0.125, lat[ny - 1]! + 0.1], [lon[nx - 1]! + 0.125, lat[ny - 1]! + 0.1], [lon[nx - 1]! + 0.125, lat[0]! - 0.1], [lon[0]! - 0.125, lat[0]! - 0.1]],
    settings: { factor, samplesPerMember, kernel: 'se', seed: 1 }, isDemo: opts.isDemo ?? false,
    startedAt: new Date(), finishedAt: new Date(),
  }).returning()
  const samples: Float64Array[][][] = []
  const coarse: Float32Array[][] = []
  for (let t = 0; t < leads; t++) {
    samples.push([]); coarse.push([])
    for (let m = 0; m < members; m++) {
      const fields = Array.from({ length: samplesPerMember }, (_, s) => Float64Array.from({ length: fnx * fny }, (_, k) => fineValue(t, m, s, k % fnx, Math.floor(k / fnx))))
      samples[t]!.push(fields)
      const packed = packInt16(fields)
      const c = new Float32Array(nx * ny)
      for (let J = 0; J < ny; J++) for (let I = 0; I < nx; I++) {
        let sum = 0
        for (let dj = 0; dj < factor; dj++) for (let di = 0; di < factor; di++) sum += fields[0]![(J * factor + dj) * fnx + I * factor + di]!
        c[J * nx + I] = sum / factor ** 2
      }
      if (m === 0) c[missingCell[1] * nx + missingCell[0]] = NaN
      coarse[t]!.push(c)
      await db.insert(tables.runFields).values({ runId: run!.id, leadIndex: t, memberIndex: m, data: Buffer.from(c.buffer) })
      await db.insert(tables.runTasks).values({
        runId: run!.id, leadIndex: t, memberIndex: m, status: 'done', attempts: 1, finishedAt: new Date(), elapsedMs: 1,
        samples: Buffer.from(packed.data.buffer), sampleOffset: packed.offset, sampleScale: packed.scale, sampleCount: samplesPerMember, fineNx: fnx, fineNy: fny,
      })
    }
  }
  return { id: run!.id, nx, ny, factor, members, samplesPerMember, leads, lon, lat, samples, coarse, missingCell }
}

export async function deleteTestRun(id: number): Promise<void> {
  await useDB().delete(tables.runs).where(eq(tables.runs.id, id))
}

// The map workspace's endpoints against the running server and real PostgreSQL: products from a
// run written straight into the tables (synthetic samples with closed-form values), areas of
// interest with GeoJSON import, area products from the joint samples, hazard threshold sets.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { PNG } from 'pngjs'
import { inArray, sql } from 'drizzle-orm'
import { BASE_URL, call, signInAs } from '../support/http'
import { closeDB, tables, useDB } from '../../server/utils/db'
import { deleteTestRun, insertTestRun, type TestRun } from './workspaceRun'

let run: TestRun
const cookies: Record<string, string> = {}
const createdAreas: number[] = []

beforeAll(async () => {
  run = await insertTestRun()
  for (const role of ['admin', 'duty_lead', 'forecaster', 'stakeholder'] as const) cookies[role] = await signInAs(role)
})
afterAll(async () => {
  if (createdAreas.length) await useDB().delete(tables.areas).where(inArray(tables.areas.id, createdAreas))
  if (run) await deleteTestRun(run.id)
  await closeDB()
})

// --- Independent reference computations on the test run's samples ------------------------------

const fnx = () => run.nx * run.factor
const fny = () => run.ny * run.factor
/** All samples of lead t in member order (m, s), as the server stacks them. */
const samplesAt = (t: number) => run.samples[t]!.flat()
const crosses = (v: number, T: number, dir: 'above' | 'below') => (dir === 'above' ? v >= T : v <= T)
/** Type-7 quantile (Hyndman & Fan 1996), written out here independently of the app. */
function quantile7(values: number[], q: number): number {
  const s = [...values].sort((a, b) => a - b)
  const h = (s.length - 1) * q, lo = Math.floor(h), hi = Math.min(lo + 1, s.length - 1)
  return s[lo]! + (h - lo) * (s[hi]! - s[lo]!)
}
/** Fine cell centres of the test grid: coarse cells of 0.25° × 0.2° split into 4 × 4. */
const fineLon = (i: number) => run.lon[0]! - 0.125 + 0.0625 * (i + 0.5)
const fineLat = (j: number) => run.lat[0]! - 0.1 + 0.05 * (j + 0.5)
const isMissing = (i: number, j: number) => Math.floor(i / run.factor) === run.missingCell[0] && Math.floor(j / run.factor) === run.missingCell[1]

async function png(path: string, cookie = cookies.forecaster!) {
  const res = await fetch(BASE_URL + path, { headers: { cookie } })
  const bytes = Buffer.from(await res.arrayBuffer())
  return { status: res.status, headers: res.headers, image: res.status === 200 ? PNG.sync.read(bytes) : null }
}

describe('products of a run', () => {
  it('summary: scenarios, classes no finer than one member, missing cells, placement and the legend sentence', async () => {
    const res = await call('GET', `/api/runs/${run.id}/products/summary?lead=0&threshold=13.05&product=nmep&radius=12`, { cookie: cookies.forecaster })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const s = res.body
    expect(s.scenarios).toEqual({ members: 3, of: 3, samplesPerMember: 4, samples: 12 })
    // 3 members: bins of 1/3, plus "no scenario".
    expect(s.legend.classes.map((c: { label: string }) => c.label)).toEqual(['no scenario (0 of 12)', 'above 0 %, up to 33.3 %', '33.3 %–66.7 %', '66.7 %–100 %'])
    expect(s.legend.classes[0].hatched).toBe(true)
    expect(s.legend.title).toBe('Probability that gusts reach 13.05 m/s or more somewhere within 12 km (NMEP), valid 06 UTC 14 Nov 2031 — 3 members × 4 samples')
    expect(s.legend.explanation).toMatch(/NEP is never larger than NMEP/)
    expect(s.missingCells).toBe(run.factor ** 2)
    expect(s.classCounts.reduce((a: number, b: number) => a + b, 0)).toBe(fnx() * fny() - run.factor ** 2)
    expect(s.grid).toMatchObject({ nx: 32, ny: 24, factor: 4 })
    expect(s.grid.fineSpacingKm).toBeCloseTo(22 / 4, 12)
    expect(s.grid.bounds[0]).toBeCloseTo(-25.125, 9)
    expect(s.grid.bounds[3]).toBeCloseTo(-44.9, 9)
  })

  it('map.png: a Web-Mercator image of the stated size and corners, each pixel in the class of the cell under it, missing cells clear', async () => {
    const q = 'lead=0&threshold=13.05&direction=above&product=probability&boundaries=0'
    const { body: s } = await call('GET', `/api/runs/${run.id}/products/summary?${q}`, { cookie: cookies.forecaster })
    const { status, headers, image } = await png(`/api/runs/${run.id}/products/map.png?${q}`)
    expect(status).toBe(200)
    expect(headers.get('content-type')).toBe('image/png')
    expect(decodeURIComponent(headers.get('x-tessera-legend')!)).toBe(s.legend.title)
    expect(JSON.parse(headers.get('x-tessera-corners')!)).toEqual(s.image.corners)
    expect([image!.width, image!.height]).toEqual([s.image.width, s.image.height])
    const [[west, north], [east], , [, south]] = s.image.corners as [[number, number], [number, number], [number, number], [number, number]]
    const yOf = (lat: number) => Math.log(Math.tan(Math.PI / 4 + (lat * Math.PI) / 360))
    const samples = samplesAt(0)
    let checked = 0
    for (const [i, j] of [[0, 0], [5, 3], [17, 11], [31, 23], [29, 21], [12, 20]] as const) {
      // The pixel whose centre is nearest the fine cell's centre (closed-form Mercator placement).
      const px = Math.floor(((fineLon(i) - west) / (east - west)) * image!.width)
      const py = Math.floor(((yOf(north) - yOf(fineLat(j))) / (yOf(north) - yOf(south))) * image!.height)
      const o = (py * image!.width + px) * 4
      const rgba = [...image!.data.subarray(o, o + 4)]
      if (isMissing(i, j)) { expect(rgba[3], `missing cell ${i},${j}`).toBe(0); checked++; continue }
      const count = samples.filter((g) => g[j * fnx() + i]! >= 13.05).length
      const cls = s.legend.classes[count === 0 ? 0 : Math.ceil((count / 12) * 3 - 1e-9)]
      if (cls.hatched) expect(rgba[3]).toBeLessThan(255)
      else expect('#' + rgba.slice(0, 3).map((v: number) => v.toString(16).padStart(2, '0')).join('')).toBe(cls.colour)
      checked++
    }
    expect(checked).toBe(6)
  })

  it('point: sample statistics, probability, members agreeing and NEP/NMEP equal a brute-force computation', async () => {
    const [i, j] = [14, 9]
    const T = 14.05, R = 12
    const res = await call('GET', `/api/runs/${run.id}/products/point?lead=1&threshold=${T}&direction=above&radius=${R}&lon=${fineLon(i)}&lat=${fineLat(j)}`, { cookie: cookies.forecaster })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const r = res.body
    expect(r.cell).toMatchObject({ i, j })
    const samples = samplesAt(1)
    const here = samples.map((g) => g[j * fnx() + i]!)
    expect(r.samples).toBe(12)
    expect(r.value.mean).toBeCloseTo(here.reduce((a, b) => a + b, 0) / 12, 3)
    for (const [key, q] of [['p10', 0.1], ['p50', 0.5], ['p90', 0.9]] as const) expect(r.value[key]).toBeCloseTo(quantile7(here, q), 3)
    expect(r.probability.count).toBe(here.filter((v) => v >= T).length)
    const agreeing = run.samples[1]!.filter((member) => member.some((g) => g[j * fnx() + i]! >= T)).length
    expect(r.membersAgreeing.count).toBe(agreeing)
    // Neighbourhood: centres within R km / 5.5 km cells, truncated at the grid edge.
    const rc = R / 5.5
    const disk: number[] = []
    for (let jj = 0; jj < fny(); jj++) for (let ii = 0; ii < fnx(); ii++) if ((ii - i) ** 2 + (jj - j) ** 2 <= rc * rc) disk.push(jj * fnx() + ii)
    expect(r.neighbourhood.cells).toBe(disk.length)
    const nmep = samples.filter((g) => disk.some((k) => g[k]! >= T)).length / 12
    const nep = samples.reduce((acc, g) => acc + disk.filter((k) => g[k]! >= T).length / disk.length, 0) / 12
    expect(r.neighbourhood.nmep).toBeCloseTo(nmep, 12)
    expect(r.neighbourhood.nep).toBeCloseTo(nep, 12)
  })

  it('time window: per-cell and neighbourhood "at any valid time" products and the window extreme equal brute force', async () => {
    const [i, j] = [14, 9]
    const T = 14.05, R = 12, n = 12
    const at = (t: number, s: number, k: number) => samplesAt(t)[s]![k]!
    for (const direction of ['above', 'below'] as const) {
      const q = `lead=0&windowTo=1&threshold=${T}&direction=${direction}&radius=${R}`
      const res = await call('GET', `/api/runs/${run.id}/products/point?${q}&lon=${fineLon(i)}&lat=${fineLat(j)}`, { cookie: cookies.forecaster })
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      const r = res.body
      expect(r.lead.window).toMatchObject({ from: 0, to: 1, extreme: direction === 'above' ? 'max' : 'min', timeCoherent: false })
      const k0 = j * fnx() + i
      const hit = (s: number, k: number) => [0, 1].some((t) => crosses(at(t, s, k), T, direction))
      const scenarios = Array.from({ length: n }, (_, s) => s)
      expect(r.probability.count).toBe(scenarios.filter((s) => hit(s, k0)).length)
      // The window's extreme per scenario: its percentiles are what the value rows show.
      const extreme = scenarios.map((s) => (direction === 'above' ? Math.max : Math.min)(at(0, s, k0), at(1, s, k0)))
      expect(r.value.p50).toBeCloseTo(quantile7(extreme, 0.5), 3)
      const rc = R / 5.5
      const disk: number[] = []
      for (let jj = 0; jj < fny(); jj++) for (let ii = 0; ii < fnx(); ii++) if ((ii - i) ** 2 + (jj - j) ** 2 <= rc * rc) disk.push(jj * fnx() + ii)
      expect(r.neighbourhood.nmepCount).toBe(scenarios.filter((s) => disk.some((k) => hit(s, k))).length)
      // Summary: class counts of the per-cell window probability over the whole grid (classes of 1/3, "no scenario" first).
      const sum = await call('GET', `/api/runs/${run.id}/products/summary?${q}&product=probability`, { cookie: cookies.forecaster })
      expect(sum.status).toBe(200)
      const expected = [0, 0, 0, 0]
      for (let jj = 0; jj < fny(); jj++) for (let ii = 0; ii < fnx(); ii++) {
        if (isMissing(ii, jj)) continue
        const count = scenarios.filter((s) => hit(s, jj * fnx() + ii)).length
        const c = count === 0 ? 0 : [1, 2, 3].find((c) => count / n <= c / 3 + 1e-9)!
        expected[c]!++
      }
      expect(sum.body.classCounts).toEqual(expected)
      const verb = direction === 'above' ? 'reach 14.05 m/s or more' : 'fall to 14.05 m/s or lower'
      expect(sum.body.legend.title).toBe(`Probability that gusts ${verb}, per 5.5 km cell, at any of the 2 valid times from 06 UTC 14 Nov 2031 to 12 UTC 14 Nov 2031 — 3 members × 4 samples`)
      expect(sum.body.legend.windowNote).toMatch(/drawn separately at each lead time/)
    }
    const single = await call('GET', `/api/runs/${run.id}/products/summary?lead=1&windowTo=1&threshold=${T}`, { cookie: cookies.forecaster })
    expect(single.body.lead.window).toBeNull()
    const backwards = await call('GET', `/api/runs/${run.id}/products/summary?lead=1&windowTo=0&threshold=${T}`, { cookie: cookies.forecaster })
    expect(backwards.status).toBe(400)
    expect(backwards.body.message).toMatch(/must end at or after/)
    const mean = await call('GET', `/api/runs/${run.id}/products/summary?lead=0&windowTo=1&threshold=${T}&product=mean`, { cookie: cookies.forecaster })
    expect(mean.body.legend.title).toMatch(/^Ensemble mean of the highest value of gusts \(m\/s\), over the 2 valid times from 06 UTC/)
  })

  it('summary: the fitted correlation shape of the lead time (median of members, axial mean angle) as a ring on the grid', async () => {
    const t = tables.runTasks
    const shapes = [
      { lengthScale: 4, anisotropy: { adopted: true, majorLengthScale: 6, minorLengthScale: 3, angle: 0.5 } },
      { lengthScale: 5, anisotropy: { adopted: true, majorLengthScale: 8, minorLengthScale: 4, angle: 0.6 } },
      { lengthScale: 3, anisotropy: { adopted: false, majorLengthScale: 3, minorLengthScale: 3, angle: 0 } },
    ]
    for (const [m, fit] of shapes.entries()) {
      await useDB().update(t).set({ fit: { ...fit, transform: { name: 'none' } } }).where(sql`${t.runId} = ${run.id} and ${t.leadIndex} = 0 and ${t.memberIndex} = ${m}`)
    }
    try {
      const res = await call('GET', `/api/runs/${run.id}/products/summary?lead=0`, { cookie: cookies.forecaster })
      const st = res.body.structure
      expect(st).toMatchObject({ members: 3, anisotropic: 2, transform: 'none', anisotropySearched: true })
      // Medians over the adopted members: ℓ₁ = (6 + 8)/2, ℓ₂ = (3 + 4)/2 fine cells of 5.5 km; angle = axial mean of 0.5 and 0.6 rad.
      expect(st.majorKm).toBeCloseTo(7 * 5.5, 9)
      expect(st.minorKm).toBeCloseTo(3.5 * 5.5, 9)
      expect(st.angleDegrees).toBeCloseTo((0.55 * 180) / Math.PI, 9)
      expect(st.ring).toHaveLength(65)
      expect(st.ring[0]).toEqual(st.ring[64])
      const [west, south, east, north] = res.body.grid.bounds
      for (const [lon, lat] of st.ring) { expect(lon).toBeGreaterThanOrEqual(west); expect(lon).toBeLessThanOrEqual(east); expect(lat).toBeGreaterThanOrEqual(south); expect(lat).toBeLessThanOrEqual(north) }
      expect((await call('GET', `/api/runs/${run.id}/products/summary?lead=1`, { cookie: cookies.forecaster })).body.structure).toBeNull()
    } finally {
      await useDB().update(t).set({ fit: null }).where(sql`${t.runId} = ${run.id}`)
    }
  })

  it('point: outside the grid and on a missing cell say so', async () => {
    const outside = await call('GET', `/api/runs/${run.id}/products/point?lon=10&lat=10`, { cookie: cookies.forecaster })
    expect(outside.body.inside).toBe(false)
    const missing = await call('GET', `/api/runs/${run.id}/products/point?lon=${fineLon(30)}&lat=${fineLat(22)}`, { cookie: cookies.forecaster })
    expect(missing.body).toMatchObject({ inside: true, missing: true })
  })

  it('fields: coarse member and sample PNGs on the same frame; unknown member, sample or lead are refused', async () => {
    const coarse = await png(`/api/runs/${run.id}/fields/coarse.png?lead=1&member=2`)
    const sample = await png(`/api/runs/${run.id}/fields/sample.png?lead=1&member=2&sample=3`)
    expect([coarse.status, sample.status]).toEqual([200, 200])
    expect([coarse.image!.width, coarse.image!.height]).toEqual([sample.image!.width, sample.image!.height])
    expect(coarse.headers.get('x-tessera-corners')).toBe(sample.headers.get('x-tessera-corners'))
    expect((await png(`/api/runs/${run.id}/fields/sample.png?lead=1&member=2&sample=4`)).status).toBe(404)
    expect((await png(`/api/runs/${run.id}/fields/coarse.png?lead=0&member=3`)).status).toBe(404)
    expect((await call('GET', `/api/runs/${run.id}/products/summary?lead=2`, { cookie: cookies.forecaster })).status).toBe(400)
  })

  it('a stakeholder cannot read products', async () => {
    expect((await call('GET', `/api/runs/${run.id}/products/summary`, { cookie: cookies.stakeholder })).status).toBe(403)
  })
})

describe('areas of interest', () => {
  const rectangle = { west: -24.6, south: -45.9, east: -24.1, north: -45.5 }

  it('a forecaster saves a rectangle; everyone on staff reads it; the change is audited', async () => {
    const res = await call('POST', '/api/areas', { cookie: cookies.forecaster, body: { name: 'Test rectangle', tags: ['test', 'test'], rectangle } })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    createdAreas.push(res.body.area.id)
    expect(res.body.area).toMatchObject({ name: 'Test rectangle', tags: ['test'], kind: 'rectangle', canEdit: true })
    expect(res.body.area.geometry.type).toBe('MultiPolygon')
    const read = await call('GET', `/api/areas/${res.body.area.id}`, { cookie: cookies.duty_lead })
    expect(read.status).toBe(200)
    expect(read.body.area.geometry.coordinates[0][0]).toContainEqual([-24.6, -45.9])
    const audit = await useDB().execute(sql`select action from audit_log where entity_type = 'area' and entity_id = ${String(res.body.area.id)}`)
    expect(audit.rows.map((r) => r.action)).toEqual(['area.create'])
  })

  it('circles are stored as 64-vertex polygons with centre and radius kept', async () => {
    const res = await call('POST', '/api/areas', { cookie: cookies.forecaster, body: { name: 'Test circle', circle: { centre: [-24.4, -45.6], radiusKm: 8 } } })
    expect(res.status).toBe(201)
    createdAreas.push(res.body.area.id)
    expect(res.body.area.circle).toEqual({ centre: [-24.4, -45.6], radiusKm: 8 })
    expect(res.body.area.geometry.coordinates[0][0]).toHaveLength(65)
  })

  it('only the owner, a duty lead or an administrator may change an area', async () => {
    const lead = await call('POST', '/api/areas', { cookie: cookies.duty_lead, body: { name: 'Lead area', rectangle } })
    createdAreas.push(lead.body.area.id)
    const denied = await call('PATCH', `/api/areas/${lead.body.area.id}`, { cookie: cookies.forecaster, body: { name: 'Taken over' } })
    expect(denied.status).toBe(403)
    expect(denied.body.message).toMatch(/Only its owner/)
    const own = await call('POST', '/api/areas', { cookie: cookies.forecaster, body: { name: 'Mine', rectangle } })
    createdAreas.push(own.body.area.id)
    const renamed = await call('PATCH', `/api/areas/${own.body.area.id}`, { cookie: cookies.duty_lead, body: { name: 'Renamed by the lead', tags: ['x'] } })
    expect(renamed.status).toBe(200)
    expect(renamed.body.area).toMatchObject({ name: 'Renamed by the lead', tags: ['x'] })
    const reshaped = await call('PATCH', `/api/areas/${own.body.area.id}`, { cookie: cookies.forecaster, body: { circle: { centre: [-24, -45.5], radiusKm: 5 } } })
    expect(reshaped.body.area.kind).toBe('circle')
    expect((await call('DELETE', `/api/areas/${own.body.area.id}`, { cookie: cookies.stakeholder })).status).toBe(403)
    expect((await call('DELETE', `/api/areas/${own.body.area.id}`, { cookie: cookies.admin })).status).toBe(204)
    expect((await call('GET', `/api/areas/${own.body.area.id}`, { cookie: cookies.admin })).status).toBe(404)
    const audit = await useDB().execute(sql`select action from audit_log where entity_type = 'area' and entity_id = ${String(own.body.area.id)} order by id`)
    expect(audit.rows.map((r) => r.action)).toEqual(['area.create', 'area.update', 'area.update', 'area.delete'])
  })

  it('an invalid drawn geometry is refused with 422 and the place of the problem', async () => {
    const bowTie = { type: 'Polygon', coordinates: [[[-24, -45], [-23, -46], [-23, -45], [-24, -46], [-24, -45]]] }
    const res = await call('POST', '/api/areas', { cookie: cookies.forecaster, body: { name: 'Bow tie', geometry: bowTie } })
    expect(res.status).toBe(422)
    expect(res.body.message).toMatch(/coordinates\[0\]: the ring intersects itself/)
  })

  it('GeoJSON import stores every feature, named from its properties', async () => {
    const doc = {
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { name: 'Imported west', tags: ['batch'] }, geometry: { type: 'Polygon', coordinates: [[[-25, -46], [-24.5, -46], [-24.5, -45.5], [-25, -46]]] } },
        { type: 'Feature', properties: null, geometry: { type: 'MultiPolygon', coordinates: [[[[-24, -46], [-23.5, -46], [-23.5, -45.5], [-24, -46]]]] } },
      ],
    }
    const res = await call('POST', '/api/areas/import?tag=upload', { cookie: cookies.forecaster, body: doc })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    createdAreas.push(...res.body.areas.map((a: { id: number }) => a.id))
    expect(res.body.areas.map((a: { name: string; tags: string[] }) => [a.name, a.tags])).toEqual([['Imported west', ['batch', 'upload']], ['Imported area 2', ['upload']]])
  })

  it('an import with one invalid feature is refused (422, each problem placed) and stores nothing', async () => {
    const before = await useDB().execute(sql`select count(*)::int as n from areas`)
    const doc = {
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { name: 'Fine' }, geometry: { type: 'Polygon', coordinates: [[[-25, -46], [-24.5, -46], [-24.5, -45.5], [-25, -46]]] } },
        { type: 'Feature', properties: { name: 'Open ring' }, geometry: { type: 'Polygon', coordinates: [[[-25, -46], [-24.5, -46], [-24.5, -45.5], [-25, -45.6]]] } },
        { type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [0, 0] } },
      ],
    }
    const res = await call('POST', '/api/areas/import', { cookie: cookies.forecaster, body: doc })
    expect(res.status).toBe(422)
    expect(res.body.message).toMatch(/features\[1\]\.geometry\.coordinates\[0\]: the ring is not closed/)
    expect(res.body.message).toMatch(/features\[2\]\.geometry\.type: only Polygon and MultiPolygon areas are accepted, got Point/)
    const after = await useDB().execute(sql`select count(*)::int as n from areas`)
    expect(after.rows[0]!.n).toBe(before.rows[0]!.n)
    const notGeoJson = await call('POST', '/api/areas/import', { cookie: cookies.forecaster, body: { hello: 'world' } })
    expect(notGeoJson.status).toBe(400)
  })
})

describe('area products from the joint samples', () => {
  const rectangle = { west: -24.6, south: -45.9, east: -24.1, north: -45.5 }
  let areaId: number
  beforeAll(async () => {
    const res = await call('POST', '/api/areas', { cookie: cookies.forecaster, body: { name: 'Products rectangle', rectangle } })
    areaId = res.body.area.id
    createdAreas.push(areaId)
  })

  /** Cells whose centre lies inside the rectangle (no centre sits on its edges). */
  function areaCells(): number[] {
    const cells: number[] = []
    for (let j = 0; j < fny(); j++) for (let i = 0; i < fnx(); i++) {
      const lon = fineLon(i), lat = fineLat(j)
      if (lon > rectangle.west && lon < rectangle.east && lat > rectangle.south && lat < rectangle.north) cells.push(j * fnx() + i)
    }
    return cells
  }

  for (const [T, direction] of [[14.05, 'above'], [12.95, 'below']] as const) {
    it(`per lead time and over the window equal brute force (threshold ${T}, ${direction})`, async () => {
      const res = await call('GET', `/api/runs/${run.id}/areas/${areaId}/products?threshold=${T}&direction=${direction}`, { cookie: cookies.forecaster })
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      const cells = areaCells()
      expect(res.body.cells).toBe(cells.length)
      expect(res.body.leads).toHaveLength(2)
      for (const row of res.body.leads) {
        const samples = samplesAt(row.leadIndex)
        const values = samples.map((g) => cells.map((k) => g[k]!))
        const anywhere = values.filter((v) => v.some((x) => crosses(x, T, direction))).length
        const areaMean = values.filter((v) => crosses(v.reduce((a, b) => a + b, 0) / v.length, T, direction)).length
        const fraction = values.reduce((acc, v) => acc + v.filter((x) => crosses(x, T, direction)).length / v.length, 0) / 12
        expect(row.anywhereCount).toBe(anywhere)
        expect(row.anywhere).toBeCloseTo(anywhere / 12, 12)
        expect(row.areaMeanCount).toBe(areaMean)
        expect(row.fractionExpected).toBeCloseTo(fraction, 9)
        expect(row.areaMax.p90).toBeCloseTo(quantile7(values.map((v) => Math.max(...v)), 0.9), 3)
        expect(row.areaMin.p10).toBeCloseTo(quantile7(values.map((v) => Math.min(...v)), 0.1), 3)
        const members = run.samples[row.leadIndex]!.filter((member) => member.some((g) => cells.some((k) => crosses(g[k]!, T, direction)))).length
        expect(row.membersAnywhere).toBe(members)
      }
      // Window: sample m crosses at one or more lead times.
      const windowCount = samplesAt(0).filter((_, m) => [0, 1].some((t) => cells.some((k) => crosses(samplesAt(t)[m]![k]!, T, direction)))).length
      expect(res.body.window.anywhereCount).toBe(windowCount)
      expect(res.body.window.validTimes).toEqual(['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z'])
    })
  }

  it('an area off the grid gets no numbers and says why', async () => {
    const far = await call('POST', '/api/areas', { cookie: cookies.forecaster, body: { name: 'Far away', circle: { centre: [40, 10], radiusKm: 20 } } })
    createdAreas.push(far.body.area.id)
    const res = await call('GET', `/api/runs/${run.id}/areas/${far.body.area.id}/products?threshold=14`, { cookie: cookies.forecaster })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ cells: 0, leads: [], note: 'The area lies outside this run\'s grid.' })
  })
})

describe('hazard threshold sets', () => {
  it('ship common-practice defaults, marked as such', async () => {
    const res = await call('GET', '/api/hazards', { cookie: cookies.forecaster })
    expect(res.status).toBe(200)
    const gust = res.body.hazards.find((h: { hazard: string }) => h.hazard === 'gust')
    expect(gust.thresholds.map((t: { value: number; isDefault: boolean }) => [t.value, t.isDefault])).toEqual([[20, true], [25, true], [30, true]])
    const frost = res.body.hazards.find((h: { hazard: string }) => h.hazard === 'low_temperature')
    expect(frost.thresholds.every((t: { direction: string }) => t.direction === 'below')).toBe(true)
  })

  it('a forecaster replaces a set (audited); office values are not marked as defaults; invalid sets are refused', async () => {
    const put = await call('PUT', '/api/hazards/gust', { cookie: cookies.forecaster, body: { thresholds: [{ label: 'Office', value: 22 }, { label: 'Strong gusts', value: 20 }] } })
    expect(put.status, JSON.stringify(put.body)).toBe(200)
    expect(put.body.hazard.thresholds.map((t: { value: number; isDefault: boolean }) => [t.value, t.isDefault])).toEqual([[20, true], [22, false]])
    const audit = await useDB().execute(sql`select after from audit_log where action = 'hazard.thresholds' and entity_id = 'gust' order by id desc limit 1`)
    expect(audit.rows[0]!.after).toEqual([{ label: 'Strong gusts', value: 20 }, { label: 'Office', value: 22 }])
    expect((await call('PUT', '/api/hazards/gust', { cookie: cookies.forecaster, body: { thresholds: [{ label: 'a', value: 1 }, { label: 'b', value: 1 }] } })).status).toBe(400)
    expect((await call('PUT', '/api/hazards/gust', { cookie: cookies.stakeholder, body: { thresholds: [] } })).status).toBe(403)
    // Put the shipped set back for the other tests.
    const restore = await call('PUT', '/api/hazards/gust', { cookie: cookies.duty_lead, body: { thresholds: [{ label: 'Strong gusts', value: 20 }, { label: 'Damaging gusts', value: 25 }, { label: 'Severe gusts', value: 30 }] } })
    expect(restore.body.hazard.thresholds.every((t: { isDefault: boolean }) => t.isDefault)).toBe(true)
  })
})

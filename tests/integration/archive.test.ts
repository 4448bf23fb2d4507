// Archive search against the real database: full-text ranking and snippets, every filter
// (dates, hazard, status, author, approver, list, area drawn on the map via PostGIS), ordering
// and pagination. Each run uses made-up words of its own, so other rows never interfere.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { useDB, closeDB, tables } from '../../server/utils/db'
import { searchArchive } from '../../server/utils/archiveSearch'
import { archiveQuerySchema } from '../../shared/schemas/distribution'
import { makeArea, makeBriefing, makeOrganisationWithList, statementFor, tag } from './distribution/records'

const db = useDB()
const t = tag()
// Invented words that occur nowhere else (letters only, so the English stemmer keeps them whole).
const word = `quorvel${t.replace(/\d/g, (d) => 'abcdefghij'[Number(d)]!)}`
const many = `plimsotar${t.replace(/\d/g, (d) => 'klmnopqrst'[Number(d)]!)}`
const search = (q: Record<string, unknown>) => searchArchive(archiveQuerySchema.parse(q))
const ids: Record<string, number> = {}

beforeAll(async () => {
  const [author, approver] = await db.insert(tables.users).values([
    { email: `author-${t}@test.tessera.example`, displayName: `Author ${t}`, role: 'forecaster' },
    { email: `approver-${t}@test.tessera.example`, displayName: `Approver ${t}`, role: 'duty_lead' },
  ]).returning()
  const l1 = (await makeOrganisationWithList({ contacts: [] })).list
  const l2 = (await makeOrganisationWithList({ contacts: [] })).list
  // Three invented areas over open ocean: west and middle overlap, east is far away.
  const west = await makeArea(`West ${t}`, [[-30, -40], [-29, -40], [-29, -39], [-30, -39], [-30, -40]])
  const middle = await makeArea(`Middle ${t}`, [[-29.5, -40], [-28.5, -40], [-28.5, -39], [-29.5, -39], [-29.5, -40]])
  const east = await makeArea(`East ${t}`, [[-10, -40], [-9, -40], [-9, -39], [-10, -39], [-10, -40]])
  const issued = (d: string) => new Date(`${d}T09:00:00Z`)
  const both = { authorId: author!.id, approvedById: approver!.id }

  ids.titleOnly = (await makeBriefing({ title: `Gusts ${word} on the west ridge`, headline: 'Windy', summary: 'Plain words.', areaIds: [west], hazards: ['gust'], issuedAt: issued('2031-01-10'), listKeys: [l1], ...both })).id
  ids.strongest = (await makeBriefing({ title: `${word} gusts`, headline: `${word} expected`, summary: `More about ${word}.`, hazards: ['gust'], issuedAt: issued('2031-01-20') })).id
  ids.statement = (await makeBriefing({
    status: 'withdrawn', title: 'Frost on the east shelf', hazards: ['low_temperature'], areaIds: [east], issuedAt: issued('2031-02-10'), listKeys: [l2], authorId: author!.id,
    statements: [statementFor(east, `East ${t}`, 0.3, `about 30 % that frost reaches the ${word} road`, 'low_temperature')],
  })).id
  ids.caveat = (await makeBriefing({ status: 'superseded', title: 'Heavy rain in the middle basin', hazards: ['heavy_precipitation'], areaIds: [middle], caveats: [`Local ${word} gauges are sparse.`], issuedAt: issued('2031-03-10') })).id
  const [replaced] = await db.select({ seriesId: tables.briefings.seriesId }).from(tables.briefings).where(eq(tables.briefings.id, ids.caveat))
  await makeBriefing({ status: 'issued', seriesId: replaced!.seriesId, version: 2, supersedesId: ids.caveat, title: 'Heavy rain in the middle basin (amended)', issuedAt: issued('2031-03-11') })
  ids.draft = (await makeBriefing({ status: 'draft', title: `${word} draft never issued` })).id
  for (let k = 0; k < 25; k++) await makeBriefing({ title: `Routine ${many} number ${k}`, issuedAt: new Date(Date.UTC(2031, 5, 1 + k, 9)) })
  Object.assign(ids, { author: author!.id, approver: approver!.id, l1: l1.id, l2: l2.id })
}, 120_000)

afterAll(async () => { await closeDB() })

describe('archive full-text search', () => {
  it('finds issued, withdrawn and superseded versions but never drafts', async () => {
    const r = await search({ q: word })
    const found = r.hits.map((h) => h.id)
    expect(found).toEqual(expect.arrayContaining([ids.titleOnly, ids.strongest, ids.statement, ids.caveat]))
    expect(found).not.toContain(ids.draft)
    expect(r.total).toBe(4)
    expect(r.hits.find((h) => h.id === ids.statement)!.status).toBe('withdrawn')
    const superseded = r.hits.find((h) => h.id === ids.caveat)!
    expect(superseded.status).toBe('superseded')
    expect(superseded.supersededBy).not.toBeNull()
  })

  it('ranks title and headline matches above statement and caveat matches', async () => {
    const r = await search({ q: word })
    expect(r.order).toBe('relevance')
    expect(r.hits[0]!.id).toBe(ids.strongest) // A-weighted, three times
    expect(r.hits[1]!.id).toBe(ids.titleOnly) // A-weighted once
    expect(r.hits.at(-1)!.id).toBe(ids.caveat) // D-weighted only
    const ranks = r.hits.map((h) => h.rank!)
    expect([...ranks].sort((a, b) => b - a)).toEqual(ranks)
  })

  it('returns snippets with the matched words marked', async () => {
    const r = await search({ q: word })
    const snippet = r.hits.find((h) => h.id === ids.statement)!.snippet
    expect(snippet.some((s) => s.hit && s.text.toLowerCase() === word)).toBe(true)
    expect(snippet.map((s) => s.text).join('')).toContain('frost reaches the')
  })

  it('understands web-search syntax and ignores a query of stop words only', async () => {
    expect((await search({ q: `${word} -frost` })).hits.map((h) => h.id)).not.toContain(ids.statement)
    expect((await search({ q: `"${word} gusts"` })).hits.map((h) => h.id)).toEqual([ids.strongest])
    const r = await search({ q: 'the and of' })
    expect(r.textIgnored).toBe(true)
  })
})

describe('archive filters', () => {
  const only = async (q: Record<string, unknown>) => (await search({ q: word, ...q })).hits.map((h) => h.id).sort((a, b) => a - b)
  const sorted = (...x: number[]) => x.sort((a, b) => a - b)

  it('by issue date (inclusive UTC days)', async () => {
    expect(await only({ from: '2031-01-10', to: '2031-01-20' })).toEqual(sorted(ids.titleOnly!, ids.strongest!))
    expect(await only({ from: '2031-02-11' })).toEqual([ids.caveat])
  })
  it('by hazard', async () => { expect(await only({ hazard: 'gust' })).toEqual(sorted(ids.titleOnly!, ids.strongest!)) })
  it('by status', async () => {
    expect(await only({ status: 'withdrawn' })).toEqual([ids.statement])
    expect(await only({ status: 'superseded' })).toEqual([ids.caveat])
  })
  it('by author and by approver', async () => {
    expect(await only({ author: ids.author })).toEqual(sorted(ids.titleOnly!, ids.statement!))
    expect(await only({ approver: ids.approver })).toEqual([ids.titleOnly])
  })
  it('by distribution list', async () => { expect(await only({ list: ids.l2 })).toEqual([ids.statement]) })
  it('by an area drawn on the map (PostGIS intersection)', async () => {
    // Overlaps the west and middle areas only.
    const drawn = { type: 'Polygon', coordinates: [[[-29.8, -39.8], [-29.0, -39.8], [-29.0, -39.2], [-29.8, -39.2], [-29.8, -39.8]]] }
    expect(await only({ area: JSON.stringify(drawn) })).toEqual(sorted(ids.titleOnly!, ids.caveat!))
    const touchingNothing = { type: 'Polygon', coordinates: [[[0, 0], [1, 0], [1, 1], [0, 1], [0, 0]]] }
    expect(await only({ area: JSON.stringify(touchingNothing) })).toEqual([])
    const eastOnly = { type: 'Polygon', coordinates: [[[-9.5, -39.5], [-9.4, -39.5], [-9.4, -39.4], [-9.5, -39.4], [-9.5, -39.5]]] }
    expect(await only({ area: JSON.stringify(eastOnly) })).toEqual([ids.statement])
  })
  it('refuses an area that is not a polygon', () => {
    expect(archiveQuerySchema.safeParse({ area: '{"type":"Point","coordinates":[0,0]}' }).success).toBe(false)
    expect(archiveQuerySchema.safeParse({ area: 'not json' }).success).toBe(false)
  })
})

describe('archive ordering and pages', () => {
  it('orders by date either way and pages through the results', async () => {
    const newest = await search({ q: many, order: 'newest' })
    expect(newest.total).toBe(25)
    expect(newest.hits).toHaveLength(20)
    const times = newest.hits.map((h) => Date.parse(h.issuedAt))
    expect([...times].sort((a, b) => b - a)).toEqual(times)
    const page2 = await search({ q: many, order: 'newest', page: 2 })
    expect(page2.hits).toHaveLength(5)
    expect(new Set([...newest.hits, ...page2.hits].map((h) => h.id)).size).toBe(25)
    const oldest = await search({ q: many, order: 'oldest' })
    expect(oldest.hits[0]!.id).toBe(page2.hits.at(-1)!.id)
  })

  it('without words lists issued versions newest first', async () => {
    const r = await search({ from: '2031-06-01', to: '2031-06-30' })
    expect(r.order).toBe('newest')
    expect(r.total).toBeGreaterThanOrEqual(25)
    expect(r.hits.every((h) => h.rank === null)).toBe(true)
  })
})

/**
 * Archive search over every issued briefing version (issued, withdrawn and superseded ones):
 * PostgreSQL full-text search on the weighted document in briefing_search (GIN), ranked with
 * ts_rank, snippets from ts_headline; filters on issue date, hazard (GIN on the array), status,
 * author, approver, distribution list (copied into the index), and an area drawn on the map (ST_Intersects on the GiST-
 * indexed union of the briefing's areas). No Nitro globals: the bench imports this file.
 */
import { sql, type SQL } from 'drizzle-orm'
import { useDB, tables, type Database } from './db'
import { ARCHIVE_PAGE_SIZE, type ArchiveQuery } from '../../shared/schemas/distribution'

const S = tables.briefingSearch
const B = tables.briefings

/** Sentinels ts_headline puts around matches; replaced by highlighted segments for the page. */
const START = '\u0002'
const STOP = '\u0003'

export interface ArchiveHit {
  id: number
  seriesId: number
  version: number
  status: 'issued' | 'withdrawn' | 'superseded'
  title: string
  issuedAt: string
  windowStart: string | null
  windowEnd: string | null
  hazards: string[]
  areaNames: string[]
  authorName: string | null
  approverName: string | null
  lists: string[]
  rank: number | null
  /** The snippet as alternating plain and matched pieces (rendered without v-html). */
  snippet: { text: string; hit: boolean }[]
  supersededBy: number | null
  withdrawnReason: string | null
}

/** Conditions and ordering of a search, shared by the result query and EXPLAIN in the bench. */
export function archiveSearchParts(query: ArchiveQuery, hasText: boolean) {
  const tsq = sql`websearch_to_tsquery('english', ${query.q})`
  const where: SQL[] = [sql`${S.issuedAt} is not null`]
  if (hasText) where.push(sql`${S.document} @@ ${tsq}`)
  if (query.status) where.push(sql`${S.status} = ${query.status}`)
  if (query.from) where.push(sql`${S.issuedAt} >= ${`${query.from}T00:00:00Z`}::timestamptz`)
  if (query.to) where.push(sql`${S.issuedAt} < (${`${query.to}T00:00:00Z`}::timestamptz + interval '1 day')`)
  if (query.hazard) where.push(sql`${S.hazards} @> array[${query.hazard}]::text[]`)
  if (query.area) where.push(sql`ST_Intersects(${S.footprint}, ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(query.area)}), 4326))`)
  if (query.list) where.push(sql`${S.listIds} @> array[${query.list}]::int[]`)
  if (query.author) where.push(sql`${S.authorId} = ${query.author}`)
  if (query.approver) where.push(sql`${S.approvedById} = ${query.approver}`)
  const order = query.order ?? (hasText ? 'relevance' : 'newest')
  const rank = hasText ? sql`ts_rank(${S.document}, ${tsq}, 1)` : sql`null::real`
  const orderBy = order === 'relevance' && hasText
    ? sql`rank desc, ${S.issuedAt} desc, ${S.briefingId} desc`
    : order === 'oldest' ? sql`${S.issuedAt} asc, ${S.briefingId} asc` : sql`${S.issuedAt} desc, ${S.briefingId} desc`
  return { tsq, where: sql.join(where, sql` and `), rank, orderBy, order }
}

/** The page query: matching ids and rank, for one page (the total is counted separately). */
export function archivePageSql(query: ArchiveQuery, hasText: boolean): SQL {
  const p = archiveSearchParts(query, hasText)
  const offset = (query.page - 1) * ARCHIVE_PAGE_SIZE
  return sql`select ${S.briefingId} as id, ${p.rank} as rank
    from ${S} where ${p.where} order by ${p.orderBy} limit ${ARCHIVE_PAGE_SIZE} offset ${offset}`
}

/** Counting stops here: "1 000 or more" (50 pages) is as useful as an exact figure and far cheaper. */
export const ARCHIVE_COUNT_CAP = 1_000

/** How many versions match, up to the cap (no ordering, so the cheapest plan can answer it). */
export function archiveCountSql(query: ArchiveQuery, hasText: boolean): SQL {
  const p = archiveSearchParts(query, hasText)
  return sql`select count(*)::int as n from (select 1 from ${S} where ${p.where} limit ${ARCHIVE_COUNT_CAP + 1}) as matching`
}

/** Whether the words make a non-empty text query (only stop words → ignored, with a note). */
async function textQueryUsable(db: Pick<Database, 'execute'>, q: string): Promise<boolean> {
  if (!q) return false
  const res = await db.execute(sql`select numnode(websearch_to_tsquery('english', ${q}))::int as n`)
  return Number((res.rows[0] as { n: number }).n) > 0
}

function splitSnippet(text: string): { text: string; hit: boolean }[] {
  const out: { text: string; hit: boolean }[] = []
  for (const [i, piece] of text.split(new RegExp(`[${START}${STOP}]`)).entries()) {
    if (piece) out.push({ text: piece, hit: i % 2 === 1 })
  }
  return out
}

/** Runs a search: one page of hits, the total, and whether the text part was usable. */
export async function searchArchive(query: ArchiveQuery, db: Database = useDB()) {
  const hasText = await textQueryUsable(db, query.q)
  const [page, counted] = await Promise.all([db.execute(archivePageSql(query, hasText)), db.execute(archiveCountSql(query, hasText))])
  const ids = page.rows as unknown as { id: number; rank: number | null }[]
  const n = Number((counted.rows[0] as { n: number }).n)
  const base = { total: Math.min(n, ARCHIVE_COUNT_CAP), totalCapped: n > ARCHIVE_COUNT_CAP, page: query.page, pageSize: ARCHIVE_PAGE_SIZE, textIgnored: !!query.q && !hasText, order: archiveSearchParts(query, hasText).order }
  if (ids.length === 0) return { hits: [] as ArchiveHit[], ...base }

  const tsq = hasText ? sql`websearch_to_tsquery('english', ${query.q})` : null
  const body = sql`concat_ws(' · ', b.title, b.narrative->>'headline', b.narrative->>'summary',
      (select string_agg(x->>'text', ' ') from jsonb_array_elements(b.statements) x where coalesce((x->>'included')::boolean, true)),
      b.narrative->>'details')`
  const snippet = tsq
    ? sql`ts_headline('english', ${body}, ${tsq}, ${`StartSel=${START}, StopSel=${STOP}, MaxWords=26, MinWords=10, MaxFragments=2, FragmentDelimiter=" … "`})`
    : sql`left(concat_ws(' · ', b.narrative->>'headline', b.narrative->>'summary'), 240)`
  const details = await db.execute(sql`
    select b.id, b.series_id as "seriesId", b.version, b.status, b.title, b.issued_at as "issuedAt", b.window_start as "windowStart",
      b.window_end as "windowEnd", s.hazards, s.area_names as "areaNames", au.display_name as "authorName", ap.display_name as "approverName",
      b.withdrawn_reason as "withdrawnReason",
      coalesce((select array_agg(bl.list_name order by bl.list_name) from ${tables.briefingLists} bl where bl.briefing_id = b.id), '{}') as lists,
      (select n.id from ${B} n where n.series_id = b.series_id and n.version > b.version and n.issued_at is not null order by n.version limit 1) as "supersededBy",
      ${snippet} as snippet
    from ${B} b join ${S} s on s.briefing_id = b.id
    left join ${tables.users} au on au.id = b.author_id
    left join ${tables.users} ap on ap.id = b.approved_by_id
    where b.id in (${sql.join(ids.map((r) => sql`${r.id}`), sql`, `)})`)
  const byId = new Map((details.rows as any[]).map((r) => [Number(r.id), r]))
  const hits: ArchiveHit[] = ids.map((r) => {
    const d = byId.get(Number(r.id))
    return {
      id: Number(d.id), seriesId: d.seriesId, version: d.version, status: d.status, title: d.title,
      issuedAt: new Date(d.issuedAt).toISOString(),
      windowStart: d.windowStart ? new Date(d.windowStart).toISOString() : null,
      windowEnd: d.windowEnd ? new Date(d.windowEnd).toISOString() : null,
      hazards: d.hazards, areaNames: d.areaNames, authorName: d.authorName, approverName: d.approverName, lists: d.lists,
      rank: r.rank == null ? null : Number(r.rank),
      snippet: splitSnippet(String(d.snippet ?? '')),
      supersededBy: d.supersededBy == null ? null : Number(d.supersededBy),
      withdrawnReason: d.withdrawnReason,
    }
  })
  return { hits, ...base }
}

/** Choices for the filter controls: people who wrote or approved issued briefings, and the lists. */
export async function archiveFilterChoices(db: Database = useDB()) {
  const people = (column: 'author_id' | 'approved_by_id') => db.execute(sql`
    select u.id, u.display_name as name from ${tables.users} u
    where exists (select 1 from ${B} b where b.${sql.raw(column)} = u.id and b.issued_at is not null) order by u.display_name`)
  const [authors, approvers, lists] = await Promise.all([
    people('author_id'), people('approved_by_id'),
    db.select({ id: tables.distributionLists.id, name: tables.distributionLists.name }).from(tables.distributionLists).orderBy(tables.distributionLists.name),
  ])
  return { authors: authors.rows as { id: number; name: string }[], approvers: approvers.rows as { id: number; name: string }[], lists }
}

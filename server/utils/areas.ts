/**
 * Areas of interest: stored as WGS 84 MultiPolygons in PostGIS, shared across the office.
 * Forecasters, duty leads and administrators create them; the owner, a duty lead or an
 * administrator may change or remove one. Every change is written to the audit log.
 */
import type { H3Event } from 'h3'
import { createError } from 'h3'
import { asc, eq, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import type { MultiPolygon, Polygon } from 'geojson'
import { circlePolygon, rectanglePolygon } from '../../shared/numerics/geo/shapes'
import { formatProblem, validateAreaGeoJson, type GeoJsonProblem } from '../../shared/numerics/geo/validateGeoJson'
import { DEMO_PLACES, DEMO_STAKEHOLDERS, KALDOR_RIDGE } from '../../shared/demo/region'
import { NAME_PROPERTIES, type AreaKind, type AreaRecord as SharedAreaRecord, type CreateAreaInput, type UpdateAreaInput } from '../../shared/schemas/areas'
import { useDB, tables, type Database } from './db'
import { recordAudit } from './audit'

export type AreaRecord = SharedAreaRecord<Date>

const a = tables.areas
const selection = {
  id: a.id, name: a.name, tags: a.tags, kind: a.kind, circleCentre: a.circleCentre, circleRadiusKm: a.circleRadiusKm,
  geometry: sql<string>`ST_AsGeoJSON(${a.geometry})`, ownerId: a.ownerId, ownerName: tables.users.displayName,
  isDemo: a.isDemo, createdAt: a.createdAt, updatedAt: a.updatedAt,
}
type SelectedRow = { [K in keyof typeof selection]: unknown } & { geometry: string }

function toRecord(row: SelectedRow): AreaRecord {
  const r = row as unknown as Omit<AreaRecord, 'geometry' | 'circle'> & { geometry: string; circleCentre: [number, number] | null; circleRadiusKm: number | null }
  return {
    id: r.id, name: r.name, tags: r.tags, kind: r.kind,
    circle: r.circleCentre && r.circleRadiusKm ? { centre: r.circleCentre, radiusKm: r.circleRadiusKm } : null,
    geometry: JSON.parse(r.geometry) as MultiPolygon,
    ownerId: r.ownerId, ownerName: r.ownerName, isDemo: r.isDemo, createdAt: r.createdAt, updatedAt: r.updatedAt,
  }
}

const notFound = (id: number) => createError({ statusCode: 404, statusMessage: 'Not Found', message: `There is no area ${id}.` })

/** 422 listing every problem with its place in the document (at most 20 lines in the message). */
export function invalidGeoJson(problems: GeoJsonProblem[]) {
  const lines = problems.slice(0, 20).map(formatProblem)
  const more = problems.length > 20 ? `\n… and ${problems.length - 20} more problems.` : ''
  return createError({
    statusCode: 422, statusMessage: 'Invalid area',
    message: `The area is not valid GeoJSON (RFC 7946):\n${lines.join('\n')}${more}`,
    data: { problems },
  })
}

function multi(geometry: Polygon | MultiPolygon): MultiPolygon {
  return geometry.type === 'MultiPolygon' ? geometry : { type: 'MultiPolygon', coordinates: [geometry.coordinates] }
}

const geometrySql = (geometry: MultiPolygon) => sql`ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(geometry)}), 4326))` as unknown as string

interface ResolvedShape { kind: AreaKind; geometry: MultiPolygon; circleCentre: [number, number] | null; circleRadiusKm: number | null }

/** Turns a circle, rectangle or geometry into the stored polygon, validated as RFC 7946 (422 otherwise). */
export function resolveShape(input: Pick<CreateAreaInput, 'geometry' | 'circle' | 'rectangle'>): ResolvedShape {
  let kind: AreaKind = 'polygon'
  let geometry: unknown = input.geometry
  if (input.circle) { kind = 'circle'; geometry = circlePolygon(input.circle.centre, input.circle.radiusKm, 64) }
  if (input.rectangle) { const r = input.rectangle; kind = 'rectangle'; geometry = rectanglePolygon(r.west, r.south, r.east, r.north) }
  const checked = validateAreaGeoJson(geometry)
  if (!checked.ok) throw invalidGeoJson(checked.problems)
  return {
    kind, geometry: multi(checked.areas[0]!.geometry),
    circleCentre: input.circle ? input.circle.centre : null, circleRadiusKm: input.circle ? input.circle.radiusKm : null,
  }
}

export async function listAreas(): Promise<AreaRecord[]> {
  const rows = await useDB().select(selection).from(a).leftJoin(tables.users, eq(tables.users.id, a.ownerId)).orderBy(asc(a.name), asc(a.id))
  return rows.map((r) => toRecord(r as SelectedRow))
}

export async function getArea(id: number, db: Pick<Database, 'select'> = useDB()): Promise<AreaRecord> {
  const [row] = await db.select(selection).from(a).leftJoin(tables.users, eq(tables.users.id, a.ownerId)).where(eq(a.id, id))
  if (!row) throw notFound(id)
  return toRecord(row as SelectedRow)
}

/** Whether a user may change or remove an area: its owner, a duty lead or an administrator. */
export function canEditArea(user: User, area: Pick<AreaRecord, 'ownerId'>): boolean {
  return user.role === 'admin' || user.role === 'duty_lead' || (user.role === 'forecaster' && area.ownerId === user.id)
}

function assertCanEdit(user: User, area: AreaRecord): void {
  if (!canEditArea(user, area)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `Only its owner (${area.ownerName ?? 'no one'}), a duty lead or an administrator can change “${area.name}”.` })
  }
}

/** Audit form of an area: small enough to keep whole (geometry included). */
const auditForm = (r: AreaRecord) => ({ name: r.name, tags: r.tags, kind: r.kind, circle: r.circle, geometry: r.geometry })

export async function createArea(event: H3Event, user: User, input: CreateAreaInput): Promise<AreaRecord> {
  const shape = resolveShape(input)
  return useDB().transaction(async (tx) => {
    const [row] = await tx.insert(a).values({
      name: input.name, tags: input.tags, kind: shape.kind, circleCentre: shape.circleCentre, circleRadiusKm: shape.circleRadiusKm,
      geometry: geometrySql(shape.geometry), ownerId: user.id,
    }).returning({ id: a.id })
    const area = await getArea(row!.id, tx)
    await recordAudit({ actor: user, action: 'area.create', entityType: 'area', entityId: area.id, after: auditForm(area) }, event, tx)
    return area
  })
}

export async function updateArea(event: H3Event, user: User, id: number, patch: UpdateAreaInput): Promise<AreaRecord> {
  const before = await getArea(id)
  assertCanEdit(user, before)
  const hasShape = patch.geometry !== undefined || patch.circle !== undefined || patch.rectangle !== undefined
  const shape = hasShape ? resolveShape(patch) : null
  return useDB().transaction(async (tx) => {
    await tx.update(a).set({
      ...(patch.name !== undefined ? { name: patch.name } : {}),
      ...(patch.tags !== undefined ? { tags: patch.tags } : {}),
      ...(shape ? { kind: shape.kind, circleCentre: shape.circleCentre, circleRadiusKm: shape.circleRadiusKm, geometry: geometrySql(shape.geometry) } : {}),
      updatedAt: new Date(),
    }).where(eq(a.id, id))
    const after = await getArea(id, tx)
    await recordAudit({ actor: user, action: 'area.update', entityType: 'area', entityId: id, before: auditForm(before), after: auditForm(after) }, event, tx)
    return after
  })
}

export async function deleteArea(event: H3Event, user: User, id: number): Promise<void> {
  const before = await getArea(id)
  assertCanEdit(user, before)
  await useDB().transaction(async (tx) => {
    await tx.delete(a).where(eq(a.id, id))
    await recordAudit({ actor: user, action: 'area.delete', entityType: 'area', entityId: id, before: auditForm(before) }, event, tx)
  })
}

function nameFrom(properties: Record<string, unknown> | null, fallback: string): string {
  for (const key of NAME_PROPERTIES) {
    const v = properties?.[key]
    if (typeof v === 'string' && v.trim()) return v.trim().slice(0, 120)
  }
  return fallback
}

function tagsFrom(properties: Record<string, unknown> | null, extra?: string): string[] {
  const raw = properties?.tags
  const list = Array.isArray(raw) ? raw.filter((t): t is string => typeof t === 'string') : typeof raw === 'string' ? raw.split(',') : []
  return [...new Set([...list, ...(extra ? [extra] : [])].map((t) => t.trim().slice(0, 40)).filter(Boolean))].slice(0, 12)
}

/**
 * Stores every area of an uploaded GeoJSON document in one transaction, or none: any invalid
 * feature makes the whole upload a 422 that names each problem and where it is.
 */
export async function importAreas(event: H3Event, user: User, document: unknown, tag?: string): Promise<AreaRecord[]> {
  const checked = validateAreaGeoJson(document)
  if (!checked.ok) throw invalidGeoJson(checked.problems)
  if (checked.areas.length > 200) throw createError({ statusCode: 422, statusMessage: 'Invalid area', message: `The upload has ${checked.areas.length} areas; at most 200 can be imported at once.` })
  return useDB().transaction(async (tx) => {
    const out: AreaRecord[] = []
    for (const [k, valid] of checked.areas.entries()) {
      const name = nameFrom(valid.properties, `Imported area ${k + 1}`)
      const [row] = await tx.insert(a).values({
        name, tags: tagsFrom(valid.properties, tag), kind: 'polygon', geometry: geometrySql(multi(valid.geometry)), ownerId: user.id,
      }).returning({ id: a.id })
      const area = await getArea(row!.id, tx)
      await recordAudit({ actor: user, action: 'area.import', entityType: 'area', entityId: area.id, after: { ...auditForm(area), source: valid.path || 'document' } }, event, tx)
      out.push(area)
    }
    return out
  })
}

// --- Demo scenario areas -----------------------------------------------------------------------

const place = (name: string) => {
  const p = DEMO_PLACES.find((x) => x.name === name)
  if (!p) throw new Error(`demo place ${name} is missing`)
  return [p.lon, p.lat] as [number, number]
}

/** A corridor of half-width `halfDeg` degrees around a line (a simple polygon: left side out, right side back). */
function corridor(line: [number, number][], halfDeg: number): Polygon {
  const left: [number, number][] = [], right: [number, number][] = []
  line.forEach((p, k) => {
    const q = line[Math.min(k + 1, line.length - 1)]!, o = line[Math.max(k - 1, 0)]!
    const dx = q[0] - o[0], dy = q[1] - o[1], len = Math.hypot(dx, dy) || 1
    left.push([p[0] - (dy / len) * halfDeg, p[1] + (dx / len) * halfDeg])
    right.push([p[0] + (dy / len) * halfDeg, p[1] - (dx / len) * halfDeg])
  })
  const ring = [...left, ...right.reverse()]
  return { type: 'Polygon', coordinates: [[...ring, ring[0]!]] }
}

/** The invented stakeholders' areas (one or two each), for the demo scenario. */
export function demoAreaInputs(): { name: string; tags: string[]; input: Pick<CreateAreaInput, 'geometry' | 'circle' | 'rectangle'> }[] {
  const [roads, ferry, festival, grid] = DEMO_STAKEHOLDERS.map((s) => s.name)
  return [
    { name: 'Kaldor Pass', tags: [roads!, 'demo'], input: { circle: { centre: place('Kaldor Pass'), radiusKm: 12 } } },
    { name: 'Coast road, Tessel Bay to Port Aveline', tags: [roads!, 'demo'], input: { geometry: corridor([place('Tessel Bay'), [-22.4, -45.6], place('Port Aveline')], 0.12) } },
    { name: 'Aveline Sound crossing', tags: [ferry!, 'demo'], input: { rectangle: { west: -21.45, south: -45.05, east: -20.25, north: -44.25 } } },
    { name: 'Brinmoor Meadows festival site', tags: [festival!, 'demo'], input: { circle: { centre: place('Brinmoor Meadows'), radiusKm: 6 } } },
    { name: 'Kaldor Range power lines', tags: [grid!, 'demo'], input: { geometry: corridor(KALDOR_RIDGE, 0.18) } },
  ]
}

/**
 * Adds the demo areas once (the audit entry 'area.seed_demo' records that it happened, so areas
 * deleted later are not brought back). Safe under concurrent callers (advisory lock).
 */
let demoAreasChecked = false

export async function ensureDemoAreas(db: Database = useDB()): Promise<number> {
  if (demoAreasChecked) return 0
  const added = await db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext('tessera.demo_areas'))`)
    const done = await tx.execute(sql`select 1 from audit_log where action = 'area.seed_demo' limit 1`)
    if (done.rows.length) return 0
    const ids: number[] = []
    for (const demo of demoAreaInputs()) {
      const shape = resolveShape(demo.input)
      const [row] = await tx.insert(a).values({
        name: demo.name, tags: demo.tags, kind: shape.kind, circleCentre: shape.circleCentre, circleRadiusKm: shape.circleRadiusKm,
        geometry: geometrySql(shape.geometry), ownerId: null, isDemo: true,
      }).returning({ id: a.id })
      ids.push(row!.id)
    }
    await recordAudit({ actor: null, action: 'area.seed_demo', entityType: 'area', after: { ids } }, undefined, tx)
    return ids.length
  })
  demoAreasChecked = true
  return added
}

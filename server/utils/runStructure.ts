/**
 * The fitted correlation shape of one lead time of a run (median over its members, see
 * shared/utils/correlationShape.ts), placed on the map as a ring in the grid's south-west corner,
 * drawn to scale in the grid's own coordinates so that rotated and projected grids show it right.
 */
import { and, eq, sql } from 'drizzle-orm'
import { ellipseOffsets, summariseShapes, type FittedShape, type LeadStructure } from '../../shared/utils/correlationShape'
import { useDB, tables } from './db'
import type { RunPlacement, RunRow } from './runSamples'

/** The median fitted shape of lead `leadIndex`'s finished members, or null when none has a fit. */
export async function leadStructure(run: RunRow, placement: RunPlacement, leadIndex: number): Promise<LeadStructure | null> {
  const t = tables.runTasks
  const rows = await useDB().select({
    lengthScale: sql<number | null>`(${t.fit} ->> 'lengthScale')::float8`,
    anisotropy: sql<FittedShape['anisotropy']>`${t.fit} -> 'anisotropy'`,
    transform: sql<string | null>`${t.fit} -> 'transform' ->> 'name'`,
  }).from(t).where(and(eq(t.runId, run.id), eq(t.leadIndex, leadIndex), eq(t.status, 'done')))
  const summary = summariseShapes(rows.map((r) => ({ lengthScale: r.lengthScale ?? 0, anisotropy: r.anisotropy })))
  if (!summary) return null
  const g = placement.geometry
  const dx = (g.xEdges[g.nx]! - g.xEdges[0]!) / g.nx, dy = (g.yEdges[g.ny]! - g.yEdges[0]!) / g.ny
  // Centre one major length (plus a margin of two cells) in from the south-west corner, inside the grid.
  const inset = Math.min(summary.major + 2, (g.nx - 1) / 2, (g.ny - 1) / 2)
  const x0 = g.xEdges[0]! + inset * dx, y0 = g.yEdges[0]! + inset * dy
  const ring = ellipseOffsets(summary.major, summary.minor, summary.angle).map(([di, dj]) => g.toLonLat(x0 + di * dx, y0 + dj * dy))
  const transforms = [...new Set(rows.map((r) => r.transform ?? 'none'))]
  return {
    members: summary.members, anisotropic: summary.anisotropic,
    majorKm: summary.major * g.spacingKm, minorKm: summary.minor * g.spacingKm,
    angleDegrees: (summary.angle * 180) / Math.PI,
    transform: transforms.length === 1 ? transforms[0]! : 'mixed',
    anisotropySearched: rows.some((r) => r.anisotropy != null),
    ring,
  }
}
